// The weight and space check of a bank option: what the new bank weighs and how much room it takes,
// against the rig's stated payload and battery space when the installer gives them.
import type { Chemistry } from '../../engine/light';

/**
 * Kilograms per kWh of nominal capacity, whole batteries with their cases (common practice, from
 * memory of generic spec sheets: a 12.8 V 100 Ah LiFePO4 battery ~11–13 kg; a 12 V 100 Ah AGM
 * ~28–31 kg; a 6 V 225 Ah flooded golf-cart battery ~28–30 kg; gel a little heavier than AGM).
 */
export const KG_PER_KWH: Record<Chemistry, number> = { lifepo4: 10, agm: 25, gel: 26, flooded: 22 };
/** Litres per kWh, case outside dimensions (common practice, from memory: a group-31 case holds ~12–13 L). */
export const LITRES_PER_KWH: Record<Chemistry, number> = { lifepo4: 7, agm: 10, gel: 10, flooded: 10 };
/** Without a stated payload, a bank heavier than this gets a "check the payload" note, kg (common practice: two people lift ~50 kg). */
export const HEAVY_BANK_KG = 100;

/** A bank option's weight and space, and what they mean for the rig. */
export interface BankWeight {
  kwh: number;
  kg: number;
  /** What the rig's bank weighs now, kg (same figures). */
  oldKg: number;
  /** kg − oldKg: what the rig carries more (negative: less). */
  addedKg: number;
  litres: number;
  oldLitres: number;
  payloadKg: number | null;
  batterySpaceL: number | null;
  /** Over the payload or the space: the option should not be fitted as it is. */
  flagged: boolean;
  /** What to say, in plain words. */
  note: string;
}

const r1 = (x: number) => Math.round(x * 10) / 10;

/** The check for one bank, against the bank it replaces. */
export function bankWeight(
  bank: { chemistry: Chemistry; capacityAh: number; nominalVolts: number },
  old: { chemistry: Chemistry; capacityAh: number; nominalVolts: number },
  limits: { payloadKg: number | null; batterySpaceL: number | null },
): BankWeight {
  const kwh = (bank.capacityAh * bank.nominalVolts) / 1000;
  const oldKwh = (old.capacityAh * old.nominalVolts) / 1000;
  const kg = kwh * KG_PER_KWH[bank.chemistry];
  const oldKg = oldKwh * KG_PER_KWH[old.chemistry];
  const litres = kwh * LITRES_PER_KWH[bank.chemistry];
  const oldLitres = oldKwh * LITRES_PER_KWH[old.chemistry];
  const addedKg = kg - oldKg;
  const notes: string[] = [];
  let flagged = false;
  if (limits.payloadKg !== null) {
    if (addedKg > limits.payloadKg) {
      flagged = true;
      notes.push(`Too heavy: it adds ${Math.round(addedKg)} kg, more than the rig’s stated ${Math.round(limits.payloadKg)} kg payload.`);
    } else if (addedKg > limits.payloadKg / 2) {
      notes.push(`Heavy: it adds ${Math.round(addedKg)} kg, over half the rig’s stated ${Math.round(limits.payloadKg)} kg payload.`);
    }
  } else if (kg >= HEAVY_BANK_KG && addedKg > 0) {
    notes.push(`About ${Math.round(kg)} kg: check the rig’s payload (none stated).`);
  }
  if (limits.batterySpaceL !== null && litres > limits.batterySpaceL) {
    flagged = true;
    notes.push(`Too big: about ${Math.round(litres)} L of batteries, more than the stated ${Math.round(limits.batterySpaceL)} L of room.`);
  }
  return {
    kwh: r1(kwh),
    kg: r1(kg),
    oldKg: r1(oldKg),
    addedKg: r1(addedKg),
    litres: r1(litres),
    oldLitres: r1(oldLitres),
    payloadKg: limits.payloadKg,
    batterySpaceL: limits.batterySpaceL,
    flagged,
    note: notes.join(' '),
  };
}
