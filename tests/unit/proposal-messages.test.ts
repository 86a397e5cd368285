import { describe, expect, it } from 'vitest';
import { candidatesSchema, cableRowSchema, decisionSchema, partSchema } from '../../src/domain/proposals/proposals.schema';
import { documentSchema } from '../../src/domain/proposals/document.schema';

// Messages a person reads next to a field or under a form: plain sentences, never field paths or
// bare "must be at least 0".

const messages = (r: { success: boolean; error?: { issues: { path: PropertyKey[]; message: string }[] } }) =>
  Object.fromEntries((r.error?.issues ?? []).map((i) => [i.path.map(String).join('.'), i.message]));

describe('plain-word messages of proposals', () => {
  it('a DC-DC size typed as "abc" (read as NaN by the form) is refused with what the field wants', () => {
    expect(messages(candidatesSchema.safeParse({ dcdcAmps: [Number('abc')] }))).toEqual({ 'dcdcAmps.0': 'Each DC-DC charger size must be a number from 1 to 200 A (numbers such as 30, 50).' });
  });

  it('sweep limits say what they limit', () => {
    const banks = Array.from({ length: 13 }, () => ({ chemistry: 'agm', capacityAh: 100 }));
    expect(messages(candidatesSchema.safeParse({ banks }))).toMatchObject({ banks: 'Try at most 12 banks in one sweep.' });
    expect(messages(candidatesSchema.safeParse({ generatorHours: [1, 2, 3, 4, 5, 6, 7] }))).toMatchObject({ generatorHours: 'Try at most 6 generator options in one sweep.' });
  });

  it('a part: no name, a quantity of 0, a negative price', () => {
    expect(messages(partSchema.safeParse({ name: ' ', quantity: 0, unitPrice: -1 }))).toEqual({ name: 'Name the part.', quantity: 'A quantity must be more than 0.', unitPrice: "A price can't be negative." });
  });

  it('a cable run: a length out of range and a size not in the list', () => {
    expect(messages(cableRowSchema.safeParse({ label: 'Run', source: { kind: 'current', amps: 10 }, oneWayM: 0, circuit: 'critical', chosenAwg: '7' }))).toEqual({
      oneWayM: "A run's one-way length must be a number from 0.05 to 100 m.",
      chosenAwg: 'Choose a cable size from the list (AWG or mm²).',
    });
  });

  it('the document and the acceptance', () => {
    expect(messages(documentSchema.safeParse({ taxRatePct: 60, validDays: 0.5 }))).toEqual({ taxRatePct: "The tax rate can't be more than 50 %.", validDays: 'Days valid must be a whole number from 1 to 365.' });
    expect(messages(decisionSchema.safeParse({ version: 2, decision: 'accepted', name: '  ' }))).toEqual({ name: 'Type your name to accept: it is recorded with the time, as a signature.' });
    expect(decisionSchema.safeParse({ version: 2, decision: 'declined' }).success).toBe(true);
  });

  it('no message is a bare fragment or names a field path', () => {
    const all = [
      candidatesSchema.safeParse({ dcdcAmps: ['x'], panels: [{}] }),
      partSchema.safeParse({ name: 5, quantity: 'a', unitPrice: null }),
      documentSchema.safeParse({ labour: [{ name: '', hours: -1, rate: -1 }], removals: [{ name: '', kind: 'sold', amount: -3 }] }),
    ].flatMap((r) => Object.values(messages(r)));
    const ours = all.filter((m) => !/^must be one of lifepo4|^must be flat|^must be a number$|^must be at least|^must be at most/.test(m));
    expect(ours.length).toBeGreaterThan(8);
    for (const m of ours) {
      expect(m, m).toMatch(/^[A-Z]/);
      expect(m, m).not.toMatch(/unitPrice|dcdcAmps|taxRatePct|[a-zA-Z]\.\d+\./);
    }
  });
});
