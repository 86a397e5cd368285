import { DELIMITERS, TIME_FORMATS, type ColumnMapping, type Delimiter, type SignConvention, type TimeFormat } from './monitor.schema';
import { columnNames, parseLog, readNumber, type Sample } from './parse';
import { splitLine } from './text';
import { localClock, localResolver, looksLike, parseTimeCell, timeExample } from './time';
import { at } from '../../lib/invariant';

// Guessing how a monitor log is laid out, so the camper only has to confirm: the delimiter, the
// header row (some exports put a few lines about the device first), the time column and format,
// which columns hold voltage, current, state of charge and temperature with their units, and
// which sign the current uses. Every guess can be changed in the upload form. Pure.

/** A proposed mapping; `time` is null when no column looks like a time. */
export type DetectedMapping = Omit<ColumnMapping, 'time'> & { time: ColumnMapping['time'] | null };

export interface Detection {
  mapping: DetectedMapping;
  /** Column names (header cells, or "column N"). */
  headers: string[];
  /** The first data rows as written, for the mapping form. */
  rows: string[][];
  /** Plain-language remarks on the guesses that may be wrong. */
  notes: string[];
}

const SAMPLE_LINES = 400;

interface Line {
  line: number;
  text: string;
}

/** The delimiter that splits the most lines into the same number of cells (tab, semicolon, pipe before comma on a tie, since those files often use decimal commas). */
export function detectDelimiter(lines: string[]): Delimiter {
  const order: Delimiter[] = ['\t', ';', '|', ','];
  let best: { d: Delimiter; score: number; width: number } | null = null;
  for (const d of order) {
    const counts = lines.map((l) => splitLine(l, d).length);
    const freq = new Map<number, number>();
    for (const c of counts) freq.set(c, (freq.get(c) ?? 0) + 1);
    let width = 1;
    let n = 0;
    for (const [c, k] of freq) if (c > 1 && (k > n || (k === n && c > width))) [width, n] = [c, k];
    const score = width > 1 ? n / lines.length : 0;
    if (!best || score > best.score + 0.05) best = { d, score, width };
  }
  return best && best.score > 0 ? best.d : ',';
}

const DATE_ONLY: Record<string, RegExp> = {
  iso: /^\d{4}-\d{1,2}-\d{1,2}$/,
  dm: /^\d{1,2}[/.-]\d{1,2}[/.-](\d{4}|\d{2})$/,
  ymd: /^\d{4}[/.]\d{1,2}[/.]\d{1,2}$/,
};
const TIME_OF_DAY = /^\d{1,2}:\d{2}(:\d{2}([.,]\d+)?)?\s*([ap]\.?m\.?)?$/i;

function isNumeric(cell: string, decimal: '.' | ','): boolean {
  return cell.trim() !== '' && readNumber(cell, decimal).ok;
}

function looksLikeAnyTime(cell: string): boolean {
  const s = cell.trim();
  return TIME_FORMATS.some((f) => (f === 'epoch-s' || f === 'epoch-ms' ? false : looksLike(s, f))) || Object.values(DATE_ONLY).some((r) => r.test(s));
}

/** A line of data rather than a header: it has a time or date cell, or mostly numbers. */
function dataLike(cells: string[]): boolean {
  const filled = cells.filter((c) => c.trim() !== '');
  if (filled.some(looksLikeAnyTime)) return true;
  const numeric = filled.filter((c) => isNumeric(c, '.') || isNumeric(c, ',')).length;
  return filled.length > 0 && numeric / filled.length >= 0.5;
}

const norm = (h: string) => h.trim().toLowerCase().replace(/[_]+/g, ' ');

const ROLE_PATTERNS = {
  time: { yes: /\b(time ?stamp|date ?time|time|date|datum)\b/, no: /remain|to go|\bttg\b|left|duration|elapsed/ },
  soc: { yes: /\bsoc\b|state of charge|charge ?level|\bsoc\s*[([]|(^|\s)(%|‰)(\s|$)|[([](%|‰)[)\]]|permill|per mille/, no: /\bdod\b|discharge/ },
  voltage: { yes: /volt|\bv\b|\(v\)|\[v\]|\bmv\b|\(mv\)|\[mv\]/, no: /starter|aux|\bmid|deviation|cell|\bmin\b|\bmax\b/ },
  current: { yes: /current|\bamps?\b|\bi\b|\(a\)|\[a\]|\bma\b|\(ma\)|\[ma\]/, no: /\bah\b|amp ?hours?|consumed|capacity|hours|\bmah\b/ },
  temperature: { yes: /temp|°\s*[cf]|\bdeg/, no: /^$/ },
} as const;

function headerMatch(h: string, role: keyof typeof ROLE_PATTERNS): boolean {
  const n = norm(h);
  const p = ROLE_PATTERNS[role];
  return p.yes.test(n) && !p.no.test(n);
}

function median(xs: number[]): number {
  if (xs.length === 0) return NaN;
  const s = [...xs].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? at(s, m) : (at(s, m - 1) + at(s, m)) / 2;
}

function numbersOf(rows: string[][], col: number, decimal: '.' | ','): number[] {
  const out: number[] = [];
  for (const r of rows) {
    const x = readNumber(r[col] ?? '', decimal);
    if (x.ok) out.push(x.value);
  }
  return out;
}

/** The time format of a column's values: the one most of them match; day-first or month-first decided by the values or, when every day is 12 or less, by which reading keeps the log in time order. */
export function detectTimeFormat(values: string[], timeZone: string): { format: TimeFormat; note?: string } | null {
  const vals = values.map((v) => v.trim()).filter(Boolean);
  if (vals.length === 0) return null;
  const fits = TIME_FORMATS.filter((f) => vals.filter((v) => looksLike(v, f)).length / vals.length >= 0.9);
  if (fits.length === 0) return null;
  if (fits.includes('dmy') && fits.includes('mdy')) {
    const resolve = localResolver(timeZone);
    const backwards = (f: TimeFormat) => {
      let n = 0;
      let prev = -Infinity;
      for (const v of vals) {
        const r = parseTimeCell(v, f, resolve);
        if (!r.ok) continue;
        if (r.ms < prev) n++;
        prev = r.ms;
      }
      return n;
    };
    // Day first or month first: the order whose readings come evenly spaced and close together
    // (a log is one stretch of readings), then the one that keeps them in time order.
    const [sd, sm] = [spread(vals, 'dmy', resolve), spread(vals, 'mdy', resolve)];
    if (sd !== null && sm !== null && sd.spanMs !== sm.spanMs) {
      const pick: TimeFormat = sm.spanMs < sd.spanMs ? 'mdy' : 'dmy';
      const [near, far] = pick === 'mdy' ? [sm, sd] : [sd, sm];
      return {
        format: pick,
        note: `Every day in the first lines is 12 or less, so the date could be day first or month first; ${pick === 'mdy' ? 'month' : 'day'} first keeps the readings together (${spanWords(near.spanMs)} instead of ${spanWords(far.spanMs)}). Check the dates in the sample.`,
      };
    }
    const [bd, bm] = [backwards('dmy'), backwards('mdy')];
    if (bm < bd) return { format: 'mdy', note: 'Every day in the first lines is 12 or less, so the date could be day first or month first; month first keeps the readings in time order. Check the dates in the sample.' };
    return { format: 'dmy', note: bd === bm ? 'Every day in the first lines is 12 or less, so the date could be day first or month first; we read it day first. Check the dates in the sample.' : undefined };
  }
  return { format: at(fits, 0, 'fitting time format') };
}

/** Which sign the current uses, judged from the readings (amps as written in the file). */
export function detectSign(samples: Sample[], timeZone: string): { sign: SignConvention; reason: string } {
  // 1. State of charge rising while the current is positive means positive is charging.
  let agree = 0;
  let total = 0;
  for (let i = 1; i < samples.length; i++) {
    const a = at(samples, i - 1);
    const b = at(samples, i);
    if (a.socPct === null || b.socPct === null || b.amps === null || b.t - a.t > 3_600_000) continue;
    const d = b.socPct - a.socPct;
    if (d === 0 || Math.abs(b.amps) < 0.2) continue;
    total++;
    if (Math.sign(d) === Math.sign(b.amps)) agree++;
  }
  if (total >= 5) {
    const r = agree / total;
    if (r >= 0.6) return { sign: 'charge-positive', reason: 'The state of charge rises while the current is positive, so positive current is charging.' };
    if (r <= 0.4) return { sign: 'discharge-positive', reason: 'The state of charge falls while the current is positive, so positive current is the draw.' };
  }
  // 2. Charging raises the terminal voltage: current and voltage move together.
  const pairs = samples.filter((s) => s.amps !== null && s.volts !== null) as (Sample & { amps: number; volts: number })[];
  if (pairs.length >= 10) {
    const ma = pairs.reduce((s, p) => s + p.amps, 0) / pairs.length;
    const mv = pairs.reduce((s, p) => s + p.volts, 0) / pairs.length;
    let sab = 0;
    let saa = 0;
    let svv = 0;
    for (const p of pairs) {
      sab += (p.amps - ma) * (p.volts - mv);
      saa += (p.amps - ma) ** 2;
      svv += (p.volts - mv) ** 2;
    }
    const r = saa > 0 && svv > 0 ? sab / Math.sqrt(saa * svv) : 0;
    if (r > 0.2) return { sign: 'charge-positive', reason: 'The voltage rises when the current is positive, so positive current is charging.' };
    if (r < -0.2) return { sign: 'discharge-positive', reason: 'The voltage falls when the current is positive, so positive current is the draw.' };
  }
  // 3. Between 01:00 and 05:00 no solar charges: the bank is being drawn from.
  const clock = localClock(timeZone);
  const night = samples.filter((s) => s.amps !== null && clock(s.t).hour >= 1 && clock(s.t).hour < 5).map((s) => s.amps as number);
  if (night.length >= 5) {
    const m = median(night);
    if (m < 0) return { sign: 'charge-positive', reason: 'The current is negative between 01:00 and 05:00, when nothing charges, so negative is the draw.' };
    if (m > 0) return { sign: 'discharge-positive', reason: 'The current is positive between 01:00 and 05:00, when nothing charges, so positive is the draw.' };
  }
  return { sign: 'charge-positive', reason: 'We could not tell which sign the current uses; we assumed positive is charging. Check it.' };
}

/** The text up to its `n`th line break (all of it when it has fewer lines). */
export function headOf(text: string, n: number): string {
  let cut = -1;
  for (let k = 0; k < n; k++) {
    cut = text.indexOf('\n', cut + 1);
    if (cut < 0) return text;
  }
  return text.slice(0, cut);
}

/** Proposes a mapping for a log: delimiter, header, columns, units, time format and current sign. */
export function detectLog(text: string, timeZone: string): Detection {
  // The first 20 000 lines are plenty to detect the layout and tell the sign; the rest of a large file is never split here.
  const head = headOf(text, 20_000);
  const all = head.split('\n');
  const sample: Line[] = [];
  for (const [i, text] of all.entries()) {
    if (sample.length >= SAMPLE_LINES) break;
    if (text.trim() !== '') sample.push({ line: i + 1, text });
  }
  const notes: string[] = [];
  const delimiter = detectDelimiter(sample.map((l) => l.text));
  const split = sample.map((l) => ({ line: l.line, cells: splitLine(l.text, delimiter) }));

  // The common width of the lines; the header is the first line of that width that is not data.
  const freq = new Map<number, number>();
  for (const s of split) freq.set(s.cells.length, (freq.get(s.cells.length) ?? 0) + 1);
  const width = [...freq.entries()].sort((a, b) => b[1] - a[1] || b[0] - a[0])[0]?.[0] ?? 1;
  const firstWide = split.findIndex((s) => s.cells.length === width);
  const header = firstWide >= 0 && !dataLike(at(split, firstWide).cells) ? at(split, firstWide) : null;
  const headerLine = header ? header.line : firstWide > 0 ? at(split, firstWide - 1).line : 0;
  const skipped = headerLine - (header ? 1 : 0);
  if (skipped > 0) notes.push(skipped === 1 ? 'The first line describes the device, not readings; it is skipped.' : `The first ${skipped} lines describe the device, not readings; they are skipped.`);
  if (!header) notes.push('The file has no header row: choose what each column holds.');
  const headerCells = header ? header.cells.map((c) => c.trim().replace(/^"|"$/g, '')) : null;
  const headers = columnNames(headerCells, width);
  const rows = split.filter((s) => s.line > headerLine && s.cells.length === width).map((s) => s.cells);

  // Decimal comma: only possible when the delimiter is not a comma.
  let decimal: '.' | ',' = '.';
  if (delimiter !== ',') {
    const cells = rows.slice(0, 100).flat();
    const commas = cells.filter((c) => /^[+-]?\d+,\d+$/.test(c.trim())).length;
    const dots = cells.filter((c) => /^[+-]?\d+\.\d+$/.test(c.trim())).length;
    if (commas > dots) decimal = ',';
  }

  const used = new Set<number>();
  const take = (role: keyof typeof ROLE_PATTERNS): number | null => {
    const i = headers.findIndex((h, idx) => !used.has(idx) && headerCells !== null && headerMatch(h, role));
    if (i < 0) return null;
    used.add(i);
    return i;
  };

  // Time: one column, or a date column and a time-of-day column.
  let time: DetectedMapping['time'] = null;
  const colValues = (c: number) => rows.slice(0, 200).map((r) => r[c] ?? '');
  const dateCol = headers.findIndex((_, c) => {
    const v = colValues(c).filter((x) => x.trim());
    return v.length > 0 && Object.values(DATE_ONLY).some((re) => v.filter((x) => re.test(x.trim())).length / v.length >= 0.9);
  });
  const todCol = headers.findIndex((_, c) => {
    const v = colValues(c).filter((x) => x.trim());
    return v.length > 0 && v.filter((x) => TIME_OF_DAY.test(x.trim())).length / v.length >= 0.9;
  });
  const tryColumn = (col: number, dateColumn: number | null) => {
    const values = dateColumn === null ? colValues(col) : rows.slice(0, 200).map((r) => `${(r[dateColumn] ?? '').trim()} ${(r[col] ?? '').trim()}`);
    const f = detectTimeFormat(values, timeZone);
    if (!f) return false;
    time = { column: col, dateColumn, format: f.format };
    if (f.note) notes.push(f.note);
    used.add(col);
    if (dateColumn !== null) used.add(dateColumn);
    return true;
  };
  if (dateCol >= 0 && todCol >= 0 && dateCol !== todCol) tryColumn(todCol, dateCol);
  if (!time) {
    const byName = headers.map((h, i) => i).filter((i) => headerCells !== null && headerMatch(at(headers, i, 'column name'), 'time'));
    for (const c of [...byName, ...headers.map((_, i) => i)]) if (!used.has(c) && tryColumn(c, null)) break;
  }
  if (!time) notes.push('No column looks like a time. Choose the time column and its format, or export the log with timestamps.');

  const soc = take('soc');
  const voltage = take('voltage');
  const current = take('current');
  const temperature = take('temperature');
  const volts = voltage ?? headers.findIndex((_, c) => {
    if (used.has(c)) return false;
    const m = median(numbersOf(rows.slice(0, 200), c, decimal));
    return (m >= 9 && m <= 65) || (m >= 9000 && m <= 65000);
  });
  if (voltage === null && volts >= 0) used.add(volts);

  const unitOf = (col: number | null, pattern: RegExp) => (col !== null && headerCells !== null ? pattern.test(norm(at(headers, col, 'column name'))) : false);
  const vCol = volts >= 0 ? volts : null;
  const vMedian = vCol === null ? NaN : median(numbersOf(rows, vCol, decimal));
  const socMax = soc === null ? NaN : Math.max(...numbersOf(rows, soc, decimal));

  const mapping: DetectedMapping = {
    delimiter,
    decimal,
    headerLine,
    time,
    timeZone,
    voltage: vCol === null ? null : { column: vCol, unit: unitOf(vCol, /\bmv\b|milli/) || vMedian > 1000 ? 'mV' : 'V' },
    current: current === null ? null : { column: current, unit: unitOf(current, /\bma\b|milli/) ? 'mA' : 'A', sign: 'charge-positive' },
    soc: soc === null ? null : { column: soc, unit: unitOf(soc, /‰|permill|per mille/) || (socMax > 100 && socMax <= 1000) ? '‰' : '%' },
    temperature: temperature === null ? null : { column: temperature, unit: unitOf(temperature, /°\s*f|\bf\b|fahrenheit/) ? 'F' : 'C' },
  };

  // The current's sign, from the readings themselves.
  if (mapping.current && mapping.time) {
    const parsed = parseLog(head, { ...mapping, time: mapping.time }, null);
    const s = detectSign(parsed.samples, timeZone);
    mapping.current.sign = s.sign;
    notes.push(s.reason);
  }
  if (mapping.time) notes.unshift(`Times read like ${timeExample(mapping.time.format)}${mapping.time.format.startsWith('epoch') ? ' (UTC)' : `, in ${timeZone} unless the time carries its own offset`}.`);
  return { mapping, headers, rows: rows.slice(0, 8), notes };
}

export { DELIMITERS };

/** The span of the values read in one date order (null when any fails to read that way). */
function spread(vals: string[], format: TimeFormat, resolve: ReturnType<typeof localResolver>): { spanMs: number } | null {
  let lo = Infinity;
  let hi = -Infinity;
  for (const v of vals) {
    const r = parseTimeCell(v, format, resolve);
    if (!r.ok) return null;
    lo = Math.min(lo, r.ms);
    hi = Math.max(hi, r.ms);
  }
  return { spanMs: hi - lo };
}

function spanWords(ms: number): string {
  const h = ms / 3_600_000;
  if (h < 48) return `${Math.round(h)} hours`;
  const d = h / 24;
  return d < 60 ? `${Math.round(d)} days` : `${Math.round(d / 30.4)} months`;
}

/**
 * When the time column is read day first or month first and the other order would also read the
 * first readings, a problem if the chosen order spreads them far wider (a 3-day log read as 3
 * months): the file is not saved while its dates look wrong.
 */
export function dateOrderProblem(text: string, mapping: ColumnMapping): string | null {
  const f = mapping.time.format;
  if (f !== 'dmy' && f !== 'mdy') return null;
  const other: TimeFormat = f === 'dmy' ? 'mdy' : 'dmy';
  const lines = headOf(text, mapping.headerLine + 300).split('\n').slice(mapping.headerLine);
  const vals: string[] = [];
  for (const line of lines) {
    if (line.trim() === '') continue;
    const cells = splitLine(line, mapping.delimiter);
    const t = mapping.time.dateColumn !== null ? `${(cells[mapping.time.dateColumn] ?? '').trim()} ${(cells[mapping.time.column] ?? '').trim()}` : (cells[mapping.time.column] ?? '').trim();
    if (t) vals.push(t);
  }
  if (vals.length < 3) return null;
  const resolve = localResolver(mapping.timeZone);
  const [mine, theirs] = [spread(vals, f, resolve), spread(vals, other, resolve)];
  if (!mine || !theirs) return null;
  // Wrong when the other order packs the same readings at least 5 times tighter and this one spreads them over more than 2 weeks.
  if (mine.spanMs > 14 * 86_400_000 && theirs.spanMs * 5 <= mine.spanMs) {
    return `Read ${f === 'dmy' ? 'day' : 'month'} first, the first ${vals.length} readings span ${spanWords(mine.spanMs)}; read ${other === 'dmy' ? 'day' : 'month'} first they span ${spanWords(theirs.spanMs)}. Choose ${other === 'dmy' ? 'Day first' : 'Month first'} as the time format (or check the file).`;
  }
  return null;
}
