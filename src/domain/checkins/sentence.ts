import type { CheckInOutcome } from './checkins.schema';

// What a check-in's re-forecast says, in one or two sentences built from the computed outcome
// (when the bank is cut off, when charging reconnects it, when it runs out again, what goes
// unmet), never from a fixed phrase. Pure: the caller gives the time format.

const wh = (n: number) => `${Math.round(n).toLocaleString('en-US')} Wh`;
const pct = (n: number) => `${n.toFixed(n % 1 === 0 ? 0 : 1)} %`;

/** The outcome in words; `time` formats an hour's ISO time for the camper. */
export function outcomeSentence(o: CheckInOutcome, time: (iso: string) => string, stop?: string | null): string {
  const parts: string[] = [];
  const cutNow = o.firstCutoffAt !== null && o.firstCutoffAt === o.startAt && o.startSocPct <= o.floorSocPct;
  if (cutNow) parts.push(`At or below the bank’s ${pct(o.floorSocPct)} floor now: it is cut off.`);
  else if (o.firstCutoffAt) parts.push(`Runs out ${time(o.firstCutoffAt)}${stop ? ` at ${stop}` : ''}.`);
  else if (o.unmetWh <= 0) return `Makes it — lowest ${o.minSocPct.toFixed(0)} % on ${time(o.minSocAt)}, ${pct(o.endSocPct)} at the end.`;

  if (o.firstCutoffAt) {
    if (o.reconnectAt === undefined) {
      // Check-ins stored before the reconnect hour was kept: say only what is known.
      if (o.nextCutoffAt) parts.push(`After charging reconnects it, it runs out again ${time(o.nextCutoffAt)}.`);
    } else if (o.reconnectAt === null) {
      parts.push('Charging never lifts it back above the floor before the trip ends: it stays cut off.');
    } else {
      parts.push(`Charging reconnects it ${time(o.reconnectAt)}${o.nextCutoffAt ? `; it runs out again ${time(o.nextCutoffAt)}` : ''}.`);
    }
  }
  if (o.unmetWh > 0) {
    const hours = o.unmetHours ? ` over ${o.unmetHours} hour${o.unmetHours === 1 ? '' : 's'}` : '';
    parts.push(`${wh(o.unmetWh)} of the loads go unmet${hours}; the trip ends at ${pct(o.endSocPct)}.`);
  } else {
    parts.push(`The trip ends at ${pct(o.endSocPct)}.`);
  }
  return parts.join(' ');
}
