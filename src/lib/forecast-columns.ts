import type { Forecast, HourlyRow } from '../engine';

/**
 * The forecast with its hours as columns: one array per field instead of one object per hour, so
 * the field names travel once instead of once an hour (a 30-day trip: about 100 KB instead of
 * 230 KB of JSON). Asked with `POST /api/forecasts/preview?hourly=columns`; without the query the
 * preview answers the contract's row form. `fromColumns(toColumns(f))` equals `f`.
 */
export type ColumnarForecast = Omit<Forecast, 'hourly'> & { hourlyColumns: { [K in keyof HourlyRow]-?: HourlyRow[K][] }; hours: number };

export function toColumns(f: Forecast): ColumnarForecast {
  const { hourly, ...rest } = f;
  const keys = (hourly[0] ? Object.keys(hourly[0]) : []) as (keyof HourlyRow)[];
  const columns = {} as Record<keyof HourlyRow, unknown[]>;
  for (const k of keys) columns[k] = hourly.map((r) => r[k]);
  return { ...rest, hours: hourly.length, hourlyColumns: columns as ColumnarForecast['hourlyColumns'] };
}

export function fromColumns(c: ColumnarForecast): Forecast {
  const { hourlyColumns, hours, ...rest } = c;
  const keys = Object.keys(hourlyColumns) as (keyof HourlyRow)[];
  const hourly: HourlyRow[] = [];
  for (let i = 0; i < hours; i++) {
    const row = {} as Record<keyof HourlyRow, unknown>;
    for (const k of keys) row[k] = hourlyColumns[k][i];
    hourly.push(row as unknown as HourlyRow);
  }
  return { hourly, ...rest };
}
