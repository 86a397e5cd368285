// Cable and fuse check for the parts a proposal adds: current, voltage drop over the round trip,
// the smallest copper gauge that passes, and a fuse or breaker rating. Pure functions; every
// figure is an estimate and is shown with the cautions below.
//
// Sources (flags as in ../shared/reference/check-values.md):
// - Resistance: NEC (NFPA 70) Chapter 9, Table 8, uncoated stranded copper, DC at 75 °C, Ω/1000 ft.
//   VERIFIED (secondary), check-values.md §10a. 3, 1 and 3/0 AWG from the notes under that table.
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
  /** A gauge the installer chose, checked as well; null to take the suggestion. */
  chosenAwg: string | null;
}

/** How one gauge does on a run. */
export interface GaugeCheck {
  awg: string;
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

function checkGauge(g: Gauge, currentA: number, oneWayFt: number, sysV: number, limitPct: number, fuseA: number | null, table: AmpacityTable): GaugeCheck {
  const dropV = voltageDrop(currentA, g.ohmPerKft, oneWayFt);
  const dropPct = (dropV / sysV) * 100;
  const maxFuseA = maxProtection(g.awg, table);
  const dropOk = dropPct <= limitPct + 1e-9;
  const fuseOk = fuseA !== null && fuseA <= maxFuseA;
  return { awg: g.awg, mm2: cmilToMm2(g.cmil), dropV, dropPct, ampacityA: ampacity(g.awg, table), maxFuseA, dropOk, fuseOk, ok: dropOk && fuseOk };
}

/** Checks one run: drop with each Table 8 gauge, the fuse, the smallest gauge that passes both, and the installer's gauge. */
export function checkCable(input: CableInput): CableResult {
  const currentA = currentOf(input.source);
  const oneWayFt = input.oneWayM * FT_PER_M;
  const sysV = systemVolts(input.nominalVolts);
  const limitPct = DROP_LIMIT_PCT[input.circuit];
  const fuseA = fuseFor(currentA);
  const checks = NEC_TABLE_8.map((g) => checkGauge(g, currentA, oneWayFt, sysV, limitPct, fuseA, input.table));
  const suggested = checks.find((c) => c.ok) ?? null;
  const byDrop = checks.find((c) => c.dropOk)?.awg ?? null;
  const byFuse = checks.find((c) => c.fuseOk)?.awg ?? null;
  const chosen = input.chosenAwg ? (checks.find((c) => c.awg === input.chosenAwg) ?? null) : null;

  const notes: string[] = [];
  if (fuseA === null) notes.push(`125 % of ${currentA.toFixed(0)} A is above the largest fuse we size (600 A): split the load or raise the system voltage.`);
  if (!suggested) {
    notes.push(
      byDrop === null
        ? `Even 4/0 AWG drops more than ${limitPct} % over this length: shorten the run, use parallel conductors, or raise the system voltage.`
        : 'No single conductor up to 4/0 AWG can carry the fuse this current needs: use parallel conductors or a higher system voltage.',
    );
  }
  if (chosen && !chosen.ok) {
    if (!chosen.dropOk) notes.push(`${chosen.awg} AWG drops ${chosen.dropPct.toFixed(1)} % — more than the ${limitPct} % limit.`);
    if (!chosen.fuseOk && fuseA !== null) notes.push(`${chosen.awg} AWG may be protected at ${chosen.maxFuseA} A at most, below the ${fuseA} A fuse this current needs.`);
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
    fuseA,
    byDrop,
    byFuse,
    suggested,
    chosen,
    notes,
    estimate: true,
  };
}
