// The hourly table as CSV, built in the browser (a quick plan has no saved forecast to link to).
// Same columns as the saved forecast's /api/forecasts/:id/hourly.csv.
import Papa from 'papaparse';
import type { Forecast, HourlyRow } from '../../engine';

export const CSV_COLUMNS: (keyof HourlyRow)[] = ['time', 'socPct', 'volts', 'solarWatts', 'chargeWatts', 'loadWatts', 'unmetWatts', 'curtailedWatts', 'ambientC', 'batteryC', 'sunAltitudeDeg', 'poaWm2', 'driving', 'generatorOn', 'disconnected'];

/** The forecast's hourly rows as CSV text, with the stop's name on each row; formula-like cells are escaped. */
export function forecastCsv(f: Forecast): string {
  const rows = f.hourly.map((r) => [f.stops?.[r.stop]?.name ?? '', ...CSV_COLUMNS.map((c) => r[c])]);
  return Papa.unparse({ fields: ['stop', ...CSV_COLUMNS], data: rows }, { newline: '\r\n', escapeFormulae: true }) + '\r\n';
}

/** A file name for the CSV: "sunreckon-forecast-2027-10-21.csv". */
export function csvFileName(f: Forecast, name?: string): string {
  const date = f.hourly[0]?.time.slice(0, 10) ?? 'trip';
  const slug = (name ?? 'forecast').toLowerCase().replace(/[^a-z0-9]+/g, '-').replace(/^-|-$/g, '') || 'forecast';
  return `sunreckon-${slug}-${date}.csv`;
}
