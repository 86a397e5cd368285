// The one generator rule, shared by the forecast's advice and the installer's upgrade sweep: a
// generator starts when the state of charge falls below the line the trip is judged against (the
// trip's reserve, else the bank's floor) plus a margin, and stops at a stated level. The margin is
// what the installer sees and can change; a generator that never starts changes nothing and is
// shown as such, never priced as an upgrade.
//
// Defaults (common practice): start 10 points above the line, so the generator runs before the
// bank reaches it with an hour or two of loads to spare; stop at 90 %, since past ~80–90 % a
// lead-acid bank is in its slow absorption stage (trade notes: "the last ~20 % is slow") and a
// generator's hours there buy little charge.

/** Points above the line the generator starts at, unless the installer says otherwise. */
export const DEFAULT_GENERATOR_MARGIN_PTS = 10;
/** State of charge the generator stops at, %, unless the installer says otherwise. */
export const DEFAULT_GENERATOR_STOP_PCT = 90;
/** The margin steps the advice tries when the default margin is not enough, points. */
export const GENERATOR_MARGIN_STEP_PTS = 10;

/** Where a generator starts and stops, and why. */
export interface GeneratorRule {
  /** The line the trip is judged against, %: the trip's reserve, else the bank's floor. */
  linePct: number;
  marginPts: number;
  /**
   * Points of charge the trip's cold strands at worst (state of charge − usable charge). The line
   * is judged on usable charge but a generator starts on the state of charge (forecast-engine.md),
   * so the start is raised by this much; without it a cold lead-acid bank cuts off at its floor
   * with the state of charge still far above the start level, and the generator never runs.
   */
  strandedPts: number;
  /** Starts below this state of charge, %. */
  startSocPct: number;
  /** Runs until this state of charge (or the end of its allowed hours), %. */
  stopSocPct: number;
}

/** The line a trip is judged against: the trip's reserve when it has one above the floor, else the bank's floor. */
export function judgedLine(floorSocPct: number, reserveSocPct: number | null | undefined): number {
  return reserveSocPct === null || reserveSocPct === undefined ? floorSocPct : Math.max(floorSocPct, reserveSocPct);
}

/**
 * The rule for one bank and trip. The start is kept at least 1 point below the stop (the engine
 * needs start < stop), so a margin too large for the stop level starts just below it.
 */
export function generatorRule(p: {
  floorSocPct: number;
  reserveSocPct?: number | null;
  marginPts?: number;
  stopSocPct?: number;
  strandedPts?: number;
}): GeneratorRule {
  const linePct = judgedLine(p.floorSocPct, p.reserveSocPct);
  const marginPts = p.marginPts ?? DEFAULT_GENERATOR_MARGIN_PTS;
  const strandedPts = Math.max(0, Math.round((p.strandedPts ?? 0) * 10) / 10);
  const stopSocPct = Math.min(100, Math.max(p.stopSocPct ?? DEFAULT_GENERATOR_STOP_PCT, 1));
  const startSocPct = Math.max(0, Math.min(linePct + marginPts + strandedPts, stopSocPct - 1));
  return { linePct, marginPts, strandedPts, startSocPct, stopSocPct };
}

/** The most charge the cold strands in any hour, points: max(SOC − usable charge) over the rows given. */
export function worstStrandedPts(rows: Iterable<{ socPct: number; usablePct: number }>): number {
  let worst = 0;
  for (const r of rows) worst = Math.max(worst, r.socPct - r.usablePct);
  return worst;
}

/** The rule in words: "starts below 60 % (the 50 % floor + 10 points), stops at 90 %". */
export function generatorRuleText(r: GeneratorRule, lineName: 'floor' | 'reserve'): string {
  const round = (x: number) => Math.round(x * 10) / 10;
  const cold = r.strandedPts > 0 ? ` + ${round(r.strandedPts)} points the cold strands` : '';
  return `starts below ${round(r.startSocPct)} % (the ${round(r.linePct)} % ${lineName} + ${round(r.marginPts)} points${cold}), stops at ${round(r.stopSocPct)} %`;
}
