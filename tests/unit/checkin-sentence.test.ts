import { describe, expect, it } from 'vitest';
import type { Forecast } from '../../src/engine';
import type { CheckInOutcome } from '../../src/domain/checkins/checkins.schema';
import { outcomeOf } from '../../src/domain/checkins/reforecast';
import { outcomeSentence } from '../../src/domain/checkins/sentence';

// Issue 19 item 15: the check-in's sentence comes from the computed outcome, never a fixed phrase.

const time = (iso: string) => iso.slice(0, 16).replace('T', ' ');

/** A camper at 48 % on a 50 % floor whose bank never climbs back to reconnect (the case the issue found). */
const stuck: CheckInOutcome = {
  startAt: '2027-10-20T07:00:00-06:00',
  startSocPct: 48,
  firstCutoffAt: '2027-10-20T07:00:00-06:00',
  nextCutoffAt: null,
  reconnectAt: null,
  unmetHours: 56,
  cutoffStop: 'Juniper Flat',
  minSocPct: 48,
  minSocAt: '2027-10-20T07:00:00-06:00',
  endSocPct: 52.2,
  unmetWh: 3277,
  hoursSimulated: 56,
  floorSocPct: 50,
};

describe('the check-in sentence', () => {
  it('a bank that is cut off and never reconnects says so, with the unmet energy and the end SOC', () => {
    const s = outcomeSentence(stuck, time);
    expect(s).not.toMatch(/lasts the trip/);
    expect(s).toContain('cut off');
    expect(s).toContain('stays cut off');
    expect(s).toContain('3,277 Wh of the loads go unmet over 56 hours');
    expect(s).toContain('52.2 %');
  });

  it('a bank that reconnects names the hour, and the next cutoff when there is one', () => {
    const s = outcomeSentence({ ...stuck, reconnectAt: '2027-10-20T13:00:00-06:00', nextCutoffAt: '2027-10-21T03:00:00-06:00', unmetWh: 410, unmetHours: 9 }, time);
    expect(s).toContain('Charging reconnects it 2027-10-20 13:00; it runs out again 2027-10-21 03:00.');
    expect(s).toContain('410 Wh of the loads go unmet over 9 hours');
  });

  it('a trip that makes it says its lowest point and nothing about a cutoff', () => {
    const s = outcomeSentence({ ...stuck, startSocPct: 80, firstCutoffAt: null, reconnectAt: null, unmetWh: 0, unmetHours: 0, minSocPct: 61, endSocPct: 70 }, time);
    expect(s).toBe('Makes it — lowest 61 % on 2027-10-20 07:00, 70 % at the end.');
  });
});

describe('the outcome keeps when the bank reconnects', () => {
  const row = (time: string, disconnected: boolean, unmetWatts: number) => ({ time, socPct: 50, disconnected, unmetWatts, stop: 0 });
  const forecast = (rows: ReturnType<typeof row>[]) =>
    ({
      hourly: rows,
      stops: [{ name: 'Juniper Flat' }],
      warnings: [],
      summary: { startSocPct: 48, firstCutoffAt: rows[0]!.time, minSocPct: 48, minSocAt: rows[0]!.time, endSocPct: 52.2, unmetWh: 30, hoursSimulated: rows.length, floorSocPct: 50 },
    }) as unknown as Forecast;

  it('the first connected hour after the cutoff, and the hours with unmet load', () => {
    const o = outcomeOf(forecast([row('h0', true, 10), row('h1', true, 10), row('h2', false, 0), row('h3', true, 10)]));
    expect(o.reconnectAt).toBe('h2');
    expect(o.unmetHours).toBe(3);
  });

  it('null when the bank is still cut off at the last hour', () => {
    expect(outcomeOf(forecast([row('h0', true, 10), row('h1', true, 10)])).reconnectAt).toBeNull();
  });
});
