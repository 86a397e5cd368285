// Check-ins made on the phone wait here (IndexedDB) until the server has them. Each carries the
// id the phone gave it, and the server stores a check-in once per id, so sending one again — after
// a lost answer, from two tabs, or after a reload — never makes a second one. An item leaves the
// outbox only when the server has answered that it is stored (201, or 200 for one it already had);
// an item the server refuses stays, marked with the reason, until the camper discards it.
import type { CheckInDto, CheckInInput, CheckInOutcome, PreviousOutcome } from '../../domain/checkins/checkins.schema';

export interface QueuedCheckIn {
  id: string;
  /** Who made it: only their session sends it (a phone shared by two campers never sends one as the other). */
  userId: string;
  tripId: string;
  body: CheckInInput;
  /** The re-forecast the phone made with the same engine, shown until the server's arrives. */
  local: { socPct: number; outcome: CheckInOutcome; previous: PreviousOutcome | null; note: string | null } | null;
  queuedAt: string;
  state: 'waiting' | 'refused';
  attempts: number;
  lastError: string | null;
  issues: { path: string; message: string }[];
}

export type OutboxEvent = { type: 'queued' | 'sent' | 'refused' | 'discarded' | 'attempted'; id: string; tripId: string; checkIn?: CheckInDto };

/** The signed-in user of this page, from the layout's meta tag ('' when nobody is). */
export function currentUserId(): string {
  return typeof document === 'undefined' ? '' : (document.querySelector<HTMLMetaElement>('meta[name="sunreckon-user"]')?.content ?? '');
}

const DB_NAME = 'sunreckon';
const STORE = 'checkin-outbox';
const channel = typeof BroadcastChannel !== 'undefined' ? new BroadcastChannel('sunreckon-outbox') : null;
const local = new EventTarget();

function open(): Promise<IDBDatabase> {
  return new Promise((resolve, reject) => {
    const req = indexedDB.open(DB_NAME, 1);
    req.onupgradeneeded = () => {
      if (!req.result.objectStoreNames.contains(STORE)) req.result.createObjectStore(STORE, { keyPath: 'id' });
    };
    req.onsuccess = () => resolve(req.result);
    req.onerror = () => reject(req.error);
  });
}

async function tx<T>(mode: IDBTransactionMode, run: (store: IDBObjectStore) => IDBRequest<T> | void): Promise<T | undefined> {
  const db = await open();
  try {
    return await new Promise<T | undefined>((resolve, reject) => {
      const t = db.transaction(STORE, mode);
      const req = run(t.objectStore(STORE));
      t.oncomplete = () => resolve(req ? req.result : undefined);
      t.onerror = () => reject(t.error);
      t.onabort = () => reject(t.error);
    });
  } finally {
    db.close();
  }
}

function emit(e: OutboxEvent) {
  channel?.postMessage(e);
  local.dispatchEvent(new CustomEvent('change', { detail: e }));
}

/** Calls `cb` on every change of the outbox, in this tab and in the others. */
export function onOutboxChange(cb: (e: OutboxEvent) => void): () => void {
  const a = (ev: Event) => cb((ev as CustomEvent<OutboxEvent>).detail);
  const b = (ev: MessageEvent<OutboxEvent>) => cb(ev.data);
  local.addEventListener('change', a);
  channel?.addEventListener('message', b);
  return () => {
    local.removeEventListener('change', a);
    channel?.removeEventListener('message', b);
  };
}

/** Puts a check-in in the outbox (durably, before anything is sent). */
export async function enqueue(item: Omit<QueuedCheckIn, 'state' | 'attempts' | 'lastError' | 'issues' | 'queuedAt' | 'userId'>): Promise<void> {
  const full: QueuedCheckIn = { ...item, userId: currentUserId(), queuedAt: new Date().toISOString(), state: 'waiting', attempts: 0, lastError: null, issues: [] };
  await tx('readwrite', (s) => s.put(full));
  emit({ type: 'queued', id: item.id, tripId: item.tripId });
}

/** The signed-in user's check-ins still on the phone (all trips, or one), oldest first. */
export async function listQueued(tripId?: string, userId = currentUserId()): Promise<QueuedCheckIn[]> {
  const all = ((await tx<QueuedCheckIn[]>('readonly', (s) => s.getAll() as IDBRequest<QueuedCheckIn[]>)) ?? []).filter((q) => q.userId === userId && (!tripId || q.tripId === tripId));
  return all.sort((a, b) => a.queuedAt.localeCompare(b.queuedAt));
}

/** Drops a check-in the server refused (the camper chose to). */
export async function discard(id: string): Promise<void> {
  const q = (await listQueued()).find((x) => x.id === id);
  await tx('readwrite', (s) => s.delete(id));
  if (q) emit({ type: 'discarded', id, tripId: q.tripId });
}

async function update(q: QueuedCheckIn): Promise<void> {
  await tx('readwrite', (s) => s.put(q));
}

let flushing: Promise<FlushResult> | null = null;

export interface FlushResult {
  sent: number;
  remaining: number;
  /** Why sending stopped early (offline, signed out, server trouble), if it did. */
  stopped: string | null;
}

/** Sends the waiting check-ins, oldest first; one flush at a time across tabs. */
export function flushOutbox(): Promise<FlushResult> {
  if (flushing) return flushing;
  const run = async () => {
    const locks = (navigator as Navigator & { locks?: LockManager }).locks;
    return locks ? ((await locks.request('sunreckon-outbox', () => flushNow())) as FlushResult) : flushNow();
  };
  flushing = run().finally(() => {
    flushing = null;
  });
  return flushing;
}

async function flushNow(): Promise<FlushResult> {
  const waiting = (await listQueued()).filter((q) => q.state === 'waiting');
  let sent = 0;
  for (const q of waiting) {
    let res: Response;
    try {
      res = await fetch(`/api/trips/${encodeURIComponent(q.tripId)}/check-ins`, {
        method: 'POST',
        credentials: 'same-origin',
        headers: { 'content-type': 'application/json', accept: 'application/json' },
        body: JSON.stringify(q.body),
      });
    } catch {
      await update({ ...q, attempts: q.attempts + 1, lastError: 'No connection yet.' });
      emit({ type: 'attempted', id: q.id, tripId: q.tripId });
      return { sent, remaining: waiting.length - sent, stopped: 'offline' };
    }
    const data = await res.json().catch(() => null);
    if (res.status === 200 || res.status === 201) {
      await tx('readwrite', (s) => s.delete(q.id));
      sent++;
      emit({ type: 'sent', id: q.id, tripId: q.tripId, checkIn: data as CheckInDto });
      continue;
    }
    if (res.status === 401) {
      await update({ ...q, attempts: q.attempts + 1, lastError: 'Sign in again to send it.' });
      emit({ type: 'attempted', id: q.id, tripId: q.tripId });
      return { sent, remaining: waiting.length - sent, stopped: 'signed-out' };
    }
    if (res.status === 429 || res.status >= 500) {
      await update({ ...q, attempts: q.attempts + 1, lastError: 'The server could not take it yet; it will be sent again.' });
      emit({ type: 'attempted', id: q.id, tripId: q.tripId });
      return { sent, remaining: waiting.length - sent, stopped: 'server' };
    }
    // A clear refusal (400, 403, 404, 409): keep it, say why, let the camper decide.
    const env = (data ?? {}) as { error?: { message?: string }; issues?: { path: string; message: string }[] };
    await update({ ...q, state: 'refused', attempts: q.attempts + 1, lastError: env.error?.message ?? `Refused (${res.status}).`, issues: Array.isArray(env.issues) ? env.issues : [] });
    emit({ type: 'refused', id: q.id, tripId: q.tripId });
  }
  return { sent, remaining: 0, stopped: null };
}
