// Trip watch: the e-mail that tells the crew the answer changed (issue #20) — the new verdict, the
// cutoff in the stop's local time, the day that changed and which stop's weather moved it, the advice.
import { zonePlainName } from '../../lib/clock';
import { formatDay, formatRowTime } from '../../lib/format';
import type { WatchChangeReason } from './change';

export interface WatchMailInput {
  tripName: string;
  /** The new verdict's headline, e.g. "Runs out Fri 11 Dec at 03:00 at Ridge camp — 5 hours short". */
  headline: string;
  /** Row time of the first cutoff in the stop's own offset ("2026-12-11T03:00:00-07:00"), or null. */
  cutoffAt: string | null;
  cutoffStop: string | null;
  /** The cutoff stop's time zone (IANA), named in the e-mail beside the row's own UTC offset. */
  cutoffZone?: string | null;
  reasons: WatchChangeReason[];
  /** The stop-day whose weather moved the most since the answer the crew saw. */
  changedDay: { date: string; stop: string } | null;
  advice: string[];
  tripUrl: string;
  unsubscribeUrl: string;
}

/** Each reason in words (the e-mail and the watch's timeline). */
export const REASON_WORDS: Record<WatchChangeReason, string> = {
  verdict: 'the verdict changed',
  'cutoff-moved': 'the cutoff moved by 3 hours or more',
  'cutoff-appeared': 'the bank now cuts off',
  'cutoff-gone': 'the bank no longer cuts off',
  'lowest-moved': 'the lowest state of charge moved by 10 points or more',
};

/** A row time's own offset in words: "2026-12-11T03:00:00-07:00" → "UTC−07:00". */
export function rowOffset(rowTime: string): string | null {
  if (/(Z|[+-]00:00)$/.test(rowTime)) return 'UTC';
  const m = /([+-])(\d{2}):(\d{2})$/.exec(rowTime);
  return m ? `UTC${m[1] === '-' ? '−' : '+'}${m[2]}:${m[3]}` : null;
}

/** The zone an e-mail names beside a cutoff: "Phoenix time, UTC−07:00", or the offset alone. */
function zoneWords(rowTime: string, zone: string | null | undefined): string | null {
  const offset = rowOffset(rowTime);
  const name = zone ? zonePlainName(zone, rowTime) : null;
  if (name && offset && name !== offset && name !== 'UTC') return `${name}, ${offset}`;
  return offset ?? name;
}

export function watchMail(m: WatchMailInput): { subject: string; text: string } {
  const lines = [`The forecast for ${m.tripName} changed with the latest weather.`, '', m.headline];
  if (m.cutoffAt) {
    const zone = zoneWords(m.cutoffAt, m.cutoffZone);
    lines.push(`Cutoff: ${formatRowTime(m.cutoffAt)} local time${m.cutoffStop ? ` at ${m.cutoffStop}` : ''}${zone ? ` (${zone})` : ''}.`);
  }
  else lines.push('The bank does not cut off.');
  lines.push(`What changed: ${m.reasons.map((r) => REASON_WORDS[r]).join('; ')}.`);
  if (m.changedDay) lines.push(`Why: the weather for ${formatDay(m.changedDay.date)} at ${m.changedDay.stop} changed the most.`);
  if (m.advice.length) lines.push('', 'What would help:', ...m.advice.map((a) => `- ${a}`));
  lines.push('', `Open the trip: ${m.tripUrl}`, `Stop these e-mails for this trip: ${m.unsubscribeUrl}`);
  return { subject: `${m.tripName}: ${m.headline}`, text: lines.join('\n') };
}
