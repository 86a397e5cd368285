import { dateOrderProblem, detectLog, headOf, type DetectedMapping } from './detect';
import type { ColumnMapping } from './monitor.schema';
import { splitLine } from './text';
import { parseLog, type BankLimits, type LogLineError, type ParseResult } from './parse';
import { at } from '../../lib/invariant';

// Step 1 of an upload: what the file looks like read with the proposed (or the camper's) mapping —
// the first readings, every problem by line and column, and the span. Pure.

export interface LogPreview {
  /** The mapping used: the detected one, or the one sent. */
  mapping: DetectedMapping;
  detected: boolean;
  headers: string[];
  /** The first data rows as written. */
  rows: string[][];
  notes: string[];
  /** The first readings as they will be stored, with their file lines. */
  sample: { line: number; t: number; volts: number | null; amps: number | null; socPct: number | null; tempC: number | null }[];
  errors: LogLineError[];
  errorCount: number;
  warnings: string[];
  count: number;
  from: number | null;
  to: number | null;
}

/** The bank's size, for the plausible ranges of readings (volts and amps of this bank). */
export function bankLimits(bank: { chemistry: string; capacityAh: number; nominalVolts?: number }): BankLimits {
  return { nominalVolts: bank.nominalVolts ?? (bank.chemistry === 'lifepo4' ? 12.8 : 12), capacityAh: bank.capacityAh };
}

/** Why nothing was saved: "line 12 needs fixing" or "7 problems on 3 lines need fixing" ("3+" when not all are listed). */
export function refusalMessage(preview: Pick<LogPreview, 'errors' | 'errorCount'>): string {
  const lines = [...new Set(preview.errors.map((e) => e.line))];
  const what = preview.errorCount === 1 ? `line ${lines[0]} needs` : `${preview.errorCount} problems on ${lines.length}${preview.errors.length < preview.errorCount ? '+' : ''} lines need`;
  return `Nothing was saved: ${what} fixing.`;
}

/** Detects (when no mapping is given) and reads the whole file, as the save will. */
/** `keepAll: false` (a preview) keeps only the first readings and counts the rest. */
export function previewLog(text: string, opts: { timeZone: string; mapping: ColumnMapping | null; limits: BankLimits | null; keepAll?: boolean }): { preview: LogPreview; parsed: ParseResult | null } {
  const detection = opts.mapping ? null : detectLog(text, opts.timeZone);
  const mapping: DetectedMapping = opts.mapping ?? detection!.mapping;
  let parsed: ParseResult | null = null;
  let errors: LogLineError[] = [];
  let errorCount = 0;
  if (mapping.time) {
    parsed = parseLog(text, { ...mapping, time: mapping.time }, opts.limits, { keepAll: opts.keepAll ?? true });
    errors = parsed.errors;
    errorCount = parsed.errorCount;
    // Day and month that could be either way round, read the way that spreads a short log over months: not saved as it is.
    const order = dateOrderProblem(text, { ...mapping, time: mapping.time });
    if (order) {
      errors = [{ line: mapping.headerLine + 1, column: parsed.headers[mapping.time.column] ?? null, message: order }, ...errors];
      errorCount++;
    }
  } else {
    errors = [{ line: Math.max(1, mapping.headerLine), column: null, message: 'The log has no time column: choose the column that holds the time of each reading.' }];
    errorCount = 1;
  }
  const samples = parsed?.samples ?? [];
  const sampleLines = parsed?.lines ?? [];
  const rows = detection?.rows ?? firstRows(text, mapping);
  return {
    parsed,
    preview: {
      mapping,
      detected: detection !== null,
      headers: parsed?.headers.length ? parsed.headers : (detection?.headers ?? []),
      rows,
      notes: detection?.notes ?? [],
      sample: samples.slice(0, 10).map((s, i) => ({ line: at(sampleLines, i, 'line of reading'), ...s })),
      errors,
      errorCount,
      warnings: parsed?.warnings ?? [],
      count: parsed?.count ?? 0,
      from: parsed?.from ?? null,
      to: parsed?.to ?? null,
    },
  };
}

/** The first data rows as written, split with the mapping's delimiter. */
function firstRows(text: string, mapping: DetectedMapping, n = 8): string[][] {
  const out: string[][] = [];
  const lines = headOf(text, mapping.headerLine + 1000).split('\n');
  for (const line of lines.slice(mapping.headerLine)) {
    if (out.length >= n) break;
    if (line.trim() !== '') out.push(splitLine(line, mapping.delimiter));
  }
  return out;
}
