import { z } from 'zod';
import { isValidTimeZone } from '../../engine/light';
import type { BaselineResult, DayAh } from './baseline';
import type { SeriesPoint } from './series';

// How a monitor log's columns are read: the shape the upload's preview proposes and the camper
// confirms or changes. Pure (zod only), so the server and the upload form share it.

export const DELIMITERS = [',', ';', '\t', '|'] as const;
export type Delimiter = (typeof DELIMITERS)[number];

/**
 * Time formats a log's time column may use. `iso`: 2027-10-21 14:05[:30][Z|±hh:mm];
 * `dmy` / `mdy`: 21/10/2027 14:05 (day first) or 10/21/2027 2:05 PM (month first), with / . or -;
 * `ymd`: 2027/10/21 14:05; `epoch-s` / `epoch-ms`: seconds or milliseconds since 1970 (UTC).
 */
export const TIME_FORMATS = ['iso', 'dmy', 'mdy', 'ymd', 'epoch-s', 'epoch-ms'] as const;
export type TimeFormat = (typeof TIME_FORMATS)[number];

/** `charge-positive`: a positive current is charging (most shunts); `discharge-positive`: positive is the draw. */
export const SIGN_CONVENTIONS = ['charge-positive', 'discharge-positive'] as const;
export type SignConvention = (typeof SIGN_CONVENTIONS)[number];

const column = z.number({ error: 'choose a column' }).int({ error: 'choose a column' }).min(0, { error: 'choose a column' }).max(199, { error: 'choose a column' });

/** The confirmed reading of a log's columns. Column numbers count from 0. */
export const mappingSchema = z
  .object({
    delimiter: z.enum(DELIMITERS, { error: 'must be one of , ; tab |' }),
    decimal: z.enum(['.', ','], { error: 'must be . or ,' }).default('.'),
    /** The file line of the header row (1 = first line); 0 when the file has no header. */
    headerLine: z.number({ error: 'must be a line number' }).int({ error: 'must be a whole number' }).min(0, { error: 'must be 0 (no header) or more' }).max(1000, { error: 'must be at most 1000' }),
    time: z.object(
      {
        column,
        /** A separate date column, when the file splits date and time of day. */
        dateColumn: column.nullable().default(null),
        format: z.enum(TIME_FORMATS, { error: `must be one of ${TIME_FORMATS.join(', ')}` }),
      },
      { error: 'The log needs a time column: choose which column holds the time of each reading.' },
    ),
    /** IANA zone of times written without an offset; also the zone of "night" for the baseline. */
    timeZone: z.string({ error: 'must be a time zone we know, such as America/Denver' }).refine(isValidTimeZone, { error: 'must be a time zone we know, such as America/Denver' }),
    voltage: z.object({ column, unit: z.enum(['V', 'mV'], { error: 'must be V or mV' }) }).nullable().default(null),
    current: z
      .object({
        column,
        unit: z.enum(['A', 'mA'], { error: 'must be A or mA' }),
        sign: z.enum(SIGN_CONVENTIONS, { error: 'must be charge-positive or discharge-positive' }),
      })
      .nullable()
      .default(null),
    soc: z.object({ column, unit: z.enum(['%', '‰'], { error: 'must be % or ‰' }) }).nullable().default(null),
    temperature: z.object({ column, unit: z.enum(['C', 'F'], { error: 'must be C or F' }) }).nullable().default(null),
  })
  .superRefine((m, ctx) => {
    if (!m.voltage && !m.current && !m.soc) {
      ctx.addIssue({ code: 'custom', path: ['voltage'], message: 'Choose at least one measured column: voltage, current or state of charge.' });
    }
    if (m.decimal === ',' && m.delimiter === ',') {
      ctx.addIssue({ code: 'custom', path: ['decimal'], message: 'A comma cannot be both the delimiter and the decimal mark.' });
    }
    const used = new Map<number, string>();
    const roles: [string, number | null | undefined][] = [
      ['time', m.time.column],
      ['time.dateColumn', m.time.dateColumn],
      ['voltage', m.voltage?.column],
      ['current', m.current?.column],
      ['soc', m.soc?.column],
      ['temperature', m.temperature?.column],
    ];
    for (const [role, col] of roles) {
      if (col === null || col === undefined) continue;
      const other = used.get(col);
      if (other) ctx.addIssue({ code: 'custom', path: role.split('.'), message: `column ${col + 1} is already read as ${other}` });
      else used.set(col, role.replace(/\..*$/, ''));
    }
  });

export type ColumnMapping = z.output<typeof mappingSchema>;
export type ColumnMappingInput = z.input<typeof mappingSchema>;

// Monitor logs as the API returns them (shared by the server and the Logs section).

export interface MonitorLogDto {
  id: string;
  rigId: string;
  name: string;
  bytes: number;
  timeZone: string;
  sampleCount: number;
  startedAt: string;
  endedAt: string;
  mapping: ColumnMapping;
  /** Which readings the log has. */
  has: { volts: boolean; amps: boolean; soc: boolean; temperature: boolean };
  createdBy: { id: string; name: string } | null;
  createdAt: string;
  version: number;
}

export interface ForecastOverlap {
  id: string;
  name: string;
  tripId: string;
  tripName: string;
  createdAt: string;
  /** Hours the forecast and the log share. */
  overlapHours: number;
}

export interface MonitorLogDetail extends MonitorLogDto {
  series: SeriesPoint[];
  baseline: BaselineResult;
  nightTempC: number | null;
  days: DayAh[];
  /** Saved forecasts of this rig whose dates the log covers, most overlap first. */
  forecasts: ForecastOverlap[];
  /** One page of the readings as stored (`?after=&limit=`). */
  readings: ReadingsPage;
}

/** A page of a log's readings in time order; `next` is the `after` of the following page (null: the last page). */
export interface ReadingsPage {
  items: SeriesPoint[];
  limit: number;
  after: number | null;
  next: number | null;
}
