/* Sunreckon's service worker: keeps the app and the signed-in camper's trips readable at a
 * campsite without signal.
 *
 *   /_astro/*, icons, fonts   cache first (file names carry a content hash, so they never change)
 *   pages (navigations)       network first; the last copy is kept and served offline, marked
 *                             with <meta name="sunreckon-saved-copy"> so the page says so
 *   GET /api/* (not auth)     network first, the last answer served offline
 *   anything else             straight to the network (writes are never cached or replayed here:
 *                             check-ins queue on the page, in IndexedDB, with their own ids)
 *
 * "warm" (posted by every signed-in page) fetches the camper's trips, each trip's page, its
 * saved forecasts, the latest forecast and its page, and the trip's check-ins, so they are there
 * before the signal goes. "session" purges everything of a previous user. Hand-written on purpose:
 * small, no build step, no generated templates.
 */
const VERSION = 'v1';
const ASSETS = `sunreckon-assets-${VERSION}`;
const PAGES = `sunreckon-pages-${VERSION}`;
const API = `sunreckon-api-${VERSION}`;
const META = `sunreckon-meta-${VERSION}`;
const KEEP = [ASSETS, PAGES, API, META];
/** How long a page or answer may take before a saved copy is shown instead (poor signal). */
const SLOW_MS = 8000;
const SHELL = ['/manifest.webmanifest', '/favicon.svg', '/icons/icon-192.png', '/icons/icon-512.png'];

self.addEventListener('install', (event) => {
  event.waitUntil(
    caches
      .open(ASSETS)
      .then((c) => c.addAll(SHELL))
      .catch(() => undefined)
      .then(() => self.skipWaiting()),
  );
});

self.addEventListener('activate', (event) => {
  event.waitUntil(
    caches
      .keys()
      .then((keys) => Promise.all(keys.filter((k) => k.startsWith('sunreckon-') && !KEEP.includes(k)).map((k) => caches.delete(k))))
      .then(() => self.clients.claim()),
  );
});

const sameOrigin = (url) => url.origin === self.location.origin;
const isAsset = (url) => url.pathname.startsWith('/_astro/') || url.pathname.startsWith('/icons/') || url.pathname === '/favicon.svg' || url.pathname === '/manifest.webmanifest';
const isCachedApi = (url) => url.pathname.startsWith('/api/') && !url.pathname.startsWith('/api/auth/') && !url.pathname.startsWith('/api/dev/');

self.addEventListener('fetch', (event) => {
  const req = event.request;
  if (req.method !== 'GET') return;
  const url = new URL(req.url);
  if (!sameOrigin(url)) return;
  if (req.mode === 'navigate') {
    event.respondWith(page(req));
  } else if (isAsset(url)) {
    event.respondWith(asset(req));
  } else if (isCachedApi(url)) {
    event.respondWith(api(req));
  }
});

/** A fetch that gives up after `ms` (the request itself goes on, so the cache still gets the fresh copy). */
function raced(promise, ms) {
  return Promise.race([promise, new Promise((resolve) => setTimeout(() => resolve(null), ms))]);
}

async function asset(req) {
  const hit = await caches.match(req, { cacheName: ASSETS });
  if (hit) return hit;
  const res = await fetch(req);
  if (res.ok) (await caches.open(ASSETS)).put(req, res.clone());
  return res;
}

/** The page's key: path only (a `?created=1` note must not make a second copy). */
function pageKey(url) {
  return new Request(new URL(url.pathname, self.location.origin).href);
}

/** Keeps a page, marked as a saved copy with the time it was saved. */
async function keepPage(key, res) {
  const html = await res.text();
  const stamp = `<meta name="sunreckon-saved-copy" content="${new Date().toISOString()}">`;
  const marked = html.includes('</head>') ? html.replace('</head>', `${stamp}</head>`) : stamp + html;
  const headers = new Headers(res.headers);
  headers.delete('content-length');
  await (await caches.open(PAGES)).put(key, new Response(marked, { status: 200, headers }));
  return html;
}

async function page(req) {
  const url = new URL(req.url);
  const key = pageKey(url);
  const network = fetch(req).then(async (res) => {
    // Only a real page of the app is kept (not a redirect to sign-in, not an error page).
    if (res.status === 200 && res.type === 'basic' && (res.headers.get('content-type') || '').includes('text/html')) {
      keepPage(key, res.clone()).catch(() => undefined);
    }
    return res;
  });
  const saved = await caches.match(key, { cacheName: PAGES });
  try {
    const res = saved ? await raced(network, SLOW_MS) : await network;
    if (res) return res;
  } catch {
    // offline: fall through to the saved copy
  }
  if (saved) {
    network.catch(() => undefined);
    return saved;
  }
  return offlinePage(url);
}

async function api(req) {
  const url = new URL(req.url);
  const network = fetch(req).then((res) => {
    if (res.status === 200) caches.open(API).then((c) => c.put(url.href, res.clone())).catch(() => undefined);
    return res;
  });
  const saved = await caches.match(url.href, { cacheName: API });
  try {
    const res = saved ? await raced(network, SLOW_MS) : await network;
    if (res) return res;
  } catch {
    // offline
  }
  if (saved) {
    network.catch(() => undefined);
    const headers = new Headers(saved.headers);
    headers.set('x-sunreckon-saved-copy', '1');
    return new Response(await saved.blob(), { status: 200, headers });
  }
  return new Response(
    JSON.stringify({ error: { code: 'offline', message: 'You are offline and this was not saved on this phone. It will load when the signal is back.' }, issues: [] }),
    { status: 503, headers: { 'content-type': 'application/json; charset=utf-8', 'x-sunreckon-saved-copy': '0' } },
  );
}

const escapeHtml = (s) => String(s).replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]);

/** A page that was never saved: say so, and list the trips that were. */
async function offlinePage(url) {
  const keys = await (await caches.open(PAGES)).keys();
  // Trip names come from the saved answer of /api/trips.
  const names = new Map();
  try {
    const saved = await caches.match(new URL('/api/trips', self.location.origin).href, { cacheName: API });
    for (const t of saved ? await saved.json() : []) names.set(t.id, t.name);
  } catch {
    // no saved list: the links still work
  }
  const trips = [];
  for (const k of keys) {
    const p = new URL(k.url).pathname;
    const m = /^\/trips\/([^/]+)$/.exec(p);
    if (!m || m[1] === 'new') continue;
    trips.push(`<li><a href="${escapeHtml(p)}">${escapeHtml(names.get(decodeURIComponent(m[1])) ?? 'Trip')}</a></li>`);
  }
  const body = `<!doctype html><html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1">
<title>Offline · Sunreckon</title><meta name="theme-color" content="#2F3E55"><link rel="icon" href="/favicon.svg">
<style>body{font-family:system-ui,sans-serif;background:#F5EDE0;color:#2F3E55;margin:0;line-height:1.6}main{max-width:36rem;margin:0 auto;padding:1.5rem}
.card{background:#FFFDF9;border-radius:14px;padding:1rem 1.25rem;box-shadow:0 4px 14px rgb(47 62 85/.08)}a{color:#B24C1C;font-weight:700}
.banner{background:#2F3E55;color:#fff;padding:.6rem 1rem;font-weight:700}</style></head>
<body><div class="banner" role="status">Offline — this page was not saved on this phone</div><main>
<h1>No signal</h1><div class="card"><p>${escapeHtml(url.pathname)} was not opened while you had signal, so there is no saved copy of it.</p>
${trips.length ? `<p>Trips saved on this phone:</p><ul>${trips.join('')}</ul>` : '<p>Open your trips once while you have signal and they will be kept for offline use.</p>'}
<p>Check-ins you make offline are kept on the phone and sent when the signal is back.</p></div></main></body></html>`;
  return new Response(body, { status: 200, headers: { 'content-type': 'text/html; charset=utf-8', 'cache-control': 'no-store' } });
}

// ---- warming the camper's trips for offline use ----

const ASSET_RE = /["'(`]((?:\/_astro\/|\.\/|_astro\/)[\w.\-/]+?\.(?:js|css|woff2))["')`]/g;

/** Every /_astro/ file a page needs, following the scripts' imports, into the asset cache. */
async function cacheAssetsOf(html, base) {
  const seen = new Set();
  const queue = [];
  const add = (ref, from) => {
    let abs;
    try {
      abs = new URL(ref.startsWith('_astro/') ? '/' + ref : ref, from).href;
    } catch {
      return;
    }
    if (!abs.startsWith(self.location.origin + '/_astro/') || seen.has(abs)) return;
    if (abs.endsWith('.woff2') && !/latin-[0-9]{3}-normal|latin-ext/.test(abs) && /(cyrillic|greek|vietnamese)/.test(abs)) return;
    seen.add(abs);
    queue.push(abs);
  };
  for (const m of html.matchAll(ASSET_RE)) add(m[1], base);
  const cache = await caches.open(ASSETS);
  while (queue.length && seen.size < 400) {
    const u = queue.shift();
    let res = await cache.match(u);
    if (!res) {
      try {
        res = await fetch(u);
      } catch {
        continue;
      }
      if (!res.ok) continue;
      await cache.put(u, res.clone());
    }
    if (/\.(js|css)$/.test(u)) {
      const text = await res.text();
      for (const m of text.matchAll(ASSET_RE)) add(m[1], u);
    }
  }
}

async function getJson(path) {
  const res = await fetch(path, { credentials: 'same-origin', headers: { accept: 'application/json' } });
  if (res.status !== 200) throw new Error(`${path}: ${res.status}`);
  await (await caches.open(API)).put(new URL(path, self.location.origin).href, res.clone());
  return res.json();
}

async function getPage(path) {
  const res = await fetch(path, { credentials: 'same-origin', redirect: 'manual' });
  if (res.status !== 200 || !(res.headers.get('content-type') || '').includes('text/html')) throw new Error(`${path}: ${res.status}`);
  const html = await keepPage(pageKey(new URL(path, self.location.origin)), res);
  await cacheAssetsOf(html, new URL(path, self.location.origin).href);
}

const tolerate = (p) => p.catch(() => undefined);

async function warm() {
  const trips = await getJson('/api/trips');
  await tolerate(getPage('/trips'));
  // Trips that are on or coming up (ended at most 3 days ago), soonest first, at most 20; with
  // fewer than 3 of those, the most recent past ones too.
  const DAY = 86_400_000;
  const endOf = (t) => {
    const s = t.stops && t.stops[t.stops.length - 1];
    return s ? Date.parse(`${s.arrive}T00:00:00Z`) + (s.nights + 1) * DAY : 0;
  };
  const now = Date.now();
  const current = trips.filter((t) => endOf(t) >= now - 3 * DAY).sort((a, b) => endOf(a) - endOf(b));
  const past = trips.filter((t) => endOf(t) < now - 3 * DAY).sort((a, b) => endOf(b) - endOf(a));
  const chosen = [...current, ...past].slice(0, Math.max(3, Math.min(20, current.length)));
  const saved = [];
  for (const trip of chosen) {
    const id = encodeURIComponent(trip.id);
    await tolerate(getPage(`/trips/${id}`));
    await Promise.all([tolerate(getJson(`/api/trips/${id}`)), tolerate(getJson(`/api/trips/${id}/check-ins`)), tolerate(getJson(`/api/rigs/${encodeURIComponent(trip.rigId)}`)), tolerate(getJson(`/api/rigs/${encodeURIComponent(trip.rigId)}/loads`))]);
    const list = await getJson(`/api/trips/${id}/forecasts`).catch(() => []);
    if (list[0]) {
      const fid = encodeURIComponent(list[0].id);
      await tolerate(getJson(`/api/forecasts/${fid}`));
      await tolerate(getPage(`/trips/${id}/forecasts/${fid}`));
    }
    saved.push(trip.id);
  }
  await tolerate(getJson('/api/rigs'));
  return saved;
}

async function storedUser() {
  const res = await caches.match('/__sunreckon/user', { cacheName: META });
  return res ? res.text() : null;
}

/** A different person (or nobody) is signed in now: nothing of the previous one stays on the phone. */
async function setUser(userId) {
  const before = await storedUser();
  if (before === userId) return false;
  await Promise.all([caches.delete(PAGES), caches.delete(API)]);
  await (await caches.open(META)).put('/__sunreckon/user', new Response(userId));
  return true;
}

let warming = null;
let lastWarm = 0;

self.addEventListener('message', (event) => {
  const msg = event.data || {};
  const reply = (data) => event.source && event.source.postMessage(data);
  if (msg.type === 'session') {
    event.waitUntil(setUser(String(msg.userId || '')).then((changed) => reply({ type: 'session', changed })));
  } else if (msg.type === 'warm') {
    const run = async () => {
      await setUser(String(msg.userId || ''));
      if (!msg.userId) return [];
      if (!warming && (msg.force || Date.now() - lastWarm > 10 * 60_000)) {
        warming = warm()
          .then((trips) => {
            lastWarm = Date.now();
            return trips;
          })
          .finally(() => {
            warming = null;
          });
      }
      return warming ?? [];
    };
    event.waitUntil(
      run()
        .then(async () => {
          const keys = await (await caches.open(PAGES)).keys();
          reply({ type: 'warmed', pages: keys.map((k) => new URL(k.url).pathname) });
        })
        .catch((e) => reply({ type: 'warm-failed', message: String(e && e.message) })),
    );
  }
});
