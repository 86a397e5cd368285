import type { Sample } from './parse';

// A log's readings thinned for a chart: one point per time bucket (at least 10 minutes, wider for
// long logs so a chart never gets more than `maxPoints`): mean volts, amps and temperature, and
// the bucket's last state of charge (the forecast's SOC is an end-of-hour value too). Pure.

export interface SeriesPoint {
  t: number;
  volts: number | null;
  amps: number | null;
  socPct: number | null;
  tempC: number | null;
}

/** Readings averaged into buckets; `t` is the last reading's time in each bucket. */
export function downsample(samples: Sample[], maxPoints = 5000): SeriesPoint[] {
  const first = samples[0];
  const last = samples.at(-1);
  if (!first || !last) return [];
  const span = last.t - first.t;
  const minute = 60_000;
  const bucket = Math.max(10 * minute, Math.ceil(span / maxPoints / minute) * minute);
  const out: SeriesPoint[] = [];
  let key = NaN;
  let acc = { n: 0, v: 0, vn: 0, a: 0, an: 0, c: 0, cn: 0, soc: null as number | null, t: 0 };
  const flush = () => {
    if (acc.n === 0) return;
    const r = (x: number, d: number) => Math.round(x * 10 ** d) / 10 ** d;
    out.push({ t: acc.t, volts: acc.vn ? r(acc.v / acc.vn, 3) : null, amps: acc.an ? r(acc.a / acc.an, 3) : null, socPct: acc.soc, tempC: acc.cn ? r(acc.c / acc.cn, 1) : null });
  };
  for (const s of samples) {
    const k = Math.floor(s.t / bucket);
    if (k !== key) {
      flush();
      key = k;
      acc = { n: 0, v: 0, vn: 0, a: 0, an: 0, c: 0, cn: 0, soc: null, t: 0 };
    }
    acc.n++;
    acc.t = s.t;
    if (s.volts !== null) [acc.v, acc.vn] = [acc.v + s.volts, acc.vn + 1];
    if (s.amps !== null) [acc.a, acc.an] = [acc.a + s.amps, acc.an + 1];
    if (s.tempC !== null) [acc.c, acc.cn] = [acc.c + s.tempC, acc.cn + 1];
    if (s.socPct !== null) acc.soc = s.socPct;
  }
  flush();
  return out;
}
