// The bank chemistries and their defaults: plain data, without the schema library, so the app's
// pages can name and describe a bank without loading the validation code.

/** Bank chemistries the engine models. */
export const CHEMISTRIES = ['lifepo4', 'agm', 'flooded', 'gel'] as const;
/** A bank chemistry. */
export type Chemistry = (typeof CHEMISTRIES)[number];

/**
 * Chemistry-dependent bank defaults (forecast-engine.md defaults table, Revision 2; common practice).
 * `internalResistanceMilliohm` is per 100 Ah: a bank of C Ah has R = R100 × 100 / C.
 */
export const CHEMISTRY_DEFAULTS: Record<
  Chemistry,
  {
    nominalVolts: number;
    floorSocPct: number;
    maxChargeC: number;
    peukertExponent: number;
    chargeEfficiencyPct: number;
    internalResistanceMilliohm: number;
  }
> = {
  lifepo4: { nominalVolts: 12.8, floorSocPct: 10, maxChargeC: 0.5, peukertExponent: 1.02, chargeEfficiencyPct: 99, internalResistanceMilliohm: 8 },
  agm: { nominalVolts: 12, floorSocPct: 50, maxChargeC: 0.2, peukertExponent: 1.12, chargeEfficiencyPct: 92, internalResistanceMilliohm: 12 },
  gel: { nominalVolts: 12, floorSocPct: 50, maxChargeC: 0.2, peukertExponent: 1.12, chargeEfficiencyPct: 90, internalResistanceMilliohm: 15 },
  flooded: { nominalVolts: 12, floorSocPct: 50, maxChargeC: 0.2, peukertExponent: 1.25, chargeEfficiencyPct: 85, internalResistanceMilliohm: 15 },
};
