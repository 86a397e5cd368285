import { describe, expect, it } from 'vitest';
import { detectLog } from '../../src/domain/monitor/detect';
import { previewLog } from '../../src/domain/monitor/monitor';
import { mappingSchema } from '../../src/domain/monitor/monitor.schema';

// Issue 19 item 16: a US-style log (month first, every day 12 or less) must not be read day first
// (1 Dec–3 Dec read day first is 12 Jan–12 Mar 23:00: 59 days 23 h, shown as 60 days)
// and spread 3 days over 3 months; read the wrong way round, it cannot be saved.

const TZ = 'America/Denver';

/** Hourly readings from 1 Dec 2026 00:00 for 3 days, written month first with AM/PM (invented values). */
function usLog(): string {
  const lines = ['Time,Voltage (V),Current (A),SOC (%)'];
  for (let h = 0; h < 72; h++) {
    const day = 1 + Math.floor(h / 24);
    const hour = h % 24;
    const h12 = hour % 12 === 0 ? 12 : hour % 12;
    lines.push(`12/${String(day).padStart(2, '0')}/2026 ${String(h12).padStart(2, '0')}:00 ${hour < 12 ? 'AM' : 'PM'},${(12.9 - h / 1000).toFixed(3)},-1.5,${(90 - h / 4).toFixed(1)}`);
  }
  return `${lines.join('\n')}\n`;
}

describe('day first or month first', () => {
  it('detection picks month first: it keeps the 72 hourly readings within 3 days', () => {
    const d = detectLog(usLog(), TZ);
    expect(d.mapping.time?.format).toBe('mdy');
    expect(d.notes.join(' ')).toMatch(/month first keeps the readings together \(3 days instead of 60 days\)/);
  });

  it('the preview read with month first has no problems and spans 71 hours', () => {
    const { preview } = previewLog(usLog(), { timeZone: TZ, mapping: null, limits: null });
    expect(preview.errorCount).toBe(0);
    expect((preview.to! - preview.from!) / 3_600_000).toBe(71);
  });

  it('read day first, the span looks wrong and the file is refused with a problem naming the fix', () => {
    const detected = detectLog(usLog(), TZ).mapping;
    const dayFirst = mappingSchema.parse({ ...detected, time: { ...detected.time, format: 'dmy' } });
    const { preview } = previewLog(usLog(), { timeZone: TZ, mapping: dayFirst, limits: null });
    expect(preview.errorCount).toBeGreaterThan(0);
    expect(preview.errors[0]!.message).toMatch(/^Read day first, the first 72 readings span 60 days; read month first they span 3 days\. Choose Month first/);
  });
});
