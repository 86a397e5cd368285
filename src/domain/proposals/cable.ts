// Cable and fuse check for the parts a proposal adds: current, voltage drop over the round trip,
// the smallest copper gauge that passes, and a fuse or breaker rating. Pure functions; every
// figure is an estimate and is shown with the cautions below.
//
// Sources (flags as in ../shared/reference/check-values.md):
// - Resistance, two methods the installer chooses between (DROP_METHODS):
//   · "abyc-20c": the circular-mil formula ABYC E-11 sizes with (R = K·L/CM), with K for annealed
//     copper at 20 °C: 10.371 Ω·cmil/ft, COMPUTED from the IACS resistivity 1/58 Ω·mm²/m
//     (1.7241 × 10⁻⁸ Ω·m; FROM MEMORY) — ABYC's printed K = 10.75 is copper near 29 °C (COMPUTED).
//     Metric sizes: IEC 60228 class 5 (flexible) plain copper, maximum Ω/km at 20 °C. VERIFIED
//     (secondary): mycableengineering.com "IEC 60228 DC resistance", uecables.com IEC 60228 table.
//   · "nec-75c": NEC (NFPA 70) Chapter 9, Table 8, uncoated stranded copper, DC at 75 °C, Ω/1000 ft.
//     VERIFIED (secondary), check-values.md §10a. 3, 1 and 3/0 AWG from the notes under that table.
//     Metric sizes: the IEC 60228 value × (1 + 0.00393 × 55) (copper α at 20 °C, FROM MEMORY;
//     check-values.md §10a's temperature note).
// - Drop limits: ABYC E-11 — 3 % for main feeders and circuits where drop must be kept to a
//   minimum (we count charging and main battery feeds among them, as installers do), 10 % where
//   drop is not critical. VERIFIED (secondary), check-values.md §10b; trade-notes.md "Installer practice".
// - Ampacity, two tables to choose from:
//   · "abyc-105c": 105 °C insulated conductors (boat/battery cable), not more than two bundled,
//     30 °C ambient, outside engine spaces; engine spaces × 0.85 — 33 CFR 183.425 Table E as
//     ABYC E-11 uses it. VERIFIED (secondary): Ancor 2023 catalogue appendix, Jamestown
//     Distributors "Wire Heat Ratings", a UL 1426 boat-cable maker's table — all the same values.
//   · "nec-310.16-75c": NEC Table 310.16, copper, 75 °C column (building wire in raceway, 30 °C
//     ambient, ≤ 3 current-carrying conductors), with the small-conductor limits of NEC 240.4(D)
//     (14/12/10 AWG protected at 15/20/30 A). VERIFIED (secondary): NEC 2023 tables reproduced
//     by intrysys.com, wiresizes.com and voltagelab.com.
// - Fuse sizes: NEC 240.6(A) standard ampere ratings (plus the fuse-only 1, 3, 6 and 10 A).
//   VERIFIED (secondary): callout.app and sparkshift.app NEC 2023 240.6.
// - Fuse rule (common practice): at least 125 % of the continuous current, rounded up to the next
//   standard size, and never above what the cable may be protected at. We do not use the codes'
//   allowances to go higher (next size up, 150 % on some marine feeders): a smaller fuse is safer.

/** One conductor size of NEC Chapter 9 Table 8. */
export interface Gauge {
  /** "14" … "4/0" (AWG). */
  awg: string;
  /** Area in circular mils (Table 8). */
  cmil: number;
  /** Stranded uncoated copper, DC resistance at 75 °C, Ω per 1000 ft (Table 8). */
  ohmPerKft: number;
}

/** NEC Chapter 9 Table 8, stranded uncoated copper at 75 °C, smallest to largest (check-values.md §10a). */
export const NEC_TABLE_8: readonly Gauge[] = [
  { awg: '14', cmil: 4_110, ohmPerKft: 3.14 },
  { awg: '12', cmil: 6_530, ohmPerKft: 1.98 },
  { awg: '10', cmil: 10_380, ohmPerKft: 1.24 },
  { awg: '8', cmil: 16_510, ohmPerKft: 0.778 },
  { awg: '6', cmil: 26_240, ohmPerKft: 0.491 },
  { awg: '4', cmil: 41_740, ohmPerKft: 0.308 },
  // 3 AWG: resistance from the notes of §10a; area 52,620 cmil FROM MEMORY (AWG series).
  { awg: '3', cmil: 52_620, ohmPerKft: 0.245 },
  { awg: '2', cmil: 66_360, ohmPerKft: 0.194 },
  // 1 AWG: resistance from the notes of §10a; area 83,690 cmil as in the Ancor table above.
  { awg: '1', cmil: 83_690, ohmPerKft: 0.154 },
  { awg: '1/0', cmil: 105_600, ohmPerKft: 0.122 },
  { awg: '2/0', cmil: 133_100, ohmPerKft: 0.0967 },
  // 3/0: resistance from the notes of §10a; area 167,800 cmil as in the Ancor table above.
  { awg: '3/0', cmil: 167_800, ohmPerKft: 0.0766 },
  { awg: '4/0', cmil: 211_600, ohmPerKft: 0.0608 },
];

/** The AWG sizes we size with, smallest first. */
export const AWG_SIZES = NEC_TABLE_8.map((g) => g.awg);

/** IEC 60228 class 5 (flexible) plain copper, maximum DC resistance at 20 °C, Ω/km (VERIFIED secondary, see the header). */
export const IEC_60228_CLASS5: readonly { mm2: number; ohmPerKm: number }[] = [
  { mm2: 6, ohmPerKm: 3.3 },
  { mm2: 10, ohmPerKm: 1.91 },
  { mm2: 16, ohmPerKm: 1.21 },
  { mm2: 25, ohmPerKm: 0.78 },
  { mm2: 35, ohmPerKm: 0.554 },
  { mm2: 50, ohmPerKm: 0.386 },
  { mm2: 70, ohmPerKm: 0.272 },
  { mm2: 95, ohmPerKm: 0.206 },
];

/** Metric sizes as size ids ("25 mm²"), smallest first. */
export const METRIC_SIZES = IEC_60228_CLASS5.map((c) => `${c.mm2} mm²`);

/** The two families of conductor sizes. */
export const SIZE_SYSTEMS = ['awg', 'metric'] as const;
export type SizeSystem = (typeof SIZE_SYSTEMS)[number];

/** How the voltage drop is worked out: resistance method and the conductor temperature it assumes. */
export const DROP_METHODS = ['abyc-20c', 'nec-75c'] as const;
export type DropMethod = (typeof DROP_METHODS)[number];

/** Each method in words, for beside the figure. */
export const DROP_METHOD_NAMES: Record<DropMethod, string> = {
  'abyc-20c': 'circular-mil formula as ABYC E-11 uses it, copper at 20 °C (IEC 60228 for mm² sizes)',
  'nec-75c': 'NEC Chapter 9 Table 8, stranded copper at 75 °C',
};

/** Short form: method and temperature. */
export const DROP_METHOD_SHORT: Record<DropMethod, string> = { 'abyc-20c': 'ABYC-style, 20 °C', 'nec-75c': 'NEC Table 8, 75 °C' };

/** Annealed copper at 20 °C in Ω·cmil/ft: 1.7241e-8 Ω·m ÷ 5.067075e-10 m² per cmil × 0.3048 m per ft (COMPUTED). */
export const COPPER_K_20C = (1.7241e-8 / 5.067075e-10) * 0.3048;

/** ABYC E-11's printed K for copper, Ω·cmil/ft (check-values.md §10b). */
export const ABYC_K = 10.75;

/** Copper's temperature coefficient at 20 °C, per °C (FROM MEMORY). */
export const COPPER_ALPHA_20C = 0.00393;

const M_PER_FT = 0.3048;

/** One conductor size of either family: its area and its resistance under each method, Ω per metre. */
export interface Conductor {
  /** "6" (AWG) or "25 mm²". */
  id: string;
  /** "6 AWG" or "25 mm²". */
  label: string;
  system: SizeSystem;
  cmil: number;
  mm2: number;
  ohmPerM: Record<DropMethod, number>;
  /** The AWG size whose ampacity it takes: its own, or for mm² the largest AWG not bigger in area (COMPUTED, conservative). */
  ampacityAwg: string;
}

const MM2_PER_CMIL = 5.067075e-4;

/** Every size we check with, AWG first then metric, each family smallest first. */
export const CONDUCTORS: readonly Conductor[] = [
  ...NEC_TABLE_8.map(
    (g): Conductor => ({
      id: g.awg,
      label: `${g.awg} AWG`,
      system: 'awg',
      cmil: g.cmil,
      mm2: g.cmil * MM2_PER_CMIL,
      ohmPerM: { 'abyc-20c': COPPER_K_20C / g.cmil / M_PER_FT, 'nec-75c': g.ohmPerKft / 1000 / M_PER_FT },
      ampacityAwg: g.awg,
    }),
  ),
  ...IEC_60228_CLASS5.map((c): Conductor => {
    const cmil = c.mm2 / MM2_PER_CMIL;
    const below = [...NEC_TABLE_8].reverse().find((g) => g.cmil <= cmil) ?? NEC_TABLE_8[0]!;
    return {
      id: `${c.mm2} mm²`,
      label: `${c.mm2} mm²`,
      system: 'metric',
      cmil,
      mm2: c.mm2,
      ohmPerM: { 'abyc-20c': c.ohmPerKm / 1000, 'nec-75c': (c.ohmPerKm / 1000) * (1 + COPPER_ALPHA_20C * 55) },
      ampacityAwg: below.awg,
    };
  }),
];

/** Every size id, AWG then metric. */
export const SIZE_IDS = CONDUCTORS.map((c) => c.id);

/** A size by id, or undefined. */
export function conductor(id: string): Conductor | undefined {
  return CONDUCTORS.find((c) => c.id === id);
}

/**
 * Which sizes a new proposal suggests from: metric (mm²) when the price list is in a currency of a
 * metric market, AWG for US and Canadian dollars, where cable is sold by gauge; a user who set
 * imperial units gets AWG. (Every account starts in metric units, so that setting alone cannot say
 * a US installer prefers mm²; each run can be switched.)
 */
export function preferredSizes(currency: string, units: 'metric' | 'imperial' | null): SizeSystem {
  if (units === 'imperial') return 'awg';
  return ['USD', 'CAD'].includes(currency.toUpperCase()) ? 'awg' : 'metric';
}

/** Ampacity tables a check may use. */
export const AMPACITY_TABLES = ['abyc-105c', 'abyc-105c-engine', 'nec-310.16-75c'] as const;
export type AmpacityTable = (typeof AMPACITY_TABLES)[number];

/** What each ampacity table is, in words for the proposal. */
export const AMPACITY_TABLE_NAMES: Record<AmpacityTable, string> = {
  'abyc-105c': '105 °C battery/boat cable outside engine spaces (33 CFR 183.425 Table E, as ABYC E-11 uses it)',
  'abyc-105c-engine': '105 °C battery/boat cable inside engine spaces (33 CFR 183.425 Table E × 0.85)',
  'nec-310.16-75c': 'NEC Table 310.16, copper, 75 °C column, with NEC 240.4(D) for 14–10 AWG',
};

// 33 CFR 183.425 Table E, 105 °C, outside engine spaces, A (VERIFIED secondary, see the header).
const ABYC_105C: Record<string, number> = {
  '14': 35, '12': 45, '10': 60, '8': 80, '6': 120, '4': 160, '3': 180, '2': 210, '1': 245, '1/0': 285, '2/0': 330, '3/0': 385, '4/0': 445,
};
// The same table, inside engine spaces (the table's own corrected column, 0.85).
const ABYC_105C_ENGINE: Record<string, number> = {
  '14': 30, '12': 38, '10': 51, '8': 68, '6': 102, '4': 136, '3': 153, '2': 178, '1': 208, '1/0': 242, '2/0': 280, '3/0': 327, '4/0': 378,
};
// NEC Table 310.16, copper, 75 °C (VERIFIED secondary, see the header).
const NEC_310_16_75C: Record<string, number> = {
  '14': 20, '12': 25, '10': 35, '8': 50, '6': 65, '4': 85, '3': 100, '2': 115, '1': 130, '1/0': 150, '2/0': 175, '3/0': 200, '4/0': 230,
};
// NEC 240.4(D): the most a small copper conductor may be protected at.
const NEC_240_4_D: Record<string, number> = { '14': 15, '12': 20, '10': 30 };

/** NEC 240.6(A) standard ampere ratings of fuses and breakers, with the fuse-only 1, 3, 6 and 10 A. */
export const STANDARD_FUSE_AMPS: readonly number[] = [
  1, 3, 6, 10, 15, 20, 25, 30, 35, 40, 45, 50, 60, 70, 80, 90, 100, 110, 125, 150, 175, 200, 225, 250, 300, 350, 400, 450, 500, 600,
];

/** Drop limits by circuit class, % (ABYC E-11). */
export const DROP_LIMIT_PCT = { critical: 3, 'non-critical': 10 } as const;
export type CircuitClass = keyof typeof DROP_LIMIT_PCT;

/** Safety cautions shown with every cable and fuse table (product.md "Safety", trade-notes.md). */
export const CABLE_CAUTIONS: readonly string[] = [
  'Disconnect shore power, switch off the inverter and chargers, and disconnect the battery bank before working on any wiring; insulate your tools.',
  'Fuse every positive conductor as close to the battery as possible — within about 18 cm (7 in) of the battery positive — with a fuse whose interrupt rating suits the bank (a Class T fuse is common at the main feed of a large LiFePO4 bank).',
  'These sizes are estimates from published tables for copper cable. Local codes (e.g. NEC Article 551 and NFPA 1192 for RVs in the US, ABYC for boats) and a qualified electrician decide.',
];

const FT_PER_M = 1 / 0.3048;

/** Ampacity of a gauge in a table, A. */
export function ampacity(awg: string, table: AmpacityTable): number {
  const t = table === 'abyc-105c' ? ABYC_105C : table === 'abyc-105c-engine' ? ABYC_105C_ENGINE : NEC_310_16_75C;
  const a = t[awg];
  if (a === undefined) throw new Error(`no ampacity for ${awg} AWG`);
  return a;
}

/** The largest fuse or breaker a gauge may be protected at: its ampacity, or NEC 240.4(D) for small conductors under the NEC table. */
export function maxProtection(awg: string, table: AmpacityTable): number {
  const a = ampacity(awg, table);
  return table === 'nec-310.16-75c' && NEC_240_4_D[awg] !== undefined ? Math.min(a, NEC_240_4_D[awg]) : a;
}

/** The gauge's Table 8 row. */
export function gauge(awg: string): Gauge {
  const g = NEC_TABLE_8.find((x) => x.awg === awg);
  if (!g) throw new Error(`unknown gauge ${awg}`);
  return g;
}

/** Area in mm² from circular mils (1 cmil = 5.067 × 10⁻⁴ mm², COMPUTED from the definition). */
export function cmilToMm2(cmil: number): number {
  return cmil * 5.067075e-4;
}

/** Volts lost over a copper run: I · R(Ω/kft) · (2 · one-way ft) / 1000 — round trip, out and back. */
export function voltageDrop(currentA: number, ohmPerKft: number, oneWayFt: number): number {
  return (currentA * ohmPerKft * 2 * oneWayFt) / 1000;
}

/** Volts lost over a run of one conductor under a method: I · R(Ω/m) · 2 · one-way metres. */
export function runDrop(currentA: number, c: Conductor, method: DropMethod, oneWayM: number): number {
  return currentA * c.ohmPerM[method] * 2 * oneWayM;
}

/** ABYC E-11's sizing formula: circular mils needed, CM = K·I·L/E with K = 10.75 and L the round trip in ft. */
export function abycCircularMils(currentA: number, roundTripFt: number, allowedDropV: number): number {
  return (10.75 * currentA * roundTripFt) / allowedDropV;
}

/** The 12, 24 or 48 V class of a bank (12.8 V LiFePO4 is a 12 V system): drop % is taken of this. */
export function systemVolts(nominalVolts: number): number {
  return 12 * Math.max(1, Math.round(nominalVolts / 12));
}

/** The usual inverter low-voltage shutdown per 12 V class, used when the bank has no cutoff (common practice: 10.5 V). */
export function defaultLowestVolts(nominalVolts: number): number {
  return 10.5 * (systemVolts(nominalVolts) / 12);
}

/** Continuous current an inverter draws from the bank at full output and the lowest bank voltage: W / efficiency / V. */
export function inverterCurrent(watts: number, efficiencyPct: number, lowestVolts: number): number {
  return watts / (efficiencyPct / 100) / lowestVolts;
}

/** The smallest standard rating at or above `amps` (NEC 240.6(A)), or null above 600 A. */
export function nextStandardFuse(amps: number): number | null {
  for (const s of STANDARD_FUSE_AMPS) if (s >= amps - 1e-9) return s;
  return null;
}

/** Fuse or breaker for a continuous current (common practice): ≥ 125 %, next standard size. */
export function fuseFor(continuousA: number): number | null {
  return nextStandardFuse(continuousA * 1.25);
}

/** What drives the current of a run. */
export type CableSource =
  | { kind: 'charger'; amps: number }
  | { kind: 'inverter'; watts: number; efficiencyPct: number; lowestVolts: number }
  | { kind: 'current'; amps: number };

/** One run to check. */
export interface CableInput {
  label: string;
  source: CableSource;
  /** One-way length in metres (the check doubles it). */
  oneWayM: number;
  circuit: CircuitClass;
  /** The bank's nominal volts: drop % is of its 12/24/48 V class. */
  nominalVolts: number;
  table: AmpacityTable;
  /** A size the installer chose ("6" AWG or "25 mm²"), checked as well; null to take the suggestion. */
  chosenAwg: string | null;
  /** Resistance method and temperature (default: ABYC-style at 20 °C, the method the drop limits come from). */
  method?: DropMethod;
  /** Which sizes to suggest from (default AWG). */
  sizes?: SizeSystem;
  /** Why the run carries this current, in words (e.g. the chargers' sum). */
  basis?: string;
}

/** How one gauge does on a run. */
export interface GaugeCheck {
  /** The size id: "6" (AWG) or "25 mm²". */
  awg: string;
  /** "6 AWG (13.3 mm²)" or "25 mm² (≈ 4 AWG)". */
  label: string;
  mm2: number;
  dropV: number;
  dropPct: number;
  ampacityA: number;
  /** The most it may be protected at, A. */
  maxFuseA: number;
  dropOk: boolean;
  fuseOk: boolean;
  ok: boolean;
}

/** The result of a run's check: every figure an estimate. */
export interface CableResult {
  label: string;
  currentA: number;
  oneWayM: number;
  oneWayFt: number;
  systemVolts: number;
  circuit: CircuitClass;
  limitPct: number;
  table: AmpacityTable;
  method: DropMethod;
  sizes: SizeSystem;
  /** Why the run carries this current, or null when the installer gave it. */
  basis: string | null;
  /** Fuse or breaker rating, A (≥ 125 % of the current, next standard size); null above 600 A. */
  fuseA: number | null;
  /** Smallest gauge that passes the drop limit alone. */
  byDrop: string | null;
  /** Smallest gauge that may carry the fuse. */
  byFuse: string | null;
  /** Smallest gauge that passes both; null when even 4/0 does not (parallel runs or a higher voltage needed). */
  suggested: GaugeCheck | null;
  /** The installer's gauge, checked; null when none was chosen. */
  chosen: GaugeCheck | null;
  /** Plain-words notes: what failed and what to do. */
  notes: string[];
  estimate: true;
}

/** The continuous current of a run, A. */
export function currentOf(source: CableSource): number {
  if (source.kind === 'inverter') return inverterCurrent(source.watts, source.efficiencyPct, source.lowestVolts);
  return source.amps;
}

function sizeLabel(c: Conductor): string {
  if (c.system === 'awg') return `${c.label} (${c.mm2.toFixed(1)} mm²)`;
  return `${c.label} (ampacity as ${c.ampacityAwg} AWG)`;
}

function checkSize(c: Conductor, currentA: number, oneWayM: number, sysV: number, limitPct: number, fuseA: number | null, table: AmpacityTable, method: DropMethod): GaugeCheck {
  const dropV = runDrop(currentA, c, method, oneWayM);
  const dropPct = (dropV / sysV) * 100;
  const maxFuseA = maxProtection(c.ampacityAwg, table);
  const dropOk = dropPct <= limitPct + 1e-9;
  const fuseOk = fuseA !== null && fuseA <= maxFuseA;
  return { awg: c.id, label: sizeLabel(c), mm2: c.mm2, dropV, dropPct, ampacityA: ampacity(c.ampacityAwg, table), maxFuseA, dropOk, fuseOk, ok: dropOk && fuseOk };
}

/** Checks one run: drop with each size of the family, the fuse, the smallest size that passes both, and the installer's size. */
export function checkCable(input: CableInput): CableResult {
  const method = input.method ?? 'abyc-20c';
  const sizes = input.sizes ?? 'awg';
  const currentA = currentOf(input.source);
  const oneWayFt = input.oneWayM * FT_PER_M;
  const sysV = systemVolts(input.nominalVolts);
  const limitPct = DROP_LIMIT_PCT[input.circuit];
  const fuseA = fuseFor(currentA);
  const family = CONDUCTORS.filter((c) => c.system === sizes);
  const checks = family.map((c) => checkSize(c, currentA, input.oneWayM, sysV, limitPct, fuseA, input.table, method));
  const suggested = checks.find((c) => c.ok) ?? null;
  const byDrop = checks.find((c) => c.dropOk)?.awg ?? null;
  const byFuse = checks.find((c) => c.fuseOk)?.awg ?? null;
  const chosenSize = input.chosenAwg ? conductor(input.chosenAwg) : undefined;
  const chosen = chosenSize ? checkSize(chosenSize, currentA, input.oneWayM, sysV, limitPct, fuseA, input.table, method) : null;
  const largest = family[family.length - 1]!.label;

  const notes: string[] = [];
  if (fuseA === null) notes.push(`125 % of ${currentA.toFixed(0)} A is above the largest fuse we size (600 A): split the load or raise the system voltage.`);
  if (!suggested) {
    notes.push(
      byDrop === null
        ? `Even ${largest} loses more than ${limitPct} % over this length: shorten the run, use parallel conductors, or raise the system voltage.`
        : `No single cable up to ${largest} can carry the fuse this current needs: use parallel conductors or a higher system voltage.`,
    );
  }
  if (chosen && !chosen.ok) {
    const name = chosenSize!.label;
    if (!chosen.dropOk) notes.push(`${name} loses ${chosen.dropPct.toFixed(1)} % — more than the ${limitPct} % limit.`);
    if (!chosen.fuseOk && fuseA !== null) notes.push(`${name} may be protected at ${chosen.maxFuseA} A at most, below the ${fuseA} A fuse this current needs.`);
  }
  return {
    label: input.label,
    currentA,
    oneWayM: input.oneWayM,
    oneWayFt,
    systemVolts: sysV,
    circuit: input.circuit,
    limitPct,
    table: input.table,
    method,
    sizes,
    basis: input.basis ?? null,
    fuseA,
    byDrop,
    byFuse,
    suggested,
    chosen,
    notes,
    estimate: true,
  };
}
