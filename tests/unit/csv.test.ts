import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { formatLoadsCsv, needsFormulaEscape, parseLoadsCsv, unescapeCell, type CsvLoad } from '../../src/domain/loads/loads-csv';
import { parseWindows, windowsToCell } from '../../src/domain/loads/windows';

const HEADER = 'name,watts,quantity,supply,windows,dutyPct,days,response,setpointC,standby,note,location,surgeWatts';
/** The header files had before engine revision 2 (no location, no surge watts): they still import. */
const OLD_HEADER = 'name,watts,quantity,supply,windows,dutyPct,days,response,setpointC,standby,note';

describe('parseWindows / windowsToCell (the one schedule reader, as the CSV uses it)', () => {
  it.each([
    ['18-23;6-8', [[18, 23], [6, 8]]],
    [' 22 - 6 ', [[22, 6]]],
    ['18:00-23:00', [[18, 23]]],
    ['0-24', [[0, 24]]],
    ['', [[0, 24]]],
    ['none', []],
    ['18-23;', [[18, 23]]],
    ['18-23,6-8', [[18, 23], [6, 8]]],
    ['5-5', [[5, 5]]],
  ])('reads %j', (cell, windows) => {
    expect(parseWindows(cell)).toEqual({ ok: true, windows });
  });

  it.each(['18', '18-', 'evening', '6pm-11pm', '30-40'])('refuses %j with a hint', (cell) => {
    const r = parseWindows(cell);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.message).toContain('18-23;6-8');
  });

  it('writes windows back the way it reads them', () => {
    expect(windowsToCell([[18, 23], [6, 8]])).toBe('18-23;6-8');
    expect(windowsToCell([])).toBe('none');
  });
});

describe('formula escaping', () => {
  it.each([
    ['=SUM(A1)', true],
    ['+1 lamp', true],
    ['-oops', true],
    ['@cmd', true],
    ['\tx', true],
    ['\rx', true],
    ["'=x", true],
    ['-5', false],
    ['-2.5', false],
    ['Fridge', false],
    ['', false],
  ])('%j needs an apostrophe: %s', (cell, expected) => {
    expect(needsFormulaEscape(cell)).toBe(expected);
  });

  it('takes the apostrophe off only where export put one', () => {
    expect(unescapeCell("'=SUM(A1)")).toBe('=SUM(A1)');
    expect(unescapeCell("''=x")).toBe("'=x");
    expect(unescapeCell("'-5")).toBe('-5');
    expect(unescapeCell("'quoted")).toBe("'quoted");
    expect(unescapeCell('plain')).toBe('plain');
  });
});

describe('parseLoadsCsv', () => {
  it('reads every column, filling the contract defaults for empty cells', () => {
    const { rows, errors } = parseLoadsCsv(`${HEADER}\nFridge,45,,,,,,,,,,,\nFurnace blower,60,1,DC,0-24,100%,camp,Heating,19,Yes,under the bed,Outside,240\n`);
    expect(errors).toEqual([]);
    expect(rows).toEqual([
      { line: 2, load: { name: 'Fridge', watts: 45, quantity: 1, supply: 'dc', windows: [[0, 24]], dutyPct: 100, days: 'all', response: 'none', setpointC: 18, location: 'cabin', surgeWatts: null, standby: false, note: '' } },
      { line: 3, load: { name: 'Furnace blower', watts: 60, quantity: 1, supply: 'dc', windows: [[0, 24]], dutyPct: 100, days: 'camp', response: 'heating', setpointC: 19, location: 'outside', surgeWatts: 240, standby: true, note: 'under the bed' } },
    ]);
  });

  it('still imports a file written before location and surge watts: the load sits in the cabin with no surge figure', () => {
    const { rows, errors } = parseLoadsCsv(`${OLD_HEADER}\nFridge,45,1,dc,0-24,35,all,cooling,18,no,\n`);
    expect(errors).toEqual([]);
    expect(rows[0]?.load).toMatchObject({ name: 'Fridge', response: 'cooling', location: 'cabin', surgeWatts: null });
  });

  it('reads "surge watts" and "Location" headers, and names a bad place or surge by column', () => {
    const ok = parseLoadsCsv('name,watts,Location,surge watts\nMicrowave,1200,cabin,1500\n');
    expect(ok.errors).toEqual([]);
    expect(ok.rows[0]?.load).toMatchObject({ location: 'cabin', surgeWatts: 1500 });
    const bad = parseLoadsCsv('name,watts,location,surge_watts\nFridge,45,garage,lots\n');
    expect(bad.rows).toEqual([]);
    expect(bad.errors).toEqual([
      { line: 2, column: 'location', message: '"garage" must be one of cabin, outside' },
      { line: 2, column: 'surgeWatts', message: '"lots" is not a number' },
    ]);
  });

  it('takes columns in any order and any case; only name and watts are required', () => {
    const { rows, errors } = parseLoadsCsv('Watts, NAME ,duty_pct\n5,Lamp,50\n');
    expect(errors).toEqual([]);
    expect(rows[0]?.load).toMatchObject({ name: 'Lamp', watts: 5, dutyPct: 50 });
  });

  it('refuses a header with unknown, doubled or missing columns, on line 1', () => {
    const { rows, errors } = parseLoadsCsv('name,amps,name\nLamp,1,Lamp\n');
    expect(rows).toEqual([]);
    expect(errors).toEqual([
      { line: 1, column: 'amps', message: expect.stringContaining('unknown column') },
      { line: 1, column: 'name', message: 'this column appears twice' },
      { line: 1, column: 'watts', message: 'the header needs a watts column' },
    ]);
  });

  it('numbers lines as the file does: blank lines, CRLF and quoted line breaks included', () => {
    const csv = '\uFEFFname,watts,note\r\nFridge,45,"door\r\nseal"\r\n\r\nLamp,x,\r\n"Fan",12,"a\nb\nc"\nHeater,-1,\n';
    const { rows, errors } = parseLoadsCsv(csv);
    expect(rows.map((r) => [r.line, r.load.name])).toEqual([
      [2, 'Fridge'],
      [6, 'Fan'],
    ]);
    expect(rows[0]?.load.note).toBe('door\nseal');
    expect(errors).toEqual([
      { line: 5, column: 'watts', message: '"x" is not a number' },
      { line: 9, column: 'watts', message: 'must be at least 0' },
    ]);
  });

  it('explains bad cells in the camper’s terms', () => {
    const { errors } = parseLoadsCsv('name,watts,supply,days,response,standby,windows\n,"4,5",solar,weekends,hot,maybe,evening\n');
    expect(errors).toEqual([
      { line: 2, column: 'watts', message: '"4,5": use a dot for decimals' },
      { line: 2, column: 'supply', message: '"solar" must be one of dc, ac' },
      { line: 2, column: 'days', message: '"weekends" must be one of all, camp, drive' },
      { line: 2, column: 'response', message: '"hot" must be one of none, cooling, heating' },
      { line: 2, column: 'standby', message: '"maybe" must be yes or no' },
      { line: 2, column: 'windows', message: expect.stringContaining('18-23;6-8') },
      { line: 2, column: 'name', message: 'Name the load.' },
    ]);
  });

  it('applies the schema bounds, naming the column', () => {
    const { errors } = parseLoadsCsv('name,watts,dutyPct,quantity,windows\nLamp,5,150,1.5,18-25\n');
    // The schedule reader refuses 25 itself, before the schema checks the other cells.
    expect(errors.map((e) => e.column)).toEqual(['windows', 'quantity', 'dutyPct']);
  });

  it('reports an unclosed quote and extra cells on their line', () => {
    expect(parseLoadsCsv('name,watts\nLamp,5,extra\n').errors).toEqual([{ line: 2, column: null, message: 'has 3 cells but the header names 2 columns' }]);
    const open = parseLoadsCsv('name,watts\nLamp,5\n"Fan,12\n');
    expect(open.errors[0]).toEqual({ line: 3, column: null, message: 'a quoted cell is never closed (a " is missing)' });
  });

  it('refuses an empty file and a header without loads', () => {
    expect(parseLoadsCsv('').errors).toEqual([{ line: 1, column: null, message: expect.stringContaining('empty') }]);
    expect(parseLoadsCsv(`${HEADER}\n\n`).errors).toEqual([{ line: 1, column: null, message: 'The file has a header but no loads under it.' }]);
  });

  it('names the first line past the room the rig has left', () => {
    const { errors } = parseLoadsCsv('name,watts\nA,1\nB,1\nC,1\n', 2);
    expect(errors).toEqual([{ line: 4, column: null, message: expect.stringContaining('room for 2 more') }]);
  });
});

describe('formatLoadsCsv', () => {
  const load: CsvLoad = { name: 'LED lights', watts: 1.2, quantity: 6, supply: 'dc', windows: [[18, 23], [6, 8]], dutyPct: 100, days: 'all', response: 'none', setpointC: 18, location: 'cabin', surgeWatts: null, standby: false, note: 'six, dimmable' };

  it('writes the header and one CRLF-ended line per load, quoting where needed', () => {
    expect(formatLoadsCsv([load])).toBe(`${HEADER}\r\nLED lights,1.2,6,dc,18-23;6-8,100,all,none,18,no,"six, dimmable",cabin,\r\n`);
  });

  it('escapes formula-like text but not negative numbers', () => {
    const out = formatLoadsCsv([{ ...load, name: '=cmd|calc', note: '@x', setpointC: -5, location: 'outside', surgeWatts: 80 }]);
    expect(out.split('\r\n')[1]).toBe("'=cmd|calc,1.2,6,dc,18-23;6-8,100,all,none,-5,no,'@x,outside,80");
  });

  // Property: whatever a camper types, export then import gives back the same loads. Import reads
  // every line break as \n (files mix CRLF and LF); the server stores text that way too.
  it('round-trips any valid loads through parseLoadsCsv', () => {
    const lf = (s: string) => s.replace(/\r\n?/g, '\n');
    const text = fc.string({ unit: 'binary', maxLength: 40 }).map((s) => s.trim()).filter((s) => s.length > 0);
    const loadArb = fc.record({
      name: text,
      watts: fc.double({ min: 0, max: 100_000, noNaN: true, noDefaultInfinity: true }).map((w) => (Object.is(w, -0) ? 0 : w)),
      quantity: fc.integer({ min: 0, max: 1000 }),
      supply: fc.constantFrom('dc' as const, 'ac' as const),
      windows: fc.array(fc.tuple(fc.integer({ min: 0, max: 24 }), fc.integer({ min: 0, max: 24 })), { maxLength: 4 }),
      dutyPct: fc.double({ min: 0, max: 100, noNaN: true }).map((w) => (Object.is(w, -0) ? 0 : w)),
      days: fc.constantFrom('all' as const, 'camp' as const, 'drive' as const),
      response: fc.constantFrom('none' as const, 'cooling' as const, 'heating' as const),
      setpointC: fc.double({ min: -30, max: 40, noNaN: true }).map((w) => (Object.is(w, -0) ? 0 : w)),
      location: fc.constantFrom('cabin' as const, 'outside' as const),
      surgeWatts: fc.option(fc.double({ min: 0, max: 100_000, noNaN: true, noDefaultInfinity: true }).map((w) => (Object.is(w, -0) ? 0 : w)), { nil: null }),
      standby: fc.boolean(),
      note: fc.string({ unit: 'binary', maxLength: 60 }).map((s) => s.trim()),
    });
    fc.assert(
      fc.property(fc.array(loadArb, { minLength: 1, maxLength: 5 }), (loads) => {
        const { rows, errors } = parseLoadsCsv(formatLoadsCsv(loads));
        expect(errors).toEqual([]);
        expect(rows.map((r) => r.load)).toEqual(loads.map((l) => ({ ...l, name: lf(l.name), note: lf(l.note) })));
      }),
      { numRuns: 300 },
    );
  });
});
