import Papa from 'papaparse';
import type { z } from 'zod';
import { LIMITS } from '../../engine';
import { needsFormulaEscape, unescapeCell } from '../csv-cells';
import { LOAD_CSV_COLUMNS, loadInputSchema } from './loads.schema';
import { parseWindows, windowsToCell } from './windows';
import { at } from '../../lib/invariant';

// The loads list as CSV, both ways. Pure functions (no HTTP, no database), so the import, its
// preview and the export share one reading of every column and are unit-tested on their own.

export type LoadCsvColumn = (typeof LOAD_CSV_COLUMNS)[number];
/** A load as the CSV carries it: the input schema's output (defaults applied). */
export type CsvLoad = z.output<typeof loadInputSchema>;

export interface CsvRow {
  /** The file's line the row starts on (the header is line 1). */
  line: number;
  load: CsvLoad;
}

export interface CsvError {
  line: number;
  /** The column the problem is in, or null for the whole line. */
  column: string | null;
  message: string;
}

export interface CsvParseResult {
  rows: CsvRow[];
  errors: CsvError[];
}

const REQUIRED: LoadCsvColumn[] = ['name', 'watts'];

/** Header spellings we accept: case, spaces and underscores do not matter (`Duty_Pct` is `dutyPct`). */
const COLUMN_BY_KEY = new Map<string, LoadCsvColumn>(LOAD_CSV_COLUMNS.map((c) => [headerKey(c), c]));
function headerKey(s: string): string {
  return s.trim().toLowerCase().replace(/[\s_-]+/g, '');
}

// The formula rule is shared with the hourly forecast export; re-exported for the loads tests.
export { needsFormulaEscape, unescapeCell };

type Cell = { ok: true; value: unknown } | { ok: false; message: string };

function parseNumber(cell: string, opts: { percent?: boolean } = {}): Cell {
  let s = cell.trim();
  if (opts.percent) s = s.replace(/\s*%$/, '');
  if (/^-?\d+,\d+$/.test(s)) return { ok: false, message: `"${s}": use a dot for decimals` };
  if (!/^[+-]?(\d+(\.\d*)?|\.\d+)([eE][+-]?\d+)?$/.test(s)) return { ok: false, message: `"${s.slice(0, 20)}" is not a number` };
  return { ok: true, value: Number(s) };
}

function parseChoice(cell: string, choices: readonly string[]): Cell {
  const s = cell.trim().toLowerCase();
  return choices.includes(s) ? { ok: true, value: s } : { ok: false, message: `"${cell.trim().slice(0, 20)}" must be one of ${choices.join(', ')}` };
}

function parseYesNo(cell: string): Cell {
  const s = cell.trim().toLowerCase();
  if (['yes', 'y', 'true', '1'].includes(s)) return { ok: true, value: true };
  if (['no', 'n', 'false', '0'].includes(s)) return { ok: true, value: false };
  return { ok: false, message: `"${cell.trim().slice(0, 20)}" must be yes or no` };
}

/** How each column's cell becomes a field; an empty cell leaves the field out (its default applies). */
const READ: Record<LoadCsvColumn, (cell: string) => Cell> = {
  name: (c) => ({ ok: true, value: c }),
  watts: (c) => parseNumber(c),
  quantity: (c) => parseNumber(c),
  supply: (c) => parseChoice(c, ['dc', 'ac']),
  windows: (c) => {
    const r = parseWindows(c);
    return r.ok ? { ok: true, value: r.windows } : r;
  },
  dutyPct: (c) => parseNumber(c, { percent: true }),
  days: (c) => parseChoice(c, ['all', 'camp', 'drive']),
  response: (c) => parseChoice(c, ['none', 'cooling', 'heating']),
  setpointC: (c) => parseNumber(c),
  standby: (c) => parseYesNo(c),
  note: (c) => ({ ok: true, value: c }),
  location: (c) => parseChoice(c, ['cabin', 'outside']),
  surgeWatts: (c) => parseNumber(c),
};

interface RawRecord {
  cells: string[];
  line: number;
  problems: string[];
}

/** Splits the text into records, each with the file line it starts on (quoted cells may span lines). */
function records(text: string): RawRecord[] {
  const out: RawRecord[] = [];
  let start = 0;
  let line = 1;
  Papa.parse<string[]>(text, {
    delimiter: ',',
    newline: '\n',
    quoteChar: '"',
    step: (res) => {
      const end = res.meta.cursor;
      const problems = [...new Set(res.errors.map((e) => (e.code === 'MissingQuotes' ? 'a quoted cell is never closed (a " is missing)' : e.code === 'InvalidQuotes' ? 'a " inside a quoted cell must be doubled ("")' : e.message)))];
      out.push({ cells: res.data, line, problems });
      for (let i = start; i < end; i++) if (text.charCodeAt(i) === 10) line++;
      start = end;
    },
  });
  return out;
}

/**
 * Reads a loads CSV: the header names the columns (any order; `name` and `watts` required), each
 * further line is one load. Returns the loads that are valid and, for the others, every problem
 * with its file line and column. `room` is how many loads the rig can still take.
 */
export function parseLoadsCsv(input: string, room: number = LIMITS.maxLoads): CsvParseResult {
  // One line-ending style for papaparse, which otherwise guesses a single one for the whole file.
  const text = input.replace(/^\uFEFF/, '').replace(/\r\n?/g, '\n');
  const all = records(text).filter((r) => r.problems.length > 0 || r.cells.some((c) => c.trim() !== ''));
  const errors: CsvError[] = [];
  const header = all.shift();
  if (!header) return { rows: [], errors: [{ line: 1, column: null, message: `The file is empty: the first line must name the columns, e.g. ${LOAD_CSV_COLUMNS.join(',')}` }] };
  const columns: (LoadCsvColumn | null)[] = [];
  header.cells.forEach((raw, i) => {
    const name = raw.trim();
    const col = COLUMN_BY_KEY.get(headerKey(name)) ?? null;
    if (name === '' && header.cells.slice(i).every((c) => c.trim() === '')) return columns.push(null);
    if (!col) errors.push({ line: header.line, column: name || `column ${i + 1}`, message: `unknown column; the columns are ${LOAD_CSV_COLUMNS.join(', ')}` });
    else if (columns.includes(col)) errors.push({ line: header.line, column: col, message: 'this column appears twice' });
    columns.push(col);
  });
  for (const col of REQUIRED) {
    if (!columns.includes(col)) errors.push({ line: header.line, column: col, message: `the header needs a ${col} column` });
  }
  for (const p of header.problems) errors.push({ line: header.line, column: null, message: p });
  if (errors.length) return { rows: [], errors };
  if (all.length === 0) return { rows: [], errors: [{ line: header.line, column: null, message: 'The file has a header but no loads under it.' }] };

  const rows: CsvRow[] = [];
  for (const rec of all) {
    const rowErrors: CsvError[] = rec.problems.map((message) => ({ line: rec.line, column: null, message }));
    const extra = rec.cells.slice(columns.length).filter((c) => c.trim() !== '');
    if (extra.length) rowErrors.push({ line: rec.line, column: null, message: `has ${rec.cells.length} cells but the header names ${columns.length} columns` });
    const obj: Record<string, unknown> = {};
    columns.forEach((col, i) => {
      if (!col) return;
      const cell = unescapeCell(rec.cells[i] ?? '');
      if (cell.trim() === '') return;
      const r = READ[col](cell);
      if (r.ok) obj[col] = r.value;
      else rowErrors.push({ line: rec.line, column: col, message: r.message });
    });
    if (!('name' in obj) && !rowErrors.some((e) => e.column === 'name')) rowErrors.push({ line: rec.line, column: 'name', message: 'Name the load.' });
    if (!('watts' in obj) && !rowErrors.some((e) => e.column === 'watts')) rowErrors.push({ line: rec.line, column: 'watts', message: 'must be a number' });
    const parsed = loadInputSchema.safeParse(obj);
    if (!parsed.success) {
      for (const issue of parsed.error.issues) {
        const column = String(issue.path[0] ?? '') || null;
        // A cell that could not be read already has its error; zod would only repeat it.
        if (rowErrors.some((e) => e.column === column)) continue;
        rowErrors.push({ line: rec.line, column, message: issue.message });
      }
    }
    if (rowErrors.length) errors.push(...rowErrors);
    else if (parsed.success) rows.push({ line: rec.line, load: parsed.data });
  }

  if (all.length > room) {
    errors.push({
      line: at(all, Math.max(0, room), 'load line').line,
      column: null,
      message: `A rig holds at most ${LIMITS.maxLoads} loads and this one has room for ${Math.max(0, room)} more; this is load ${room + 1} of the file.`,
    });
  }
  return { rows, errors };
}

/** The loads as CSV text (header line first, CRLF line ends), formula-like cells escaped. */
export function formatLoadsCsv(loads: readonly CsvLoad[]): string {
  const data = loads.map((l) => ({
    name: l.name,
    watts: l.watts,
    quantity: l.quantity,
    supply: l.supply,
    windows: windowsToCell(l.windows),
    dutyPct: l.dutyPct,
    days: l.days,
    response: l.response,
    setpointC: l.setpointC,
    standby: l.standby ? 'yes' : 'no',
    note: l.note,
    location: l.location,
    // No surge figure: an empty cell, which reads back as none.
    surgeWatts: l.surgeWatts ?? '',
  }));
  const escaped = data.map((row) =>
    LOAD_CSV_COLUMNS.map((c) => {
      const s = String(row[c]);
      return needsFormulaEscape(s) ? `'${s}` : s;
    }),
  );
  return Papa.unparse({ fields: [...LOAD_CSV_COLUMNS], data: escaped }, { newline: '\r\n', escapeFormulae: false }) + '\r\n';
}
