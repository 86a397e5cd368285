import { describe, expect, it } from 'vitest';
import { detectLog } from '../../src/domain/monitor/detect';
import { mappingSchema, type ColumnMapping } from '../../src/domain/monitor/monitor.schema';
import { parseLog } from '../../src/domain/monitor/parse';
import { previewLog } from '../../src/domain/monitor/monitor';
import { decodeCsvBytes } from '../../src/server/upload';
import { toCsv, truth, type CsvOptions } from '../fixtures/monitor/synthetic';
import { at } from '../../src/lib/invariant';

// Monitor logs written by our own fixture generator in many layouts: the detection must find the
// layout, and reading the file with it must give back the known readings exactly.

const TZ = 'America/Denver';
const BANK = { nominalVolts: 12.8, capacityAh: 300 };
const rows = truth({ days: 2 });

type Layout = [name: string, opts: CsvOptions, expected: Partial<{ delimiter: string; decimal: string; headerLine: number; format: string; volt: string; amp: string; sign: string; soc: string; dateColumn: boolean }>];

const LAYOUTS: Layout[] = [
  ['comma, ISO local, charge-positive', {}, { delimiter: ',', decimal: '.', headerLine: 1, format: 'iso', volt: 'V', amp: 'A', sign: 'charge-positive', soc: '%' }],
  ['semicolon, decimal comma, day-first', { delimiter: ';', decimal: ',', time: 'dmy' }, { delimiter: ';', decimal: ',', format: 'dmy' }],
  ['tab, epoch seconds, discharge-positive', { delimiter: '\t', time: 'epoch-s', sign: 'discharge-positive' }, { delimiter: '\t', format: 'epoch-s', sign: 'discharge-positive' }],
  ['comma, epoch milliseconds, mV and mA', { time: 'epoch-ms', voltUnit: 'mV', currentUnit: 'mA' }, { format: 'epoch-ms', volt: 'mV', amp: 'mA', sign: 'charge-positive' }],
  ['comma, month-first with AM/PM', { time: 'mdy' }, { format: 'mdy' }],
  ['semicolon, ISO with offset, SOC per mille', { delimiter: ';', time: 'iso-offset', socUnit: '‰' }, { format: 'iso', soc: '‰' }],
  ['semicolon, split date and time, preamble lines', { delimiter: ';', decimal: ',', time: 'split-dmy', preamble: ['Battery monitor export', 'Serial;0042'] }, { headerLine: 3, format: 'dmy', dateColumn: true }],
  ['tab, discharge-positive mA, extra columns', { delimiter: '\t', currentUnit: 'mA', sign: 'discharge-positive', extras: true }, { amp: 'mA', sign: 'discharge-positive' }],
  ['comma, no temperature column, discharge-positive', { temperature: false, sign: 'discharge-positive' }, { sign: 'discharge-positive' }],
  ['no SOC column: the sign read from the voltage', { soc: false, sign: 'discharge-positive' }, { sign: 'discharge-positive', soc: 'none' }],
  ['no SOC column, charge-positive', { soc: false }, { soc: 'none' }],
];

describe.each(LAYOUTS)('%s', (_name, opts, expected) => {
  const text = toCsv(rows, { timeZone: TZ, ...opts });
  const det = detectLog(text, TZ);

  it('detects the layout', () => {
    const m = det.mapping;
    if (expected.delimiter) expect(m.delimiter).toBe(expected.delimiter);
    if (expected.decimal) expect(m.decimal).toBe(expected.decimal);
    expect(m.headerLine).toBe(expected.headerLine ?? 1);
    expect(m.time?.format).toBe(expected.format ?? 'iso');
    expect(m.time?.dateColumn !== null).toBe(expected.dateColumn ?? false);
    expect(m.voltage?.unit).toBe(expected.volt ?? 'V');
    expect(m.current?.unit).toBe(expected.amp ?? 'A');
    expect(m.current?.sign).toBe(expected.sign ?? 'charge-positive');
    expect(m.soc?.unit ?? 'none').toBe(expected.soc ?? '%');
    expect(mappingSchema.safeParse(m).success).toBe(true);
  });

  it('reads back every reading: times, volts, amps (charging positive) and SOC', () => {
    const r = parseLog(text, mappingSchema.parse(det.mapping), BANK);
    expect(r.errors).toEqual([]);
    expect(r.samples.length).toBe(rows.length);
    for (let i = 0; i < rows.length; i += 37) {
      const s = at(r.samples, i, 'reading');
      const row = at(rows, i, 'written row');
      expect(s.t).toBe(row.t);
      expect(s.amps).toBeCloseTo(row.amps, 3);
      expect(s.volts).toBeCloseTo(row.volts, 3);
      if (expected.soc !== 'none') expect(s.socPct).toBeCloseTo(row.socPct, 1);
    }
  });
});

function mapping(over: Partial<ColumnMapping> = {}): ColumnMapping {
  return mappingSchema.parse({
    delimiter: ',',
    headerLine: 1,
    timeZone: TZ,
    time: { column: 0, format: 'iso' },
    voltage: { column: 1, unit: 'V' },
    current: { column: 2, unit: 'A', sign: 'charge-positive' },
    soc: { column: 3, unit: '%' },
    ...over,
  });
}

const HEAD = 'Timestamp,Voltage (V),Current (A),SOC (%)';

describe('problems by line and column', () => {
  it('names the line and column of each bad cell, counting the header and quoted line breaks', () => {
    const text = [
      HEAD,
      '2027-10-21 00:00:00,13.2,-1.5,80',
      '2027-10-21 00:05:00,13.2,-1.x,80',
      '2027-10-21 00:10:00,13.2,-1.5', // cut short
      '2027-10-21 00:15:00,"13.2\nextra",-1.5,80', // a quoted cell with a line break: the next line is 7
      '2027-02-30 00:20:00,13.2,-1.5,80',
      '2027-10-21 00:25:00,13.2,-1.5,80,unexpected',
    ].join('\n');
    const r = parseLog(text, mapping(), BANK);
    expect(r.errors).toEqual([
      { line: 3, column: 'Current (A)', message: '"-1.x" is not a number' },
      { line: 4, column: null, message: expect.stringMatching(/^has 3 cells but the header names 4 columns/) },
      { line: 5, column: 'Voltage (V)', message: expect.stringContaining('is not a number') },
      { line: 7, column: 'Timestamp', message: expect.stringContaining('day 30 does not exist') },
      { line: 8, column: null, message: expect.stringMatching(/^has 5 cells/) },
    ]);
    expect(r.errorCount).toBe(5);
    expect(r.samples).toHaveLength(1);
  });

  it('reports an unclosed quote on its line', () => {
    const r = parseLog([HEAD, '2027-10-21 00:00:00,13.2,-1.5,80', '2027-10-21 00:05:00,"13.2,-1.5,80'].join('\n'), mapping(), BANK);
    expect(r.errors.some((e) => e.line === 3 && /never closed/.test(e.message))).toBe(true);
  });

  it('refuses absurd values with the unit that would make sense of them', () => {
    const text = [HEAD, '2027-10-21 00:00:00,900,-1.5,80', '2027-10-21 00:05:00,12850,-1.5,80', '2027-10-21 00:10:00,13.2,-1.5,250', '2027-10-21 00:15:00,13.2,-1.5,850'].join('\n');
    const r = parseLog(text, mapping(), BANK);
    expect(r.errors.map((e) => [e.line, e.column, e.message])).toEqual([
      [2, 'Voltage (V)', '900 V is not possible on a 12.8 V bank'],
      [3, 'Voltage (V)', '12850 V is not possible on a 12.8 V bank — if this column is in millivolts, choose mV'],
      [4, 'SOC (%)', 'state of charge 250 % is outside 0–100 % — if this column is in per mille, choose ‰'],
      [5, 'SOC (%)', 'state of charge 850 % is outside 0–100 % — if this column is in per mille, choose ‰'],
    ]);
    expect(r.samples).toHaveLength(0);
  });

  it('refuses a current beyond five times the capacity (or 1000 A) and hints at milliamps', () => {
    const r = parseLog([HEAD, '2027-10-21 00:00:00,13.2,-2500,80'].join('\n'), mapping(), BANK);
    expect(r.errors).toEqual([{ line: 2, column: 'Current (A)', message: '2500 A is more than 1500 A, beyond what a 300 Ah bank can carry — if this column is in milliamps, choose mA' }]);
  });

  it('says a decimal comma needs the decimal mark changed', () => {
    const r = parseLog(['Timestamp;Voltage (V);Current (A);SOC (%)', '2027-10-21 00:00:00;13,2;-1,5;80'].join('\n'), mapping({ delimiter: ';' }), BANK);
    expect(r.errors[0]).toEqual({ line: 2, column: 'Voltage (V)', message: '"13,2" uses a decimal comma: choose "," as the decimal mark' });
  });

  it('a header without readings, and an empty file, are errors', () => {
    expect(parseLog(HEAD + '\n', mapping(), BANK).errors[0]?.message).toBe('The file has a header but no readings under it.');
    expect(decodeCsvBytes(new Uint8Array())).toEqual({ ok: false, message: 'The file is empty.' });
    expect(decodeCsvBytes(new TextEncoder().encode('\n\n  \n'))).toMatchObject({ ok: false });
  });

  it('refuses workbooks and binary files by their bytes', () => {
    expect(decodeCsvBytes(new Uint8Array([0x50, 0x4b, 0x03, 0x04, 1, 2]))).toMatchObject({ ok: false, message: expect.stringContaining('workbook') });
    expect(decodeCsvBytes(new Uint8Array([0x31, 0x00, 0x32]))).toMatchObject({ ok: false, message: expect.stringContaining('binary') });
  });

  it('reads Windows-1252 and UTF-16 text', () => {
    const latin = new Uint8Array([...new TextEncoder().encode('Temp '), 0xb0, 0x43, 0x0a]); // "Temp °C" in Windows-1252
    expect(decodeCsvBytes(latin)).toEqual({ ok: true, text: 'Temp °C\n' });
    const utf16 = new Uint8Array([0xff, 0xfe, ...[...'a,b\r\n'].flatMap((c) => [c.charCodeAt(0), 0])]);
    expect(decodeCsvBytes(utf16)).toEqual({ ok: true, text: 'a,b\n' });
  });

  it('puts readings out of time order back in order, and says so', () => {
    const r = parseLog([HEAD, '2027-10-21 00:10:00,13.2,-1.5,80', '2027-10-21 00:00:00,13.3,-1.5,80'].join('\n'), mapping(), BANK);
    expect(r.samples.map((s) => s.volts)).toEqual([13.3, 13.2]);
    expect(r.lines).toEqual([3, 2]);
    expect(r.warnings[0]).toMatch(/put in time order/);
  });

  it('the mapping refuses two roles on one column, no measured column, and a comma for both marks', () => {
    const bad = mappingSchema.safeParse({ delimiter: ',', decimal: ',', headerLine: 1, timeZone: TZ, time: { column: 0, format: 'iso' }, voltage: { column: 0, unit: 'V' } });
    expect(bad.success).toBe(false);
    const paths = bad.error!.issues.map((i) => i.path.join('.'));
    expect(paths).toEqual(expect.arrayContaining(['decimal', 'voltage']));
    const none = mappingSchema.safeParse({ delimiter: ',', headerLine: 1, timeZone: TZ, time: { column: 0, format: 'iso' } });
    expect(none.error?.issues[0]?.message).toMatch(/at least one measured column/);
    const noTime = mappingSchema.safeParse({ delimiter: ',', headerLine: 1, timeZone: TZ, voltage: { column: 1, unit: 'V' } });
    expect(noTime.error?.issues[0]?.path).toEqual(['time']);
  });
});

describe('detection edge cases', () => {
  it('finds no time column in a file without times, and the preview says so', () => {
    const text = 'Voltage (V),Current (A)\n13.2,-1.5\n13.1,-1.4\n';
    const det = detectLog(text, TZ);
    expect(det.mapping.time).toBeNull();
    const { preview } = previewLog(text, { timeZone: TZ, mapping: null, limits: BANK });
    expect(preview.errorCount).toBe(1);
    expect(preview.errors[0]?.message).toMatch(/no time column/);
  });

  it('says when day and month could be either way round', () => {
    const early = truth({ start: '2027-10-01', days: 2 });
    const det = detectLog(toCsv(early, { time: 'dmy' }), TZ);
    expect(det.mapping.time?.format).toBe('dmy');
    expect(det.notes.join(' ')).toMatch(/day first or month first/);
  });

  it('reads a file without a header row', () => {
    const text = toCsv(rows.slice(0, 50), { header: false });
    const det = detectLog(text, TZ);
    expect(det.mapping.headerLine).toBe(0);
    expect(det.headers[0]).toBe('column 1');
    expect(det.mapping.time?.column).toBe(0);
    expect(det.mapping.voltage?.column).toBe(1);
  });

  it('reads times of a DST change as instants: the repeated hour keeps the readings one step apart', () => {
    const fall = truth({ start: '2027-11-06', days: 2, stepMinutes: 10 });
    const r = parseLog(toCsv(fall, { time: 'iso-offset' }), mappingSchema.parse(detectLog(toCsv(fall, { time: 'iso-offset' }), TZ).mapping), BANK);
    expect(r.errorCount).toBe(0);
    for (let i = 1; i < r.samples.length; i++) expect(at(r.samples, i).t - at(r.samples, i - 1).t).toBe(600_000);
  });
});
