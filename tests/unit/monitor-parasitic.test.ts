import { describe, expect, it } from 'vitest';
import { parasiticWorking, readParasiticWatts, type NightBaseline } from '../../src/domain/monitor/baseline';

// Issue 19 items 13–14: the parasitic draw is the measured night baseline less what the rig's loads
// already run at night, shown with its arithmetic; an empty field or 0 W never wipes the standby load unasked.

const baseline = { drawA: 2.2, fromHour: 1, toHour: 5, nights: [], excludedCharging: 0 } as unknown as NightBaseline;

describe('the parasitic working', () => {
  it('measured − scheduled, both shown: 2.20 A × 12.8 V = 28.16 W; less a CPAP and fridge share of 18 W = 10.2 W', () => {
    const w = parasiticWorking(baseline, 12.8, { watts: 18, ambientC: 10 });
    expect(w.measuredW).toBe(28.2);
    expect(w.scheduledW).toBe(18);
    expect(w.parasiticW).toBe(10.2);
    expect(w.text).toBe('2.20 A × 12.8 V = 28.2 W measured − 18.0 W scheduled = 10.2 W');
  });

  it('night loads above the measured draw leave nothing parasitic, and say so', () => {
    const w = parasiticWorking(baseline, 12, { watts: 40, ambientC: 10 });
    // 2.2 × 12 = 26.4 W; 26.4 − 40 = −13.6 W → 0 W.
    expect(w.parasiticW).toBe(0);
    expect(w.text).toBe('2.20 A × 12 V = 26.4 W measured − 40.0 W scheduled = -13.6 W, so 0.0 W');
  });
});

describe('the watts typed', () => {
  it('an empty field is refused, not read as 0', () => {
    expect(readParasiticWatts('', false)).toMatchObject({ ok: false, message: 'Enter the parasitic draw in watts.' });
    expect(readParasiticWatts('   ', true).ok).toBe(false);
  });

  it('0 W needs the camper to confirm it', () => {
    expect(readParasiticWatts('0', false)).toMatchObject({ ok: false, needsConfirm: true });
    expect(readParasiticWatts('0', true)).toEqual({ ok: true, watts: 0 });
  });

  it('a decimal comma is read, and a value out of range names the range', () => {
    expect(readParasiticWatts('10,24', false)).toEqual({ ok: true, watts: 10.2 });
    expect(readParasiticWatts('abc', false)).toMatchObject({ ok: false, message: expect.stringContaining('0 to 5000') });
  });
});
