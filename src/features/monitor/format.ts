// Display helpers of the Logs section: times of readings in the log's own time zone. Pure.

const cache = new Map<string, Intl.DateTimeFormat>();

function fmt(timeZone: string, withYear: boolean): Intl.DateTimeFormat {
  const key = `${timeZone}|${withYear}`;
  let f = cache.get(key);
  if (!f) {
    f = new Intl.DateTimeFormat('en-GB', { timeZone, weekday: 'short', day: 'numeric', month: 'short', ...(withYear ? { year: 'numeric' } : {}), hour: '2-digit', minute: '2-digit', hourCycle: 'h23' });
    cache.set(key, f);
  }
  return f;
}

/** "Thu 21 Oct, 14:05" for an instant, in the log's zone. */
export function formatReadingTime(ms: number, timeZone: string, withYear = false): string {
  const parts = fmt(timeZone, withYear).formatToParts(new Date(ms));
  const get = (t: string) => parts.find((p) => p.type === t)?.value ?? '';
  return `${get('weekday')} ${get('day')} ${get('month')}${withYear ? ` ${get('year')}` : ''}, ${get('hour')}:${get('minute')}`;
}

/** "Thu 21 Oct" for a YYYY-MM-DD date. */
export function formatDate(date: string): string {
  const d = new Date(`${date}T12:00:00Z`);
  return Number.isNaN(d.getTime()) ? date : new Intl.DateTimeFormat('en-GB', { timeZone: 'UTC', weekday: 'short', day: 'numeric', month: 'short' }).format(d).replace(',', '');
}

/** "1.2 MB" / "340 KB". */
export function formatBytes(n: number): string {
  return n >= 1024 * 1024 ? `${(n / 1024 / 1024).toFixed(1)} MB` : `${Math.max(1, Math.round(n / 1024))} KB`;
}

/** The browser's own IANA zone (the camper's, usually), for a new upload. */
export function browserTimeZone(): string {
  try {
    return Intl.DateTimeFormat().resolvedOptions().timeZone || 'UTC';
  } catch {
    return 'UTC';
  }
}
