import { useState } from 'react';
import { ApiError, apiFetch } from '../../lib/query-client';
import { formatInstant, zonePlainName } from '../../lib/clock';
import { useDeviceZone } from '../../components/ui/useUserZone';
import type { SettingsDto } from '../../domain/accounts/accounts.schema';

interface Props {
  /** The stored zone, or null while none is (the page then shows this device's zone as the choice). */
  timeZone: string | null;
  /** The zone names to choose from, read on the server so the list is the same in both renders. */
  zones: string[];
}

const label = (zone: string) => zone.replace(/_/g, ' ');

/** The zone the app shows times of saving, editing and crew activity in; camp times stay in each stop's own zone. */
export default function TimeZoneForm({ timeZone, zones }: Props) {
  const [picked, setChosen] = useState<string | null>(timeZone);
  const [saved, setSaved] = useState(timeZone);
  // This device's zone is known only in the browser (null in the server render and hydration):
  // it is the choice shown while none is stored.
  const device = useDeviceZone();
  const chosen = picked ?? device ?? 'UTC';
  const [busy, setBusy] = useState(false);
  const [status, setStatus] = useState<string | null>(null);
  const [error, setError] = useState<string | null>(null);
  const options = zones.includes(chosen) ? zones : [...zones, chosen].sort();

  const save = async (zone: string) => {
    setBusy(true);
    setStatus(null);
    setError(null);
    try {
      const s = await apiFetch<SettingsDto>('/api/settings', { method: 'PATCH', json: { timeZone: zone } });
      setSaved(s.timeZone);
      setChosen(s.timeZone ?? zone);
      setStatus(`Saved. Times now show in ${zonePlainName(zone)}: it is ${formatInstant(Date.now(), zone, 'time')} there.`);
    } catch (e) {
      setError(e instanceof ApiError ? (e.issues[0]?.message ?? e.message) : 'Could not save. Try again.');
    } finally {
      setBusy(false);
    }
  };

  return (
    <form
      aria-labelledby="time-zone-heading"
      className="space-y-3"
      noValidate
      onSubmit={(e) => {
        e.preventDefault();
        void save(chosen);
      }}
    >
      <div>
        <label htmlFor="timeZone" className="field-label">
          Your time zone
        </label>
        <select
          id="timeZone"
          className="field-input"
          value={chosen}
          onChange={(e) => setChosen(e.target.value)}
          aria-describedby="timeZone-hint"
          aria-invalid={error ? true : undefined}
        >
          {options.map((z) => (
            <option key={z} value={z}>
              {label(z)}
            </option>
          ))}
        </select>
        {error ? (
          <p className="field-error" role="alert">
            Time zone: {error}
          </p>
        ) : (
          <p id="timeZone-hint" className="field-hint mt-1">
            When forecasts were saved, loads edited and crew changes made. Arrivals, cutoffs and hourly rows always show in each stop’s own
            local time.
          </p>
        )}
      </div>
      <div className="flex flex-wrap items-center gap-3">
        <button type="submit" className="btn btn-primary" disabled={busy || chosen === saved}>
          {busy ? 'Saving…' : 'Save time zone'}
        </button>
        {device && device !== chosen ? (
          <button type="button" className="btn btn-quiet" onClick={() => setChosen(device)}>
            Use this device’s zone ({label(device)})
          </button>
        ) : null}
        <p role="status" aria-live="polite" className="font-semibold text-moss-deep">
          {status ?? ''}
        </p>
      </div>
    </form>
  );
}
