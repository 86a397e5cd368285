import autocannon from 'autocannon';
import { spawn } from 'node:child_process';
import { readdirSync, readFileSync } from 'node:fs';
import os from 'node:os';
import { benchPlan } from './bench-plan';

/**
 * The throughput table of `npm run loadtest` (issue 21): in one run, side by side, a bare Node
 * `http` server answering "ok" (the ceiling of this machine's loopback), /api/health, the landing
 * page (anonymous), the anonymous preview of a 30-day, 40-load trip (the same plan each time, which
 * the server answers from its answer cache after the first, and a new load list each time, which it
 * forecasts every time), and the signed-in saved
 * forecast page, each for `seconds` at 20 connections. Prints req/s, p50/p99, the ratio to the bare
 * server and the peak RSS of every server process (primary and workers) against the targets.
 */

export const THROUGHPUT_CONNECTIONS = 20;

const TARGETS = {
  healthOfBare: 0.25,
  landingRps: 2000,
  previewRps: 600,
  previewP99: 100,
  forecastPageRps: 300,
  rssMb: 300,
};

function rssMb(pid: number): number {
  try {
    const m = /VmRSS:\s+(\d+) kB/.exec(readFileSync(`/proc/${pid}/status`, 'utf8'));
    return m ? Number(m[1]) / 1024 : 0;
  } catch {
    return 0;
  }
}

/** CPU time (user + system) the processes have used so far, ms (clock ticks of 10 ms on Linux). */
function cpuMs(pids: number[]): number {
  let ticks = 0;
  for (const pid of pids) {
    try {
      const stat = readFileSync(`/proc/${pid}/stat`, 'utf8');
      const f = stat.slice(stat.lastIndexOf(')') + 2).split(' ');
      ticks += Number(f[11]) + Number(f[12]);
    } catch {
      // gone meanwhile
    }
  }
  return ticks * 10;
}

/** The process and its children (cluster workers), from /proc. */
function processTree(root: number): number[] {
  const parents = new Map<number, number>();
  for (const d of readdirSync('/proc')) {
    if (!/^\d+$/.test(d)) continue;
    try {
      const stat = readFileSync(`/proc/${d}/stat`, 'utf8');
      const ppid = Number(stat.slice(stat.lastIndexOf(')') + 2).split(' ')[1]);
      parents.set(Number(d), ppid);
    } catch {
      // gone meanwhile
    }
  }
  const out = [root];
  for (let i = 0; i < out.length; i++) for (const [pid, ppid] of parents) if (ppid === out[i]) out.push(pid);
  return out;
}

async function bareServer(): Promise<{ url: string; stop: () => void }> {
  const child = spawn(
    process.execPath,
    [
      '-e',
      "const s=require('http').createServer((q,r)=>{r.writeHead(200,{'content-type':'text/plain'});r.end('ok')});s.listen(0,'127.0.0.1',()=>console.log(s.address().port))",
    ],
    { stdio: ['ignore', 'pipe', 'inherit'] },
  );
  const port = await new Promise<string>((resolve) => child.stdout!.once('data', (d) => resolve(String(d).trim())));
  return { url: `http://127.0.0.1:${port}`, stop: () => child.kill('SIGTERM') };
}

type Row = { name: string; rps: number; p50: number; p99: number; non2xx: number; errors: number; cpuPerReq: number | null };

export async function throughputRun(p: {
  url: string;
  serverPid: number;
  forecastPage: string;
  camperCookie: string;
  seconds: number;
}): Promise<{ lines: string[]; ok: boolean }> {
  const { url, seconds } = p;
  const pids = processTree(p.serverPid);
  const loadBefore = os.loadavg().map((x) => x.toFixed(2)).join(', ');
  const peak = new Map<number, number>(pids.map((pid) => [pid, rssMb(pid)]));
  const sampler = setInterval(() => {
    for (const pid of pids) peak.set(pid, Math.max(peak.get(pid) ?? 0, rssMb(pid)));
  }, 200);
  const rows: Row[] = [];
  const run = async (name: string, opts: autocannon.Options) => {
    // Warm-up, not counted: the code each route runs is compiled and optimised before it is timed
    // (otherwise a route whose code ran little before, e.g. the forecast after answers from the
    // cache, pays for the JIT in its figures). Two seconds rather than a count: V8 needs a few
    // hundred forecasts in each worker before the engine's loops run optimised.
    await autocannon({ connections: 4, duration: 2, timeout: 20, ...opts });
    // The server's own CPU time per answer: steadier than req/s when other work shares the cores.
    const cpuBefore = cpuMs(pids);
    const r = await autocannon({ connections: THROUGHPUT_CONNECTIONS, duration: seconds, timeout: 20, ...opts });
    const served = r.requests.total;
    const row = {
      cpuPerReq: name.startsWith('bare') || served === 0 ? null : (cpuMs(pids) - cpuBefore) / served,
      name,
      rps: r.requests.average,
      p50: r.latency.p50,
      p99: r.latency.p99,
      non2xx: Object.entries(r.statusCodeStats ?? {}).reduce((n, [code, v]) => n + (code.startsWith('2') ? 0 : Number(v.count)), 0),
      errors: r.errors + r.timeouts,
    };
    rows.push(row);
    return row;
  };
  const bare = await bareServer();
  try {
    await run('bare Node http server ("ok")', { url: bare.url });
  } finally {
    bare.stop();
  }
  const health = await run('GET /api/health', { url: `${url}/api/health` });
  const landing = await run('GET / (landing, anonymous)', { url: `${url}/` });
  const plan = JSON.stringify(benchPlan(30));
  const preview = await run('POST /api/forecasts/preview (30 days, 40 loads; the same plan each time)', {
    url: `${url}/api/forecasts/preview`,
    method: 'POST',
    headers: { 'content-type': 'application/json', origin: url },
    body: plan,
  });
  // As the quick plan asks for it: the hours as columns (src/lib/forecast-columns.ts).
  const previewColumns = await run("POST /api/forecasts/preview?hourly=columns (the page's form)", {
    url: `${url}/api/forecasts/preview?hourly=columns`,
    method: 'POST',
    headers: { 'content-type': 'application/json', origin: url },
    body: plan,
  });
  // The same trip with another load list on every request (one load's watts counts up): nothing
  // of the answer can be reused but the trip's sun — what a camper editing the quick plan sends.
  const marked = benchPlan(30);
  marked.loads![0] = { ...marked.loads![0]!, watts: 987654321 };
  const template = JSON.stringify(marked);
  let edit = 0;
  const previewEdited = await run('POST /api/forecasts/preview?hourly=columns, another load list each time', {
    url: `${url}/api/forecasts/preview?hourly=columns`,
    requests: [
      {
        method: 'POST',
        headers: { 'content-type': 'application/json', origin: url },
        setupRequest: (req) => ({ ...req, body: template.replace('987654321', String(1 + (edit++ % 100_000) / 10)) }),
      },
    ],
  });
  const page = await run('GET saved forecast page (signed in)', { url: `${url}${p.forecastPage}`, headers: { cookie: p.camperCookie } });
  clearInterval(sampler);

  const bareRps = rows[0]!.rps;
  const lines = [
    `\nThroughput, ${THROUGHPUT_CONNECTIONS} connections, ${seconds} s each, server processes: ${pids.length} (${pids.length > 1 ? `primary + ${pids.length - 1} workers` : 'one'})`,
    `Load average before the run: ${loadBefore}; after: ${os.loadavg().map((x) => x.toFixed(2)).join(', ')}`,
    '| run | req/s | of bare | p50 ms | p99 ms | server CPU ms / answer | non-2xx | errors |',
    '|---|---:|---:|---:|---:|---:|---:|---:|',
    ...rows.map(
      (r) =>
        `| ${r.name} | ${r.rps.toFixed(0)} | ${((r.rps / bareRps) * 100).toFixed(1)} % | ${r.p50} | ${r.p99} | ${r.cpuPerReq === null ? '—' : r.cpuPerReq.toFixed(2)} | ${r.non2xx} | ${r.errors} |`,
    ),
    `Peak RSS per server process (MB): ${[...peak].map(([pid, mb]) => `${pid === p.serverPid ? 'primary/main' : pid} ${mb.toFixed(0)}`).join(', ')}`,
  ];
  const maxRss = Math.max(...peak.values());
  const checks: [string, boolean][] = [
    [
      `health ≥ ${TARGETS.healthOfBare * 100} % of bare (${((health.rps / bareRps) * 100).toFixed(1)} %)`,
      health.rps >= TARGETS.healthOfBare * bareRps,
    ],
    [`landing ≥ ${TARGETS.landingRps} req/s (${landing.rps.toFixed(0)})`, landing.rps >= TARGETS.landingRps],
    [
      `preview ≥ ${TARGETS.previewRps} req/s (${preview.rps.toFixed(0)}) with p99 ≤ ${TARGETS.previewP99} ms (${preview.p99})`,
      preview.rps >= TARGETS.previewRps && preview.p99 <= TARGETS.previewP99,
    ],
    [
      `preview in the page's form ≥ ${TARGETS.previewRps} req/s (${previewColumns.rps.toFixed(0)}) with p99 ≤ ${TARGETS.previewP99} ms (${previewColumns.p99})`,
      previewColumns.rps >= TARGETS.previewRps && previewColumns.p99 <= TARGETS.previewP99,
    ],
    [
      `preview of a new load list each time ≥ ${TARGETS.previewRps} req/s (${previewEdited.rps.toFixed(0)}) with p99 ≤ ${TARGETS.previewP99} ms (${previewEdited.p99})`,
      previewEdited.rps >= TARGETS.previewRps && previewEdited.p99 <= TARGETS.previewP99,
    ],
    [`saved forecast page ≥ ${TARGETS.forecastPageRps} req/s (${page.rps.toFixed(0)})`, page.rps >= TARGETS.forecastPageRps],
    [`RSS ≤ ${TARGETS.rssMb} MB per process (max ${maxRss.toFixed(0)})`, maxRss <= TARGETS.rssMb],
  ];
  for (const [what, met] of checks) lines.push(`  ${met ? 'met    ' : 'MISSED '} ${what}`);
  const broken = rows.filter((r) => r.non2xx > 0 || r.errors > 0);
  if (broken.length) lines.push(`  Runs with non-2xx answers or errors: ${broken.map((r) => r.name).join('; ')}`);
  // Speed targets are reported, not enforced (the machine is shared); wrong answers fail the run.
  return { lines, ok: broken.length === 0 };
}
