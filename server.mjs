// Serves the built app on every core:
//   - static files (the build's client folder: /_astro/*, fonts, icons, sw.js) straight from memory,
//     with the .br/.gz written at build time (astro.config.mjs) and long-lived caching for hashed
//     files, before anything of Astro runs;
//   - everything else through Astro's handler (pages and API routes) behind gzip/brotli compression,
//     which the adapter does not do. Campers open their forecast on a weak phone signal at camp.
//   node server.mjs            serves dist/ (SUNRECKON_DIST picks another build folder)
// HOST and PORT as for the adapter (defaults from astro.config.mjs: 127.0.0.1:4321).
// WEB_CONCURRENCY worker processes share the port (node:cluster); default: one per core, or one
// when SUNRECKON_ENV=test. With one, no primary process: the server runs in this process.
import cluster from 'node:cluster';
import { createHash } from 'node:crypto';
import { readdirSync, readFileSync, existsSync } from 'node:fs';
import http from 'node:http';
import os from 'node:os';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import compression from 'compression';

const concurrency = (() => {
  const raw = process.env.WEB_CONCURRENCY;
  if (raw !== undefined && raw !== '') {
    const n = Number(raw);
    if (!Number.isInteger(n) || n < 1 || n > 64) {
      console.error(`[sunreckon] WEB_CONCURRENCY must be a whole number from 1 to 64 (got "${raw}").`);
      process.exit(1);
    }
    return n;
  }
  return process.env.SUNRECKON_ENV === 'test' ? 1 : os.availableParallelism();
})();

/**
 * Each worker's V8 old space, MB (SUNRECKON_HEAP_MB; 0 leaves V8's default, about 2 GB here). V8
 * grows a busy process's heap toward its limit before collecting; capped, it collects sooner.
 * Measured (README, Load): workers peaked at 270–330 MB under 20 connections without a cap and
 * at about 210 MB with 192, at the same throughput, and the heavy run still answered everything.
 * CPU-heavy work runs in the worker pool's threads, which have limits of their own (pool.ts).
 * A NODE_OPTIONS that already sets --max-old-space-size wins.
 */
const heapMb = (() => {
  const raw = process.env.SUNRECKON_HEAP_MB;
  if (raw === undefined || raw === '') return 192;
  const n = Number(raw);
  if (!Number.isInteger(n) || (n !== 0 && (n < 64 || n > 65_536))) {
    console.error(`[sunreckon] SUNRECKON_HEAP_MB must be 0 or a whole number from 64 to 65536 (got "${raw}").`);
    process.exit(1);
  }
  return n;
})();

/**
 * The primary forks the workers and restarts one that dies. Only worker 1 (and whichever replaces
 * it) runs the background loops (SUNRECKON_BACKGROUND=1: the outbox's retry timer); the outbox
 * claims each mail through the database, so a mail is sent once even when several workers kick it.
 * Rate limits on SQLite count in the primary for all workers (rate-limit.ts, RateLimiterCluster).
 */
async function primary(n) {
  const { RateLimiterClusterMaster } = await import('rate-limiter-flexible');
  new RateLimiterClusterMaster();
  // A worker that ends a kept session (sign-out, a password change; src/server/session-cache.ts)
  // tells the primary, which tells every worker.
  cluster.on('message', (_from, msg) => {
    if (msg && typeof msg === 'object' && msg.type === 'sunreckon:session-drop') {
      for (const w of Object.values(cluster.workers ?? {})) if (w?.isConnected()) w.send(msg);
    }
  });
  if (heapMb > 0 && !/--max-old-space-size/.test(`${process.env.NODE_OPTIONS ?? ''} ${process.execArgv.join(' ')}`)) {
    cluster.setupPrimary({ execArgv: [...process.execArgv, `--max-old-space-size=${heapMb}`] });
  }
  const roles = new Map();
  let stopping = false;
  const started = new Map();
  let quickDeaths = 0;
  const fork = (background) => {
    const w = cluster.fork({ SUNRECKON_BACKGROUND: background ? '1' : '0', SUNRECKON_WORKER_COUNT: String(n) });
    roles.set(w.id, background);
    started.set(w.id, Date.now());
    return w;
  };
  for (let i = 0; i < n; i++) fork(i === 0);
  let listening = 0;
  cluster.on('listening', () => {
    if (++listening === n) console.log(`[sunreckon] ${n} worker processes are serving`);
  });
  cluster.on('exit', (w, code, signal) => {
    const background = roles.get(w.id) ?? false;
    roles.delete(w.id);
    if (stopping) {
      if (Object.keys(cluster.workers ?? {}).length === 0) process.exit(0);
      return;
    }
    // A worker that cannot even start (a broken build, a bad setting) is not restarted forever.
    if (Date.now() - (started.get(w.id) ?? 0) < 10_000 && ++quickDeaths >= 3) {
      console.error('[sunreckon] workers keep exiting at start; stopping');
      process.exit(1);
    }
    started.delete(w.id);
    console.error(`[sunreckon] worker ${w.process.pid} exited (${signal ?? code}); starting another`);
    setTimeout(() => fork(background), 500).unref();
  });
  const stop = () => {
    if (stopping) return;
    stopping = true;
    for (const w of Object.values(cluster.workers ?? {})) w?.process.kill('SIGTERM');
    setTimeout(() => process.exit(0), 6000).unref();
  };
  process.on('SIGTERM', stop);
  process.on('SIGINT', stop);
}

/** One serving process: the static files, then Astro. */
async function serve() {
  // The adapter's entry starts its own server on import unless told not to.
  process.env.ASTRO_NODE_AUTOSTART = 'disabled';
  const dist = path.resolve(import.meta.dirname, process.env.SUNRECKON_DIST ?? 'dist');
  const { handler, options } = await import(pathToFileURL(path.join(dist, 'server/entry.mjs')).href);
  // Astro loads the middleware on the first request; the background process loads it now, so its
  // timers (the outbox's retries, the trip watch, the purge) run after a restart with no traffic.
  if (process.env.SUNRECKON_BACKGROUND !== '0') {
    const middleware = path.join(dist, 'server/_astro-internal_middleware.mjs');
    if (existsSync(middleware)) await import(pathToFileURL(middleware).href);
  }

  const host = process.env.HOST ?? (typeof options.host === 'string' ? options.host : '127.0.0.1');
  const port = Number(process.env.PORT ?? options.port ?? 4321);
  // Text over 1 KB is compressed (the library's default test of the content type); fonts and images are already packed.
  const compress = compression({ threshold: 1024 });
  const statics = loadStatics(path.join(dist, 'client'));
  // /api/health: the route's database check answers at most once a second per process; in between,
  // its last 200 is repeated from here (an orchestrator's probe learns of a failed database within
  // a second, and a burst of probes does not go through the whole stack).
  const HEALTH_FRESH_MS = 1000;
  // The landing page's cache (filled in middleware.ts) and the session cookie that bypasses it.
  const LANDING = Symbol.for('sunreckon.landing');
  const SESSION_COOKIE = /(?:^|;\s*)(?:__Secure-)?better-auth\.session_(?:token|data)=/;
  const HEALTH_OK = JSON.stringify({ ok: true, db: 'ok' });
  // Set by the preview route's module (src/pages/api/forecasts/preview.ts) when it loads.
  const PREVIEW = Symbol.for('sunreckon.preview');
  let health = null;

  // Behind a proxy without SUNRECKON_TRUST_PROXY=1 every client shares one rate-limit bucket; say so once.
  const trustProxy = process.env.SUNRECKON_TRUST_PROXY === '1';
  let warnedProxy = false;

  const server = http.createServer((req, res) => {
    if (!trustProxy && !warnedProxy && req.headers['x-forwarded-for'] !== undefined) {
      warnedProxy = true;
      console.warn(
        '[sunreckon] requests arrive with X-Forwarded-For but SUNRECKON_TRUST_PROXY is off: every client behind the proxy shares one rate-limit bucket. ' +
          'Set SUNRECKON_TRUST_PROXY=1 when exactly one reverse proxy in front appends the client address (README, Deployment notes).',
      );
    }
    const url = req.url ?? '/';
    const q = url.indexOf('?');
    const pathname = q < 0 ? url : url.slice(0, q);
    const file = statics.get(pathname);
    if (file && (req.method === 'GET' || req.method === 'HEAD')) return sendStatic(req, res, file);
    // The landing page for an anonymous visitor, as middleware.ts last rendered and kept it.
    if (url === '/' && (req.method === 'GET' || req.method === 'HEAD') && !SESSION_COOKIE.test(req.headers.cookie ?? '')) {
      const cached = globalThis[LANDING];
      if (cached && cached.until > Date.now() && cached.day === new Date().toISOString().slice(0, 10)) {
        return compress(req, res, () => {
          for (const [k, v] of cached.headers) res.setHeader(k, v);
          res.setHeader('X-Sunreckon-Cache', 'hit');
          res.writeHead(200);
          res.end(req.method === 'HEAD' ? undefined : cached.body);
        });
      }
    }
    if (pathname === '/api/health' && req.method === 'GET') {
      if (health && Date.now() - health.at < HEALTH_FRESH_MS) {
        res.writeHead(200, health.headers);
        res.end(HEALTH_OK);
        return;
      }
      // The route itself checks the database; a 200 it gives is repeated for HEALTH_FRESH_MS.
      res.once('finish', () => {
        const headers = res.getHeaders();
        delete headers['content-length'];
        delete headers['content-encoding'];
        delete headers['vary'];
        headers['content-length'] = Buffer.byteLength(HEALTH_OK);
        health = res.statusCode === 200 ? { at: Date.now(), headers } : null;
      });
    }
    try {
      decodeURI(url);
    } catch {
      res.writeHead(400, { 'content-type': 'text/plain; charset=utf-8' });
      res.end('Bad request.');
      return;
    }
    // Static files are answered above; this covers the rare answer the middleware does not see.
    res.setHeader('X-Content-Type-Options', 'nosniff');
    // The anonymous preview's plain case, answered without Astro's pipeline once its route has
    // loaded (src/server/preview-direct.ts decides, and hands anything else to Astro untouched).
    const direct = pathname === '/api/forecasts/preview' ? globalThis[PREVIEW] : undefined;
    compress(req, res, () => (direct && direct(req, res) ? undefined : handler(req, res)));
  });
  server.keepAliveTimeout = 65_000;
  server.listen(port, host, () => {
    if (cluster.isPrimary) console.log(`Sunreckon is serving on http://${host}:${port}`);
    else if (process.env.SUNRECKON_BACKGROUND === '1')
      console.log(`Sunreckon is serving on http://${host}:${port} (${process.env.SUNRECKON_WORKER_COUNT} processes)`);
  });

  // Finish the requests in flight, then exit; a stuck connection does not hold the process past 5 s.
  const stop = async () => {
    if (stopProfile) await stopProfile();
    server.close(() => process.exit(0));
    server.closeIdleConnections?.();
    setTimeout(() => process.exit(0), 5000).unref();
  };
  process.on('SIGTERM', stop);
  process.on('SIGINT', stop);
}

const TYPES = {
  '.js': 'text/javascript; charset=utf-8',
  '.mjs': 'text/javascript; charset=utf-8',
  '.css': 'text/css; charset=utf-8',
  '.svg': 'image/svg+xml',
  '.png': 'image/png',
  '.ico': 'image/x-icon',
  '.woff2': 'font/woff2',
  '.woff': 'font/woff',
  '.webmanifest': 'application/manifest+json',
  '.json': 'application/json',
  '.txt': 'text/plain; charset=utf-8',
  '.html': 'text/html; charset=utf-8',
};

/**
 * Every file of the build's client folder, read once at start (a few MB) with its precompressed
 * siblings. Hashed files (/_astro/*) never change under their name: a year, immutable. Icons keep
 * their names across builds: a week. The service worker and the manifest are asked again each time
 * (ETag answers 304), so a new build reaches the camper on the next visit.
 */
function loadStatics(root) {
  const files = new Map();
  if (!existsSync(root)) return files;
  const walk = (dir) => {
    for (const e of readdirSync(dir, { withFileTypes: true })) {
      const full = path.join(dir, e.name);
      if (e.isDirectory()) walk(full);
      else if (!e.name.endsWith('.br') && !e.name.endsWith('.gz')) {
        const rel = '/' + path.relative(root, full).split(path.sep).join('/');
        const body = readFileSync(full);
        const ext = path.extname(e.name).toLowerCase();
        const cache = rel.startsWith('/_astro/')
          ? 'public, max-age=31536000, immutable'
          : rel.startsWith('/icons/') || rel === '/favicon.svg'
            ? 'public, max-age=604800'
            : 'no-cache';
        files.set(rel, {
          body,
          br: existsSync(full + '.br') ? readFileSync(full + '.br') : null,
          gz: existsSync(full + '.gz') ? readFileSync(full + '.gz') : null,
          type: TYPES[ext] ?? 'application/octet-stream',
          cache,
          etag: `"${createHash('sha1').update(body).digest('base64url').slice(0, 22)}"`,
        });
      }
    }
  };
  walk(root);
  return files;
}

function sendStatic(req, res, file) {
  const headers = {
    'Content-Type': file.type,
    'Cache-Control': file.cache,
    ETag: file.etag,
    'X-Content-Type-Options': 'nosniff',
  };
  if (file.br || file.gz) headers['Vary'] = 'Accept-Encoding';
  if (req.headers['if-none-match'] === file.etag) {
    res.writeHead(304, headers);
    res.end();
    return;
  }
  const accept = req.headers['accept-encoding'] ?? '';
  let body = file.body;
  if (file.br && /\bbr\b/.test(accept)) {
    body = file.br;
    headers['Content-Encoding'] = 'br';
  } else if (file.gz && /\bgzip\b/.test(accept)) {
    body = file.gz;
    headers['Content-Encoding'] = 'gzip';
  }
  headers['Content-Length'] = body.length;
  res.writeHead(200, headers);
  res.end(req.method === 'HEAD' ? undefined : body);
}

/**
 * SUNRECKON_CPU_PROFILE=<folder>: each serving process records a V8 CPU profile from start and
 * writes <folder>/<pid>.cpuprofile when it stops (Chrome DevTools or `node --cpu-prof` tooling read
 * it). The measuring scripts start the server through this file, where `node --cpu-prof` cannot be
 * passed; see DEVELOPERS.md, Performance.
 */
async function startProfile(dir) {
  const { Session } = await import('node:inspector/promises');
  const { mkdirSync, writeFileSync } = await import('node:fs');
  const session = new Session();
  session.connect();
  await session.post('Profiler.enable');
  await session.post('Profiler.start');
  return async () => {
    const { profile } = await session.post('Profiler.stop');
    mkdirSync(dir, { recursive: true });
    writeFileSync(path.join(dir, `${process.pid}.cpuprofile`), JSON.stringify(profile));
  };
}
const stopProfile =
  process.env.SUNRECKON_CPU_PROFILE && !(cluster.isPrimary && concurrency > 1)
    ? await startProfile(process.env.SUNRECKON_CPU_PROFILE)
    : null;

if (cluster.isPrimary && concurrency > 1) await primary(concurrency);
else await serve();
