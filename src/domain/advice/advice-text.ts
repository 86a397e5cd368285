// The words of the advice, built from what the rules in advice.ts measured: the effect of a
// change, a generator that is not enough, the forecast's warnings. Pure.
import type { Forecast } from '../../engine';
import { ASSUMED_WEATHER } from '../../engine/light';
import { formatDay, formatRowTime, localParts, pct } from '../../lib/format';
import type { AdviceChange, AdviceWarning, ColdFix } from './advice';
import { CAUTIONS, coldCaution } from './cautions';
import { formatTemp, type Units } from '../../lib/units';

/** What a change does to the forecast, as figures. */
export type Effect = { fixes: boolean; score: number } & (
  | { kind: 'cutoff-gone'; lowestPct: number; lowestAt: string; reservePct: number }
  | { kind: 'cutoff-changed'; shortBefore: number; shortAfter: number; laterBy: number; firstCutoffAt: string }
  | { kind: 'little-change'; lowestPct: number; lowestAt: string }
  | { kind: 'lowest-changed'; fromPct: number; toPct: number }
);

/** "1 hour", "3 hours". */
export function hours(n: number): string {
  return n === 1 ? '1 hour' : `${n} hours`;
}

/** The effect in one sentence: hours without power and when the cutoff comes, or the lowest state of charge. */
export function effectText(e: Effect): string {
  switch (e.kind) {
    case 'cutoff-gone':
      return `No cutoff — lowest ${pct(e.lowestPct)} on ${formatRowTime(e.lowestAt)}${e.fixes ? '' : `, below the ${pct(e.reservePct)} reserve`}.`;
    case 'cutoff-changed': {
      const b = e.shortBefore;
      const a = e.shortAfter;
      const parts: string[] = [];
      if (a < b) parts.push(`${hours(b - a)} less without power (${b} → ${a} hours short)`);
      else if (a > b) parts.push(`${hours(a - b)} more without power (${b} → ${a} hours short)`);
      if (e.laterBy > 0) parts.push(`the first cutoff comes ${hours(e.laterBy)} later, ${formatRowTime(e.firstCutoffAt)}`);
      if (parts.length === 0) parts.push('little change: the bank still runs out at the same time');
      const text = parts.join('; ');
      return text[0]!.toUpperCase() + text.slice(1) + '.';
    }
    case 'little-change':
      return `Little change: lowest ${pct(e.lowestPct)} on ${formatRowTime(e.lowestAt)}.`;
    case 'lowest-changed': {
      const diff = e.toPct - e.fromPct;
      return `Lowest state of charge ${pct(e.fromPct)} → ${pct(e.toPct)} (${diff > 0 ? '+' : '−'}${Math.round(Math.abs(diff))} points).`;
    }
  }
}

/** "a, b and c". */
export function joinAnd(items: string[]): string {
  if (items.length <= 1) return items.join('');
  return `${items.slice(0, -1).join(', ')} and ${items[items.length - 1]}`;
}

/** The change when a generator alone cannot keep the bank up. */
export function notEnough(e: { text: string; score: number }, detail: string, lead = 'Even running in every allowed hour'): AdviceChange {
  return {
    kind: 'generator',
    title: 'A generator alone is not enough',
    effect: `${lead}: ${e.text.charAt(0).toLowerCase()}${e.text.slice(1)}`,
    detail: `${detail} The bank runs low where no generator may run (at night, or while driving): it needs more capacity, more charging or fewer loads.`,
    caution: CAUTIONS.generator,
    fixes: false,
    score: e.score,
  };
}

/**
 * The forecast's warnings in plain words, with their cautions, built from each warning's code and time
 * (not the engine's own English message), so temperatures follow the user's units.
 */
export function warningsOf(forecast: Forecast, units: Units = 'metric'): AdviceWarning[] {
  const out: AdviceWarning[] = [];
  const byCode = new Map<string, Forecast['warnings']>();
  for (const w of forecast.warnings) {
    const list = byCode.get(w.code) ?? [];
    list.push(w);
    byCode.set(w.code, list);
  }
  const cold = byCode.get('cold-charge-blocked') ?? [];
  const [firstCold] = cold;
  if (firstCold) {
    out.push({
      code: 'cold-charge-blocked',
      title: 'The bank refuses charge in the cold',
      message: `In ${hours(forecast.summary.coldBlockedHours || cold.length)} the LiFePO4 bank is below ${formatTemp(0, units)} and takes no charge, first on ${formatRowTime(firstCold.at)}; the panels and chargers still run the loads.`,
      caution: coldCaution(units),
    });
  }
  const assumed = byCode.get('weather-assumed');
  if (assumed && assumed.length > 0) {
    const dates = [...new Set(assumed.map((w) => localParts(w.at)?.date ?? w.at))].map(formatDay);
    out.push({
      code: 'weather-assumed',
      title: 'Weather assumed',
      message: `No weather was given for ${dates.join(', ')}: the forecast assumes partly cloudy skies (${ASSUMED_WEATHER.cloudOktas} oktas), a high of ${formatTemp(ASSUMED_WEATHER.highC, units)} and a low of ${formatTemp(ASSUMED_WEATHER.lowC, units)}. Add the expected weather for a truer answer.`,
    });
  }
  for (const w of byCode.get('weather-ignored') ?? []) out.push({ code: w.code, title: 'Weather not used', message: w.message });
  const [firstVolt] = byCode.get('voltage-cutoff') ?? [];
  if (firstVolt) {
    out.push({ code: 'voltage-cutoff', title: 'Low-voltage cutoff', message: `${firstVolt.message} (${formatRowTime(firstVolt.at)})` });
  }
  return out;
}

/** Which cold fixes alone make the trip, in one sentence (from the measured runs). */
export function coldAloneText(baseFine: boolean, fixes: readonly Pick<ColdFix, 'short' | 'fixes'>[]): string {
  if (baseFine) return 'The trip makes it as planned; each change below shows the margin it would add in the cold.';
  const alone = fixes.filter((f) => f.fixes).map((f) => f.short);
  if (alone.length === 0) return 'None of these alone makes the trip: combine them, add charging or use less.';
  if (alone.length === 1) return `On its own, only ${alone[0]} makes the trip.`;
  if (alone.length === fixes.length) return 'Any one of these alone makes the trip.';
  return `On its own, each of these makes the trip: ${joinAnd(alone)}.`;
}
