import { describe, expect, it } from 'vitest';
import { rigInputSchema } from '../../src/domain/rigs/rigs.schema';

const rig = (bank: Record<string, unknown>) => ({ name: 'Test rig', bank: { chemistry: 'lifepo4', capacityAh: 200, ...bank } });

// Band 0.75–1.0 × nominal volts is common practice (see CUTOFF_BAND).
describe('rig low-voltage cutoff range', () => {
  it('refuses a 48 V cutoff on a 12.8 V bank, naming the field', () => {
    const r = rigInputSchema.safeParse(rig({ nominalVolts: 12.8, cutoffVolts: 48 }));
    expect(r.success).toBe(false);
    const issue = r.error!.issues.find((i) => i.path.join('.') === 'bank.cutoffVolts');
    expect(issue?.message).toMatch(/low-voltage cutoff/i);
    expect(issue?.message).toContain('9.6 V'); // 0.75 × 12.8 = 9.6
    expect(issue?.message).toContain('12.8 V');
  });
  it('refuses a cutoff far below the band (5 V on a 12 V AGM bank by its chemistry default)', () => {
    expect(rigInputSchema.safeParse(rig({ chemistry: 'agm', cutoffVolts: 5 })).success).toBe(false);
  });
  it('accepts the usual cutoffs: 10.0 V on 12.8 V LiFePO4, 10.5 V on 12 V AGM, 42 V on 51.2 V', () => {
    expect(rigInputSchema.safeParse(rig({ nominalVolts: 12.8, cutoffVolts: 10 })).success).toBe(true);
    expect(rigInputSchema.safeParse(rig({ chemistry: 'agm', cutoffVolts: 10.5 })).success).toBe(true);
    expect(rigInputSchema.safeParse(rig({ nominalVolts: 51.2, cutoffVolts: 42 })).success).toBe(true);
    expect(rigInputSchema.safeParse(rig({ nominalVolts: 12.8, cutoffVolts: null })).success).toBe(true);
  });
});
