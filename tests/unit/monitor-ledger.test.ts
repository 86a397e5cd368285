import { describe, expect, it } from 'vitest';
import { dayLedger } from '../../src/domain/monitor/ledger';

// Issue 19 item 17: the log's day ledger in watt-hours beside the forecast's (invented days).

describe('the day ledger', () => {
  it('turns amp-hours into Wh at the bank’s nominal volts and puts the forecast of the same date beside them', () => {
    const { days, maxWh } = dayLedger(
      [
        { date: '2027-10-21', consumedAh: 40, chargedAh: 55, netAh: 15, hoursCovered: 24 },
        { date: '2027-10-22', consumedAh: 30.5, chargedAh: 10, netAh: -20.5, hoursCovered: 12 },
      ],
      12.8,
      [{ date: '2027-10-21', loadWh: 480, netWh: 150 }],
    );
    // 55 Ah × 12.8 V = 704 Wh in; 40 × 12.8 = 512 Wh out; net 192 Wh. Forecast: out 480, in 150 + 480 = 630.
    expect(days[0]).toEqual({ date: '2027-10-21', inWh: 704, outWh: 512, netWh: 192, hoursCovered: 24, forecast: { inWh: 630, outWh: 480 } });
    // 10 × 12.8 = 128 in; 30.5 × 12.8 = 390.4 → 390 out; −20.5 × 12.8 = −262.4 → −262; no forecast that day.
    expect(days[1]).toEqual({ date: '2027-10-22', inWh: 128, outWh: 390, netWh: -262, hoursCovered: 12, forecast: null });
    expect(maxWh).toBe(704);
  });
});
