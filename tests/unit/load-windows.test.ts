import { describe, expect, it } from 'vitest';
import { formatLoadsCsv, parseLoadsCsv } from '../../src/domain/loads/loads-csv';
import { loadFormSchema, loadToForm } from '../../src/domain/loads/load-form';
import { coveredHours, isAllDay } from '../../src/domain/loads/windows';

// Regression (issue 17): the loads CSV and the load form read schedules with two parsers that
// disagreed. `Spare outlet,5,none` imported as "no window", opened in the form and saved came back
// running all day, 24 hours; `5-5` imported but the form refused it, `30-40` had two messages.
// Every window form a CSV can carry must survive import → form → save → export → import.

const importOne = (cell: string) => parseLoadsCsv(`name,watts,windows\nSpare outlet,5,${cell}\n`);

describe('one reading of a schedule for the loads CSV and the load form', () => {
  it.each([
    ['', [[0, 24]]],
    ['0-24', [[0, 24]]],
    ['all day', [[0, 24]]],
    ['none', []],
    ['NONE', []],
    ['18-23;6-8', [[18, 23], [6, 8]]],
    ['"18-23, 6-8"', [[18, 23], [6, 8]]],
    ['22-6', [[22, 6]]],
    ['18:00-23:00', [[18, 23]]],
    ['5-5', [[5, 5]]],
    ['24-0', [[24, 0]]],
    ['18-23;5-5', [[18, 23], [5, 5]]],
    ['0-12;12-24', [[0, 12], [12, 24]]],
  ] as [string, [number, number][]][])('CSV %j keeps its hours through the form and back', (cell, windows) => {
    const imported = importOne(cell);
    expect(imported.errors).toEqual([]);
    const load = imported.rows[0]!.load;
    expect(load.windows).toEqual(windows);

    const saved = loadFormSchema.parse(loadToForm(load));
    expect(coveredHours(saved.windows)).toEqual(coveredHours(windows));
    // The form writes a list that covers every hour as "all day"; anything else comes back as it was.
    expect(saved.windows).toEqual(isAllDay(windows) ? [[0, 24]] : windows);

    const again = parseLoadsCsv(formatLoadsCsv([{ ...load, windows: saved.windows }]));
    expect(again.errors).toEqual([]);
    expect(again.rows[0]!.load.windows).toEqual(saved.windows);
  });

  it('keeps a load with no window at no window: it never becomes all day', () => {
    const load = importOne('none').rows[0]!.load;
    const form = loadToForm(load);
    expect(form.windows).toBe('none');
    expect(loadFormSchema.parse(form).windows).toEqual([]);
  });

  it.each(['30-40', '18-25', 'evening', '18-', '6pm-11pm'])('CSV and form refuse %j with the same message', (cell) => {
    const imported = importOne(cell);
    expect(imported.rows).toEqual([]);
    expect(imported.errors).toHaveLength(1);
    expect(imported.errors[0]).toMatchObject({ line: 2, column: 'windows' });
    const form = loadFormSchema.safeParse({ ...loadToForm({ name: 'Spare outlet', watts: 5 }), windows: cell });
    expect(form.success).toBe(false);
    const issue = form.error!.issues.find((i) => i.path[0] === 'windows');
    expect(issue?.message).toBe(imported.errors[0]!.message);
  });
});
