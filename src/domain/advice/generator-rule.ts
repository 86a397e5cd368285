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
export function generatorRule(p: { floorSocPct: number; reserveSocPct?: number | null; marginPts?: number; stopSocPct?: number }): GeneratorRule {
  const linePct = judgedLine(p.floorSocPct, p.reserveSocPct);
  const marginPts = p.marginPts ?? DEFAULT_GENERATOR_MARGIN_PTS;
  const stopSocPct = Math.min(100, Math.max(p.stopSocPct ?? DEFAULT_GENERATOR_STOP_PCT, 1));
  const startSocPct = Math.max(0, Math.min(linePct + marginPts, stopSocPct - 1));
  return { linePct, marginPts, startSocPct, stopSocPct };
}

/** The rule in words: "starts below 60 % (the 50 % floor + 10 points), stops at 90 %". */
export function generatorRuleText(r: GeneratorRule, lineName: 'floor' | 'reserve'): string {
  const round = (x: number) => Math.round(x * 10) / 10;
  return `starts below ${round(r.startSocPct)} % (the ${round(r.linePct)} % ${lineName} + ${round(r.marginPts)} points), stops at ${round(r.stopSocPct)} %`;
}
