import Papa from 'papaparse';
import type { ColumnMapping } from './monitor.schema';
import { localResolver, parseTimeCell } from './time';
import { at } from '../../lib/invariant';

// Reading a monitor log with a confirmed column mapping: papaparse splits the lines, each cell is
// read with its unit and sign convention, and every problem is reported with the file's line and
// the column's name. A value no house bank can show (900 V on a 12 V bank, SOC 250 %) is an error
// with a hint at the unit that would make sense of it. Pure: no HTTP, no database.

/** One reading: t in ms since the epoch; amps positive while charging (whatever the monitor's sign). */
export interface Sample {
  t: number;
  volts: number | null;
  amps: number | null;
  socPct: number | null;
  tempC: number | null;
}

export interface LogLineError {
  /** The file's line (1 = first line; quoted line breaks counted). */
  line: number;
  /** The column's header (or "column 3" without a header); null for the whole line. */
  column: string | null;
  message: string;
}

/** What a bank can plausibly show: values outside are refused as absurd. */
export interface BankLimits {
  nominalVolts: number;
  capacityAh: number;
}

export interface ParseResult {
  samples: Sample[];
  /** The file line of each sample (same order as `samples`). */
  lines: number[];
  /** The first problems (at most MAX_ERRORS); `errorCount` counts them all. */
  errors: LogLineError[];
  errorCount: number;
  /** Non-blocking remarks (readings out of time order, rows without any reading). */
  warnings: string[];
  /** Cells of the header row, or "column N" names without a header. */
  headers: string[];
  /** Readings read (all of them, also when only the first are kept), and the earliest and latest time. */
  count: number;
  from: number | null;
  to: number | null;
}

/** How many readings a read that does not keep them all still keeps (the preview's first readings). */
export const KEPT_WHEN_COUNTING = 10;

export const MAX_ERRORS = 100;

/** The range of plausible readings for a bank (common practice, generous on purpose). */
export function plausibleRanges(limits: BankLimits | null) {
  const v = limits?.nominalVolts;
  return {
    volts: v ? ([0.5 * v, 1.5 * v] as const) : ([1, 100] as const),
    maxAmps: limits ? Math.max(1000, 5 * limits.capacityAh) : 5000,
    tempC: [-50, 90] as const,
  };
}

const NUMBER_RE = /^[+-]?(\d+(\.\d*)?|\.\d+)([eE][+-]?\d+)?$/;
// Units some monitors write into the cell itself ("12.85 V", "87 %").
const UNIT_SUFFIX = /\s*(mv|v|ma|a|%|‰|°\s*[cf]|[cf])$/i;

type Num = { ok: true; value: number } | { ok: false; message: string };

/** A number cell with the mapping's decimal mark; a trailing unit written in the cell is ignored. */
export function readNumber(cell: string, decimal: '.' | ','): Num {
  let s = cell.trim().replace(UNIT_SUFFIX, '').replace(/\s+/g, '');
  if (decimal === ',') {
    if (/\./.test(s) && /,/.test(s)) return { ok: false, message: `"${cell.trim().slice(0, 20)}" mixes . and , — write numbers without thousands separators` };
    s = s.replace(',', '.');
  } else if (/^[+-]?\d+,\d+$/.test(s)) {
    return { ok: false, message: `"${cell.trim().slice(0, 20)}" uses a decimal comma: choose "," as the decimal mark` };
  }
  if (!NUMBER_RE.test(s)) return { ok: false, message: `"${cell.trim().slice(0, 20)}" is not a number` };
  const value = Number(s);
  if (!Number.isFinite(value)) return { ok: false, message: `"${cell.trim().slice(0, 20)}" is not a number` };
  return { ok: true, value };
}

function fmt(x: number): string {
  return String(Math.round(x * 1000) / 1000);
}

interface RawRecord {
  cells: string[];
  line: number;
  problems: string[];
}

/**
 * Splits the text into records with papaparse and hands each, with the file line it starts on, to
 * `onRecord` as it is read (nothing is kept: a 10 MB log is never held as a list of cells); return
 * false to stop reading.
 */
export function eachRecord(text: string, delimiter: string, onRecord: (r: RawRecord) => boolean | void): void {
  let start = 0;
  let line = 1;
  Papa.parse<string[]>(text, {
    delimiter,
    newline: '\n',
    quoteChar: '"',
    step: (res, parser) => {
      const end = res.meta.cursor;
      const problems = [
        ...new Set(
          res.errors.map((e) =>
            e.code === 'MissingQuotes' ? 'a quoted cell is never closed (a " is missing)' : e.code === 'InvalidQuotes' ? 'a " inside a quoted cell must be doubled ("")' : e.message,
          ),
        ),
      ];
      const rec = { cells: res.data, line, problems };
      for (let i = start; i < end; i++) if (text.charCodeAt(i) === 10) line++;
      start = end;
      if (onRecord(rec) === false) parser.abort();
    },
  });
}

/** Splits the text into records with papaparse, each with the file line it starts on. */
export function readRecords(text: string, delimiter: string): RawRecord[] {
  const out: RawRecord[] = [];
  eachRecord(text, delimiter, (r) => void out.push(r));
  return out;
}

const blank = (r: RawRecord) => r.problems.length === 0 && r.cells.every((c) => c.trim() === '');

/** Column names of the file: the header's cells, or "column N". */
export function columnNames(headerCells: string[] | null, count: number): string[] {
  return Array.from({ length: count }, (_, i) => headerCells?.[i]?.trim() || `column ${i + 1}`);
}

/**
 * Reads every line under the header with the mapping. Returns the readings sorted by time and
 * every problem by line and column; a caller saves nothing while `errorCount` > 0.
 */
export function parseLog(text: string, mapping: ColumnMapping, limits: BankLimits | null, opts: { keepAll?: boolean } = {}): ParseResult {
  // A preview keeps only the first readings and counts the rest, so a large log is read in little memory.
  const keepAll = opts.keepAll ?? true;
  let count = 0;
  let from = Infinity;
  let to = -Infinity;
  let prevT = -Infinity;
  let backwardsSeen = 0;
  const errors: LogLineError[] = [];
  let errorCount = 0;
  const warnings: string[] = [];
  const push = (e: LogLineError) => {
    errorCount++;
    if (errors.length < MAX_ERRORS) errors.push(e);
  };

  const ranges = plausibleRanges(limits);
  const resolve = localResolver(mapping.timeZone);
  const samples: Sample[] = [];
  const lines: number[] = [];
  let empty = 0;

  // Line by line: the header and the first data lines (enough to know the width) are held until
  // the width is known; every later line is read as it comes and let go.
  const WIDTH_LINES = 200;
  let header: RawRecord | undefined;
  const prefix: RawRecord[] = [];
  let firstDataLine: number | null = null;
  let width = -1;
  let headers: string[] = [];
  let needed: number[] = [];
  const halt: { result: ParseResult | null } = { result: null };
  const name = (col: number) => headers[col] ?? `column ${col + 1}`;

  const readLine = (rec: RawRecord) => {
    let bad = false;
    const fail = (column: string | null, message: string) => {
      bad = true;
      push({ line: rec.line, column, message });
    };
    for (const p of rec.problems) fail(null, p);
    if (rec.cells.length < width && needed.some((c) => c >= rec.cells.length)) {
      fail(null, `has ${rec.cells.length} cells but the header names ${width} columns — is the line cut short?`);
      return;
    }
    if (rec.cells.length > width && rec.cells.slice(width).some((c) => c.trim() !== '')) {
      fail(null, `has ${rec.cells.length} cells but the header names ${width} columns — is a delimiter inside an unquoted cell?`);
      return;
    }
    const cell = (c: number) => rec.cells[c] ?? '';
    // Time
    const timeText = mapping.time.dateColumn !== null ? `${cell(mapping.time.dateColumn).trim()} ${cell(mapping.time.column).trim()}` : cell(mapping.time.column);
    const time = parseTimeCell(timeText, mapping.time.format, resolve);
    if (!time.ok) fail(name(mapping.time.column), time.message);

    const num = (col: number): number | null | undefined => {
      const c = cell(col);
      if (c.trim() === '') return null;
      const r = readNumber(c, mapping.decimal);
      if (!r.ok) {
        fail(name(col), r.message);
        return undefined;
      }
      return r.value;
    };

    let volts: number | null = null;
    if (mapping.voltage) {
      const raw = num(mapping.voltage.column);
      if (typeof raw === 'number') {
        const v = mapping.voltage.unit === 'mV' ? raw / 1000 : raw;
        const [lo, hi] = ranges.volts;
        if (v < lo || v > hi) {
          const bank = limits ? `a ${fmt(limits.nominalVolts)} V bank` : 'a house battery';
          const other = mapping.voltage.unit === 'V' ? raw / 1000 : raw * 1000;
          const hint = other >= lo && other <= hi ? ` — if this column is in ${mapping.voltage.unit === 'V' ? 'millivolts, choose mV' : 'volts, choose V'}` : '';
          fail(name(mapping.voltage.column), `${fmt(v)} V is not possible on ${bank}${hint}`);
        } else volts = v;
      }
    }

    let amps: number | null = null;
    if (mapping.current) {
      const raw = num(mapping.current.column);
      if (typeof raw === 'number') {
        const a = (mapping.current.unit === 'mA' ? raw / 1000 : raw) * (mapping.current.sign === 'discharge-positive' ? -1 : 1);
        if (Math.abs(a) > ranges.maxAmps) {
          const hint = mapping.current.unit === 'A' && Math.abs(raw / 1000) <= ranges.maxAmps ? ' — if this column is in milliamps, choose mA' : '';
          fail(name(mapping.current.column), `${fmt(Math.abs(a))} A is more than ${fmt(ranges.maxAmps)} A, beyond what ${limits ? `a ${fmt(limits.capacityAh)} Ah bank` : 'a house bank'} can carry${hint}`);
        } else amps = a + 0;
      }
    }

    let socPct: number | null = null;
    if (mapping.soc) {
      const raw = num(mapping.soc.column);
      if (typeof raw === 'number') {
        const p = mapping.soc.unit === '‰' ? raw / 10 : raw;
        if (p < 0 || p > 100) {
          const hint = mapping.soc.unit === '%' && raw > 100 && raw <= 1000 ? ' — if this column is in per mille, choose ‰' : '';
          fail(name(mapping.soc.column), `state of charge ${fmt(p)} % is outside 0–100 %${hint}`);
        } else socPct = p;
      }
    }

    let tempC: number | null = null;
    if (mapping.temperature) {
      const raw = num(mapping.temperature.column);
      if (typeof raw === 'number') {
        const c = mapping.temperature.unit === 'F' ? ((raw - 32) * 5) / 9 : raw;
        const [lo, hi] = ranges.tempC;
        if (c < lo || c > hi) {
          const hint = mapping.temperature.unit === 'C' && (raw - 32) * (5 / 9) >= lo && (raw - 32) * (5 / 9) <= hi ? ' — if this column is in °F, choose F' : '';
          fail(name(mapping.temperature.column), `${fmt(c)} °C is outside ${lo} to ${hi} °C${hint}`);
        } else tempC = Math.round(c * 100) / 100;
      }
    }

    if (bad || !time.ok) return;
    if (volts === null && amps === null && socPct === null && tempC === null) {
      empty++;
      return;
    }
    count++;
    if (time.ms < prevT) backwardsSeen++;
    prevT = time.ms;
    if (time.ms < from) from = time.ms;
    if (time.ms > to) to = time.ms;
    if (keepAll || samples.length < KEPT_WHEN_COUNTING) {
      samples.push({ t: time.ms, volts, amps, socPct, tempC });
      lines.push(rec.line);
    }
  };

  /** Once the first data lines are in: the width, the column names and the checks that stop the read. */
  const settle = (): boolean => {
    if (mapping.headerLine > 0 && !header) {
      push({ line: mapping.headerLine, column: null, message: `the file has no line ${mapping.headerLine} to read the header from` });
      halt.result = { samples: [], lines: [], errors, errorCount, warnings, headers: [], count: 0, from: null, to: null };
      return false;
    }
    // The width of the data lines (their most common cell count), or the header's when it is wider.
    const freq = new Map<number, number>();
    for (const r of prefix) freq.set(r.cells.length, (freq.get(r.cells.length) ?? 0) + 1);
    const modal = [...freq.entries()].sort((a, b) => b[1] - a[1] || b[0] - a[0])[0]?.[0] ?? 0;
    width = Math.max(header?.cells.length ?? 0, modal);
    headers = columnNames(header?.cells ?? null, width);
    needed = [mapping.time.column, mapping.time.dateColumn, mapping.voltage?.column, mapping.current?.column, mapping.soc?.column, mapping.temperature?.column].filter(
      (c): c is number => typeof c === 'number',
    );
    const [outside] = needed.filter((c) => c >= width);
    if (outside !== undefined) {
      push({ line: Math.max(1, mapping.headerLine), column: null, message: `the file has ${width} columns; column ${outside + 1} does not exist` });
      halt.result = { samples: [], lines: [], errors, errorCount, warnings, headers, count: 0, from: null, to: null };
      return false;
    }
    if (prefix.length === 0) {
      push({ line: Math.max(1, mapping.headerLine), column: null, message: mapping.headerLine > 0 ? 'The file has a header but no readings under it.' : 'The file has no readings.' });
      halt.result = { samples: [], lines: [], errors, errorCount, warnings, headers, count: 0, from: null, to: null };
      return false;
    }
    for (const r of prefix) readLine(r);
    prefix.length = 0;
    return true;
  };

  eachRecord(text, mapping.delimiter, (rec) => {
    if (mapping.headerLine > 0 && rec.line === mapping.headerLine) header = rec;
    if (rec.line <= mapping.headerLine || blank(rec)) return;
    firstDataLine ??= rec.line;
    if (width >= 0) return readLine(rec);
    prefix.push(rec);
    if (prefix.length >= WIDTH_LINES) return settle();
  });
  if (width < 0 && !halt.result) settle();
  if (halt.result) return halt.result;

  if (errorCount === 0 && count === 0) {
    push({ line: firstDataLine ?? Math.max(1, mapping.headerLine), column: null, message: 'No line under the header has a reading in the chosen columns.' });
  }
  if (empty > 0) warnings.push(`${empty} line${empty === 1 ? ' has' : 's have'} a time but no reading in the chosen columns; ${empty === 1 ? 'it is' : 'they are'} left out.`);

  // Readings are kept in time order; a log that jumps back suggests day and month are swapped.
  const backwards = backwardsSeen;
  if (backwards > 0) {
    const order = samples.map((_, i) => i).sort((a, b) => at(samples, a).t - at(samples, b).t || a - b);
    const s2 = order.map((i) => at(samples, i, 'reading'));
    const l2 = order.map((i) => at(lines, i, 'line of reading'));
    // Element by element: a spread of a large log would overflow the call stack.
    for (const [i, s] of s2.entries()) samples[i] = s;
    for (const [i, l] of l2.entries()) lines[i] = l;
    warnings.push(`${backwards} reading${backwards === 1 ? ' is' : 's are'} earlier than the line before; the readings were put in time order. If this is unexpected, check the time format (day first or month first).`);
  }
  return { samples, lines, errors, errorCount, warnings, headers, count, from: count ? from : null, to: count ? to : null };
}
