// The hourly forecast as CSV: one writer for the saved forecast's /api/forecasts/:id/hourly.csv
// and for the button that builds it in the browser (a quick plan has no saved forecast to link to).
import type { Forecast, HourlyRow } from '../../engine';
import { needsFormulaEscape } from '../csv-cells';
import { toDisplayTemp, type Units } from '../../lib/units';

// usablePct and minVolts came with engine revision 2; a snapshot saved before has none (empty cells).
export const CSV_COLUMNS: (keyof HourlyRow)[] = ['time', 'socPct', 'usablePct', 'volts', 'minVolts', 'solarWatts', 'chargeWatts', 'loadWatts', 'unmetWatts', 'curtailedWatts', 'ambientC', 'batteryC', 'sunAltitudeDeg', 'poaWm2', 'driving', 'generatorOn', 'disconnected'];

function cell(v: unknown): string {
  if (v === undefined || v === null) return '';
  const s = String(v);
  // The loads export's rule: a leading = + - @ TAB CR gets an apostrophe unless the whole cell is a plain number ("-2+3" is a formula).
  const safe = needsFormulaEscape(s) ? `'${s}` : s;
  return /[",\n\r]/.test(safe) ? `"${safe.replace(/"/g, '""')}"` : safe;
}

/** The temperature columns, stored in °C: with imperial units they are written in °F under their own names. */
const TEMP_COLUMNS: Partial<Record<keyof HourlyRow, string>> = { ambientC: 'ambientF', batteryC: 'batteryF' };

/**
 * The forecast's hourly rows as CSV text (CRLF lines), with the stop's name on each row; formula-like cells
 * are escaped. With imperial units the temperature columns are °F and named so (ambientF, batteryF).
 */
export function forecastCsv(f: Forecast, units: Units = 'metric'): string {
  const imperial = units === 'imperial';
  const header = CSV_COLUMNS.map((c) => (imperial ? (TEMP_COLUMNS[c] ?? c) : c));
  const value = (row: HourlyRow, c: keyof HourlyRow) => (imperial && TEMP_COLUMNS[c] && typeof row[c] === 'number' ? toDisplayTemp(row[c] as number, units) : row[c]);
  const lines = [['stop', ...header].join(',')];
  for (const row of f.hourly) lines.push([cell(f.stops?.[row.stop]?.name ?? ''), ...CSV_COLUMNS.map((c) => cell(value(row, c)))].join(','));
  return lines.join('\r\n') + '\r\n';
}

/** A file name for the CSV: "sunreckon-forecast-2027-10-21.csv". */
export function csvFileName(f: Forecast, name?: string): string {
  const date = f.hourly[0]?.time.slice(0, 10) ?? 'trip';
  const slug = (name ?? 'forecast').toLowerCase().replace(/[^a-z0-9]+/g, '-').replace(/^-|-$/g, '') || 'forecast';
  return `sunreckon-${slug}-${date}.csv`;
}
