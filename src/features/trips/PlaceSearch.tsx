import { useEffect, useId, useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import { formatNumber } from '../../lib/format';
import type { Place } from './trips.api';
import { placesQuery } from './trips.queries';
import { placeWhere } from '../quick-plan/quick-plan.api';

/** Waits until typing pauses before a value is used. */
function useDebounced<T>(value: T, ms: number): T {
  const [v, setV] = useState(value);
  useEffect(() => {
    const t = setTimeout(() => setV(value), ms);
    return () => clearTimeout(t);
  }, [value, ms]);
  return v;
}

/** "Sault Ste. Marie, Ontario, Canada": the name, then region and country in words. */
export const placeLabel = (p: Place) => [p.name, placeWhere(p)].filter(Boolean).join(', ');

/**
 * A place search box (an accessible combobox): types ahead against the offline gazetteer after a
 * short pause, most populous places first; picking one hands back its coordinates and time zone.
 */
export function PlaceSearch({ id, label, onPick }: { id: string; label: string; onPick: (p: Place) => void }) {
  const [text, setText] = useState('');
  const [open, setOpen] = useState(false);
  const [active, setActive] = useState(0);
  const q = useDebounced(text.trim(), 300);
  const listId = useId();
  const enabled = q.length >= 2;
  const places = useQuery({ ...placesQuery(q), enabled });
  const results = enabled ? (places.data ?? []) : [];
  const showList = open && enabled && text.trim().length >= 2;

  const pick = (p: Place) => {
    onPick(p);
    setText(placeLabel(p));
    setOpen(false);
  };

  return (
    <div className="relative">
      <label htmlFor={id} className="field-label">{label}</label>
      <input
        id={id}
        role="combobox"
        aria-expanded={showList}
        aria-controls={listId}
        aria-autocomplete="list"
        aria-activedescendant={showList && results[active] ? `${listId}-${active}` : undefined}
        aria-describedby={`${id}-hint`}
        autoComplete="off"
        className="field-input"
        placeholder="Town or city, e.g. Moab"
        value={text}
        onChange={(e) => {
          setText(e.target.value);
          setOpen(true);
          setActive(0);
        }}
        onFocus={() => setOpen(true)}
        onBlur={() => setTimeout(() => setOpen(false), 150)}
        onKeyDown={(e) => {
          if (!showList) return;
          if (e.key === 'ArrowDown') {
            e.preventDefault();
            setActive((a) => Math.min(a + 1, results.length - 1));
          } else if (e.key === 'ArrowUp') {
            e.preventDefault();
            setActive((a) => Math.max(a - 1, 0));
          } else if (e.key === 'Enter' && results[active]) {
            e.preventDefault();
            pick(results[active]);
          } else if (e.key === 'Escape') setOpen(false);
        }}
      />
      <p id={`${id}-hint`} className="field-hint mt-1">Fills the coordinates and time zone. Camping far from a town? Type the coordinates instead.</p>
      {showList ? (
        <ul id={listId} role="listbox" aria-label={`Places matching ${text}`} className="absolute left-0 right-0 top-[4.6rem] z-30 max-h-72 overflow-auto rounded-xl border-2 border-sand-dark bg-white py-1 shadow-soft">
          {places.isFetching && !results.length ? <li className="px-3 py-2 text-slate-text" role="presentation">Searching…</li> : null}
          {places.isError ? <li className="px-3 py-2 font-semibold text-alert" role="presentation">{places.error instanceof Error ? places.error.message : 'Search failed.'}</li> : null}
          {!places.isFetching && !places.isError && results.length === 0 ? (
            <li className="px-3 py-2 text-slate-text" role="presentation">No town starts with “{q}”. Try a nearby town, or type the coordinates.</li>
          ) : null}
          {results.map((p, i) => (
            // The combobox's input takes the keys for its options (arrows, Enter, Escape; aria-activedescendant).
            // eslint-disable-next-line jsx-a11y/click-events-have-key-events
            <li
              key={`${p.name}-${p.lat}-${p.lon}`}
              id={`${listId}-${i}`}
              role="option"
              aria-selected={i === active}
              className={`cursor-pointer px-3 py-2 ${i === active ? 'bg-sand' : ''}`}
              onMouseDown={(e) => e.preventDefault()}
              onMouseEnter={() => setActive(i)}
              onClick={() => pick(p)}
            >
              <span className="font-bold">{p.name}</span>
              <span className="text-slate-text">, {placeWhere(p)}</span>
              <span className="block text-xs text-slate-text">{formatNumber(p.lat, 3)}, {formatNumber(p.lon, 3)} · {p.timeZone}{p.population ? ` · ${formatNumber(p.population)} people` : ''}</span>
            </li>
          ))}
        </ul>
      ) : null}
    </div>
  );
}
