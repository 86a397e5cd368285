import { useState } from 'react';
import { formatNumber } from '../../lib/format';
import { tempsInUnits, type Units } from '../../lib/units';
import { CATALOGUE, SURGE_TYPICAL, basisLabel, catalogueToLoad, type CatalogueItem } from '../../domain/loads/catalogue';
import type { EnergyRig } from '../../domain/loads/energy';
import { LoadEditor } from './LoadEditor';
import { loadToForm, type LoadFormOutput } from '../../domain/loads/load-form';
import { describeWindows } from '../../domain/loads/windows';

const range = (i: CatalogueItem) => `${formatNumber(i.minWatts, 1)}–${formatNumber(i.maxWatts, 1)} W${i.supply === 'ac' ? ' AC' : ''}`;

/**
 * Typical appliances to start from. Picking one opens it in the load editor with its typical
 * draw filled in; the camper checks the label and confirms the number before it is added.
 */
export function CataloguePicker({ units, rig, add, onClose }: { units: Units; rig: EnergyRig; add: (values: LoadFormOutput) => Promise<void>; onClose: () => void }) {
  const [picked, setPicked] = useState<CatalogueItem | null>(null);
  if (picked) {
    return (
      <LoadEditor
        key={picked.id}
        idPrefix="catalogue"
        initial={loadToForm(catalogueToLoad(picked))}
        units={units}
        rig={rig}
        title={`Add: ${picked.name}`}
        submitLabel="Confirm and add"
        intro={
          <div className="caution mt-2 text-sm">
            <p><span className="font-bold">Typical — check the label.</span> {tempsInUnits(picked.about, units)}</p>
            <p className="mt-1">Typical draw {range(picked)}; we filled in {formatNumber(picked.watts, 1)} W and a usual schedule ({describeWindows(picked.windows)}{picked.days === 'drive' ? ', on drive days' : ''}). Change them to match yours, then confirm.</p>
            <p className="mt-1 text-slate-text">{basisLabel(picked)}.</p>
            {picked.surgeWatts ? (
              <p className="mt-1"><span className="font-bold">Surge {formatNumber(picked.surgeWatts)} W{picked.supply === 'ac' ? ' AC' : ''}: {SURGE_TYPICAL}</span> {picked.surgeAbout}</p>
            ) : null}
          </div>
        }
        save={async (values) => {
          await add(values);
          setPicked(null);
        }}
        onCancel={() => setPicked(null)}
      />
    );
  }
  return (
    <section aria-labelledby="catalogue-heading" className="rounded-xl border-2 border-sand-dark bg-white p-3 sm:p-4">
      <div className="flex items-baseline justify-between gap-2">
        <h3 id="catalogue-heading" className="text-base font-extrabold">Typical appliances</h3>
        <button type="button" className="btn btn-quiet min-h-[36px] px-3 py-1 text-sm" onClick={onClose}>Close</button>
      </div>
      <p className="field-hint">Typical draws from published measurements, common practice and, where an item says so, memory — check your appliance’s label. You confirm the number before it is added.</p>
      <ul className="mt-3 grid gap-2 sm:grid-cols-2 lg:grid-cols-3">
        {CATALOGUE.map((item) => (
          <li key={item.id}>
            <button type="button" onClick={() => setPicked(item)} className="flex h-full w-full flex-col items-start rounded-xl border-2 border-sand-dark bg-card px-3 py-2 text-left hover:border-ember">
              <span className="font-bold">{item.name}</span>
              <span className="text-sm text-slate-text">typical {range(item)}{item.surgeWatts ? ` · surge ${formatNumber(item.surgeWatts)} W` : ''}{item.standby ? ' · standby' : ''}</span>
            </button>
          </li>
        ))}
      </ul>
    </section>
  );
}
