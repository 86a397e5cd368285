import { readFileSync } from 'node:fs';
import { TEST_PRICES } from '../tests/helpers/prices';
import type { RunningServer } from '../tests/helpers/server';

/**
 * The load test's heavy run (issue 15): while 10 maximal upgrade sweeps (1,000 options on a
 * 60-day plan, five installers with two each) and 2 previews of a 10 MB monitor log run, four
 * clients call /api/health back to back. Reports health p50/p99/max, the server's peak RSS
 * (worker threads included: they share the process) and what the heavy requests answered.
 * Targets: health p99 ≤ 100 ms, RSS ≤ 400 MB.
 */
export interface HeavyResult {
  healthCalls: number;
  p50: number;
  p99: number;
  max: number;
  /** p99 of the same polling for 3 s before the heavy work starts. */
  idleP99: number;
  /** Peak of the server's processes together, and of the largest one alone. */
  peakRssMb: number;
  peakProcessRssMb: number;
  processes: number;
  startRssMb: number;
  /** A 10 MB log saved while health is polled, then its page read. */
  save: { status: number; ms: number; healthP99: number; healthMax: number; readings: number };
  logPage: { p50: number; max: number; bytes: number };
  readingsPage: { p50: number; max: number };
  sweeps: Record<string, number>;
  previews: Record<string, number>;
  seconds: number;
}

const HEALTH_TARGET_MS = 100;
const RSS_TARGET_MB = 400;
const LOG_PAGE_TARGET_MS = 100;

function ownRssKb(pid: number): number {
  try {
    const m = /VmRSS:\s+(\d+) kB/.exec(readFileSync(`/proc/${pid}/status`, 'utf8'));
    return m ? Number(m[1]) : 0;
  } catch {
    return 0; // the process ended between listing and reading
  }
}

function childrenOf(pid: number): number[] {
  try {
    return readFileSync(`/proc/${pid}/task/${pid}/children`, 'utf8').trim().split(/\s+/).filter(Boolean).map(Number);
  } catch {
    return [];
  }
}

/**
 * The server's RSS: its own process and every process under it (the cluster's worker processes,
 * WEB_CONCURRENCY), their worker threads included; and the largest single process.
 */
function rssMb(pid: number): { total: number; largest: number } {
  let total = 0;
  let largest = 0;
  for (const stack = [pid]; stack.length; ) {
    const p = stack.pop()!;
    const kb = ownRssKb(p);
    total += kb;
    largest = Math.max(largest, kb);
    stack.push(...childrenOf(p));
  }
  return { total: Math.round(total / 1024), largest: Math.round(largest / 1024) };
}

/** A valid monitor log of about `bytes`: one reading a minute (time, volts, amps, SOC, temperature). */
export function monitorLogCsv(bytes: number): string {
  const lines = ['Time,Voltage (V),Current (A),SOC (%),Temperature (C)'];
  let size = lines[0]!.length + 1;
  const start = Date.parse('2027-05-01T00:00:00Z');
  for (let i = 0; size < bytes; i++) {
    const soc = 60 + 30 * Math.sin(i / 720);
    const line = `${new Date(start + i * 60_000).toISOString()},${(12.8 + soc / 200).toFixed(3)},${(Math.sin(i / 360) * 8).toFixed(2)},${soc.toFixed(1)},${(18 + 6 * Math.sin(i / 1440)).toFixed(1)}`;
    lines.push(line);
    size += line.length + 1;
  }
  return `${lines.join('\n')}\n`;
}

export async function heavyRun(p: {
  url: string;
  server: RunningServer;
  ownerCookie: string;
  rigId: string;
  sweepsPerInstaller?: number;
  previewCount?: number;
}): Promise<HeavyResult> {
  const { url } = p;
  const JSON_HEADERS = { 'content-type': 'application/json', origin: url };
  const must = async <T>(res: Response, status: number, what: string): Promise<T> => {
    if (res.status !== status) throw new Error(`${what}: ${res.status} ${(await res.text()).slice(0, 300)}`);
    return (await res.json()) as T;
  };
  const owner = { ...JSON_HEADERS, cookie: p.ownerCookie };

  // A 60-day trip (59 nights at one stop) on the rig, and its saved forecast.
  const trip = await must<{ id: string }>(
    await fetch(`${url}/api/trips`, {
      method: 'POST',
      headers: owner,
      body: JSON.stringify({
        rigId: p.rigId,
        name: 'Long summer',
        stops: [{ name: 'High desert camp', lat: 38.6, lon: -109.6, timeZone: 'America/Denver', arrive: '2027-06-01', nights: 59 }],
      }),
    }),
    201,
    'long trip',
  );
  const forecast = await must<{ id: string }>(
    await fetch(`${url}/api/trips/${trip.id}/forecasts`, { method: 'POST', headers: owner, body: '{}' }),
    201,
    'forecast',
  );

  // Five installers with a grant each; two sweeps each (the per-installer limit).
  const installers: string[] = [];
  for (let i = 0; i < 5; i++) {
    const email = `heavy.installer.${i + 1}@sweep-load.test`;
    const up = await fetch(`${url}/api/auth/sign-up/email`, {
      method: 'POST',
      headers: JSON_HEADERS,
      body: JSON.stringify({ name: `Sweep installer ${i + 1}`, email, password: 'sweep-installer-password', kind: 'installer' }),
    });
    await must(up, 200, 'installer sign-up');
    installers.push(
      up.headers
        .getSetCookie()
        .map((c) => c.split(';')[0])
        .join('; '),
    );
    await must(
      await fetch(`${url}/api/rigs/${p.rigId}/grants`, { method: 'POST', headers: owner, body: JSON.stringify({ email }) }),
      202,
      'grant',
    );
  }
  // 13 × 11 × 7 − 1 = 1,000 options: the most a sweep may try.
  const candidates = {
    banks: [150, 200, 250, 300, 350, 400, 450, 500, 600, 700, 800, 1000].map((capacityAh) => ({ chemistry: 'lifepo4', capacityAh })),
    panels: [100, 150, 200, 250, 300, 350, 400, 500, 600, 800].map((watts) => ({ watts, mounting: 'flat' })),
    dcdcAmps: [20, 30, 40, 50, 60, 80],
  };
  const sweepBody = JSON.stringify({ candidates, prices: TEST_PRICES });

  const csv = monitorLogCsv(10 * 1024 * 1024 - 64 * 1024);
  const upload = () => {
    const form = new FormData();
    form.set('file', new Blob([csv], { type: 'text/csv' }), 'long-log.csv');
    form.set('timeZone', 'America/Denver');
    return fetch(`${url}/api/rigs/${p.rigId}/monitor-logs?preview=1`, {
      method: 'POST',
      headers: { origin: url, cookie: p.ownerCookie },
      body: form,
    });
  };

  // The same polling with nothing heavy running: what this machine gives /api/health anyway.
  const idle = await pollFor(url, 3000);

  const pid = p.server.child.pid!;
  const startRssMb = rssMb(pid).total;
  const processes = (function count(x: number): number {
    return 1 + childrenOf(x).reduce((n, c) => n + count(c), 0);
  })(pid);
  let peakRssMb = startRssMb;
  let peakProcessRssMb = 0;
  const sampler = setInterval(() => {
    const r = rssMb(pid);
    peakRssMb = Math.max(peakRssMb, r.total);
    peakProcessRssMb = Math.max(peakProcessRssMb, r.largest);
  }, 50);

  const tally = (into: Record<string, number>) => async (res: Response) => {
    into[res.status] = (into[res.status] ?? 0) + 1;
    await res.arrayBuffer();
  };
  const sweeps: Record<string, number> = {};
  const previews: Record<string, number> = {};
  const started = performance.now();
  let done = false;
  const heavy = Promise.all([
    ...installers.flatMap((cookie) =>
      Array.from({ length: p.sweepsPerInstaller ?? 2 }, () =>
        fetch(`${url}/api/forecasts/${forecast.id}/sweep`, { method: 'POST', headers: { ...JSON_HEADERS, cookie }, body: sweepBody }).then(
          tally(sweeps),
        ),
      ),
    ),
    ...Array.from({ length: p.previewCount ?? 2 }, () => upload().then(tally(previews))),
  ]).finally(() => (done = true));

  const busy = await pollUntil(url, () => done);
  await heavy;
  const seconds = (performance.now() - started) / 1000;

  // Saving a 10 MB log (read and written in the pool) while health is polled, then reading its page.
  const mapping = {
    headerLine: 1,
    delimiter: ',',
    decimal: '.',
    timeZone: 'America/Denver',
    time: { column: 0, dateColumn: null, format: 'iso' },
    voltage: { column: 1, unit: 'V' },
    current: { column: 2, unit: 'A', sign: 'charge-positive' },
    soc: { column: 3, unit: '%' },
    temperature: { column: 4, unit: 'C' },
  };
  const form = new FormData();
  form.set('file', new Blob([csv], { type: 'text/csv' }), 'long-log.csv');
  form.set('timeZone', 'America/Denver');
  form.set('mapping', JSON.stringify(mapping));
  let saved = false;
  const t0 = performance.now();
  const saving = fetch(`${url}/api/rigs/${p.rigId}/monitor-logs`, { method: 'POST', headers: { origin: url, cookie: p.ownerCookie }, body: form }).finally(
    () => (saved = true),
  );
  const duringSave = await pollUntil(url, () => saved);
  const saveRes = await saving;
  const saveMs = performance.now() - t0;
  const log = (await saveRes.json()) as { id?: string; sampleCount?: number };
  clearInterval(sampler);
  const pageMs: number[] = [];
  const readingsMs: number[] = [];
  let pageBytes = 0;
  if (log.id) {
    for (let i = 0; i < 10; i++) {
      const a = performance.now();
      const body = await (await fetch(`${url}/api/monitor-logs/${log.id}`, { headers: { cookie: p.ownerCookie } })).arrayBuffer();
      pageMs.push(performance.now() - a);
      pageBytes = body.byteLength;
      const b = performance.now();
      await (await fetch(`${url}/api/monitor-logs/${log.id}/readings?limit=1000&after=${Date.parse('2027-05-20T00:00:00Z')}`, { headers: { cookie: p.ownerCookie } })).arrayBuffer();
      readingsMs.push(performance.now() - b);
    }
  }
  const savedHealth = quantiles(duringSave.length ? duringSave : [0]);
  return {
    healthCalls: busy.length,
    ...quantiles(busy),
    idleP99: quantiles(idle).p99,
    peakRssMb,
    peakProcessRssMb,
    processes,
    startRssMb,
    save: { status: saveRes.status, ms: Math.round(saveMs), healthP99: savedHealth.p99, healthMax: savedHealth.max, readings: log.sampleCount ?? 0 },
    logPage: { p50: quantiles(pageMs.length ? pageMs : [NaN]).p50, max: quantiles(pageMs.length ? pageMs : [NaN]).max, bytes: pageBytes },
    readingsPage: { p50: quantiles(readingsMs.length ? readingsMs : [NaN]).p50, max: quantiles(readingsMs.length ? readingsMs : [NaN]).max },
    sweeps,
    previews,
    seconds: Math.round(seconds * 10) / 10,
  };
}

/** Four clients calling /api/health back to back until `stop()`; the latencies in ms. */
async function pollUntil(url: string, stop: () => boolean): Promise<number[]> {
  const latencies: number[] = [];
  const poll = async () => {
    while (!stop()) {
      const t0 = performance.now();
      const res = await fetch(`${url}/api/health`);
      await res.arrayBuffer();
      latencies.push(performance.now() - t0);
    }
  };
  await Promise.all([poll(), poll(), poll(), poll()]);
  return latencies;
}

function pollFor(url: string, ms: number): Promise<number[]> {
  const end = performance.now() + ms;
  return pollUntil(url, () => performance.now() > end);
}

function quantiles(latencies: number[]): { p50: number; p99: number; max: number } {
  const sorted = [...latencies].sort((a, b) => a - b);
  const at = (q: number) => Math.round(sorted[Math.min(sorted.length - 1, Math.floor(q * sorted.length))]! * 10) / 10;
  return { p50: at(0.5), p99: at(0.99), max: Math.round(sorted.at(-1)! * 10) / 10 };
}

/** The run's lines for the report, and whether it met its targets. */
export function describeHeavy(r: HeavyResult): { lines: string[]; ok: boolean } {
  const ok =
    r.p99 <= HEALTH_TARGET_MS &&
    r.peakProcessRssMb <= RSS_TARGET_MB &&
    r.save.status === 201 &&
    r.save.healthP99 <= HEALTH_TARGET_MS &&
    r.logPage.p50 <= LOG_PAGE_TARGET_MS &&
    Object.keys(r.sweeps).every((c) => c === '200') &&
    Object.keys(r.previews).every((c) => c === '200');
  return {
    ok,
    lines: [
      `\nHeavy run: 10 sweeps of 1,000 options on a 60-day plan and 2 previews of a 10 MB monitor log, ${r.seconds} s.`,
      `  /api/health (4 clients back to back, ${r.healthCalls} calls): p50 ${r.p50} ms, p99 ${r.p99} ms (target ≤ ${HEALTH_TARGET_MS}), max ${r.max} ms; p99 with nothing heavy running: ${r.idleP99} ms`,
      `  server RSS, peak of the largest process (each WEB_CONCURRENCY process has its own worker pool; its threads included): ${r.peakProcessRssMb} MB (target ≤ ${RSS_TARGET_MB})`,
      `  all ${r.processes} server processes together: ${r.startRssMb} MB at the start, peak ${r.peakRssMb} MB`,
      `  sweeps answered ${JSON.stringify(r.sweeps)}, previews ${JSON.stringify(r.previews)}`,
      `  saving the 10 MB log (${r.save.readings.toLocaleString('en-GB')} readings): ${r.save.status} in ${r.save.ms} ms; /api/health meanwhile p99 ${r.save.healthP99} ms, max ${r.save.healthMax} ms`,
      `  its log page (overview + first 200 readings, ${Math.round(r.logPage.bytes / 1024)} KB): p50 ${r.logPage.p50} ms, max ${r.logPage.max} ms (target ≤ ${LOG_PAGE_TARGET_MS}); a page of 1,000 readings: p50 ${r.readingsPage.p50} ms, max ${r.readingsPage.max} ms`,
    ],
  };
}
