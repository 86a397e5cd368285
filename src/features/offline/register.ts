// On every page: the service worker (production builds only), the "offline — showing saved copy"
// banner, and sending check-ins that waited on the phone as soon as there is a connection.
import { flushOutbox, listQueued, onOutboxChange } from './outbox';
import { deviceZone, formatInstant } from '../../lib/clock';

const userId = document.querySelector<HTMLMetaElement>('meta[name="sunreckon-user"]')?.content ?? '';
const savedAt = document.querySelector<HTMLMetaElement>('meta[name="sunreckon-saved-copy"]')?.content ?? null;

// The user's zone from their settings (this device's own until one is stored), as on every other page.
const userZone = document.querySelector<HTMLMetaElement>('meta[name="sunreckon-time-zone"]')?.content || deviceZone();

function formatSaved(iso: string): string {
  return Number.isNaN(Date.parse(iso)) ? '' : formatInstant(iso, userZone);
}

function banner(): HTMLElement {
  let el = document.getElementById('offline-banner');
  if (!el) {
    el = document.createElement('div');
    el.id = 'offline-banner';
    el.setAttribute('role', 'status');
    el.setAttribute('aria-live', 'polite');
    el.className = 'sticky top-0 z-50 bg-dusk px-4 py-2 text-center text-sm font-bold text-white shadow-soft';
    el.hidden = true;
    document.body.prepend(el);
  }
  return el;
}

let queued = 0;
/** Whether this page has been without a connection since it loaded. */
let wasOffline = !navigator.onLine;
// A saved copy is by definition kept on the phone.
if (savedAt) document.documentElement.dataset.offlineReady = 'true';

function render() {
  const el = banner();
  const offline = !navigator.onLine;
  const waiting = queued > 0 ? ` · ${queued} check-in${queued === 1 ? '' : 's'} waiting to send` : '';
  if (offline) {
    el.dataset.state = 'offline';
    el.textContent = `Offline — showing saved copy${savedAt ? ` from ${formatSaved(savedAt)}` : ''}${waiting}`;
    el.hidden = false;
  } else if (savedAt) {
    el.dataset.state = 'stale';
    el.textContent = wasOffline
      ? `Back online — this page is the copy saved on this phone (${formatSaved(savedAt)})${waiting}. `
      : `Showing the copy saved on this phone (${formatSaved(savedAt)}): the server did not answer in time${waiting}. `;
    const reload = document.createElement('button');
    reload.type = 'button';
    reload.textContent = 'Reload';
    reload.className = 'ml-2 rounded-md border border-white/60 px-2 py-0.5 font-bold hover:bg-white/10';
    reload.addEventListener('click', () => location.reload());
    el.append(reload);
    el.hidden = false;
  } else if (queued > 0) {
    el.dataset.state = 'sending';
    el.textContent = `Sending ${queued} check-in${queued === 1 ? '' : 's'} saved on this phone…`;
    el.hidden = false;
  } else {
    el.hidden = true;
    el.textContent = '';
    delete el.dataset.state;
  }
}

async function countQueued() {
  try {
    queued = (await listQueued()).filter((q) => q.state === 'waiting').length;
  } catch {
    queued = 0;
  }
  render();
}

async function worker(): Promise<ServiceWorker | null> {
  if (!('serviceWorker' in navigator)) return null;
  const reg = await navigator.serviceWorker.ready;
  return reg.active;
}

/** Asks the service worker to keep this camper's trips and latest forecasts for offline use. */
export async function warmOfflineCopy(force = false): Promise<void> {
  if (!navigator.onLine || !userId) return;
  const sw = await worker();
  sw?.postMessage({ type: 'warm', userId, force });
}

async function sendQueued() {
  if (!navigator.onLine) return;
  const r = await flushOutbox().catch(() => null);
  await countQueued();
  if (r && r.sent > 0) warmOfflineCopy(true);
}

if ('serviceWorker' in navigator && import.meta.env.PROD) {
  navigator.serviceWorker.addEventListener('message', (e: MessageEvent<{ type: string; pages?: string[] }>) => {
    if (e.data?.type === 'warmed') {
      document.documentElement.dataset.offlineReady = 'true';
      // What is kept, for the trip page's "kept on this phone" sentence (features/offline/stored.ts).
      document.documentElement.dataset.offlinePages = JSON.stringify(e.data.pages ?? []);
      window.dispatchEvent(new CustomEvent('sunreckon:offline-ready', { detail: e.data.pages ?? [] }));
    }
  });
  navigator.serviceWorker
    .register('/sw.js', { scope: '/' })
    .then(async () => {
      const sw = await worker();
      // A saved copy carries the user of when it was saved; only a fresh page says who is signed in now.
      if (!savedAt && navigator.onLine) sw?.postMessage(userId ? { type: 'warm', userId } : { type: 'session', userId: '' });
    })
    .catch(() => undefined);
}

window.addEventListener('online', () => {
  render();
  void sendQueued();
});
window.addEventListener('offline', () => {
  wasOffline = true;
  render();
});
document.addEventListener('visibilitychange', () => {
  if (document.visibilityState === 'visible') void sendQueued();
});
onOutboxChange(() => void countQueued());
setInterval(() => {
  if (queued > 0) void sendQueued();
}, 20_000);

void countQueued().then(sendQueued);
