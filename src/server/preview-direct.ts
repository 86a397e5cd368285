import { createHash } from 'node:crypto';
import type { IncomingMessage, ServerResponse } from 'node:http';
import { LRUCache } from 'lru-cache';
import { env } from './env';
import { HttpError } from './errors';
import { errorResponse, JSON_HEADERS, parseJsonText } from './http';
import { clientKeyOf, limitClient } from './rate-limit';
import { policy, SECURITY_HEADERS } from './security-headers';
import { runCachedColumnsJson, runCachedForecast } from './sun-cache';

/**
 * The anonymous preview (`POST /api/forecasts/preview`), shared by its Astro route and by the
 * direct path that server.mjs takes before Astro's pipeline (DEVELOPERS.md, Performance).
 *
 * The answer is a pure function of the body's text and the form asked for (the engine reads no
 * clock, file or database), so the last answers are kept by the SHA-256 of the body: the same
 * plan sent again (a second visitor trying the same example, a page asking again) is answered
 * without forecasting. PREVIEW_CACHE_MB (default 16) caps it per process; 0 turns it off.
 */
const CACHE_BYTES = Math.max(0, Number(process.env.PREVIEW_CACHE_MB ?? 16)) * 1024 * 1024;
// An answer may be a view into a larger buffer (the columns writer's): what it holds is counted.
const answers = CACHE_BYTES > 0 ? new LRUCache<string, Buffer>({ maxSize: CACHE_BYTES, sizeCalculation: (b) => b.buffer.byteLength + 100 }) : null;

/** The largest body the preview reads (as the route always did). */
export const PREVIEW_MAX_BYTES = 256 * 1024;

export type PreviewAnswer = { status: 200 | 400; body: Buffer };

/**
 * The preview's answer to a body: 200 with the forecast (rows, or columns with `columns`), or 400
 * with the engine's envelope naming each bad field. Bad JSON or a NUL character throws HttpError.
 */
export function previewAnswer(text: string, columns: boolean): PreviewAnswer {
  const key = answers ? `${columns ? 'c' : 'r'}${createHash('sha256').update(text).digest('base64')}` : '';
  const kept = answers?.get(key);
  if (kept) return { status: 200, body: kept };
  const input = parseJsonText(text, 'invalid_plan');
  const result = columns ? runCachedColumnsJson(input) : runCachedForecast(input);
  if (!result.ok) return { status: 400, body: Buffer.from(JSON.stringify(result.envelope)) };
  const body = 'json' in result ? Buffer.from(result.json.buffer, result.json.byteOffset, result.json.byteLength) : Buffer.from(JSON.stringify(result.forecast));
  if (answers && body.buffer.byteLength + 100 <= CACHE_BYTES) answers.set(key, body);
  return { status: 200, body };
}

/** What the answer cache holds (tests). */
export function previewCacheStats(): { entries: number; bytes: number } {
  return { entries: answers?.size ?? 0, bytes: answers?.calculatedSize ?? 0 };
}

const AUTH_ORIGIN = env.authUrl ? new URL(env.authUrl).origin : null;
const CSP = policy([]);
// The hosts astro.config.mjs names in security.allowedDomains: only for them does Astro build the
// request's URL from the Host header (any other host becomes "localhost").
const ALLOWED_HOST = /^(?:localhost|127\.0\.0\.1)(?::\d{1,5})?$/;

/**
 * The origin middleware.ts `sameOrigin` expects of this request, when it can be told without Astro
 * building the request's URL; null otherwise (the request then goes through Astro's pipeline).
 */
function expectedOrigin(req: IncomingMessage): string | null {
  if (env.isProduction && AUTH_ORIGIN) return AUTH_ORIGIN;
  const h = req.headers;
  if (h['x-forwarded-proto'] !== undefined || h['x-forwarded-host'] !== undefined || h['x-forwarded-port'] !== undefined) return null;
  if ('encrypted' in req.socket && req.socket.encrypted) return null;
  const host = h.host;
  return typeof host === 'string' && ALLOWED_HOST.test(host) ? `http://${host}` : null;
}

function send(res: ServerResponse, status: number, body: Buffer | string, extra: Record<string, string> = {}): void {
  if (res.headersSent || res.destroyed) return;
  const headers: Record<string, string | number> = { ...JSON_HEADERS, ...SECURITY_HEADERS, 'Content-Security-Policy': CSP, ...extra };
  headers['X-Sunreckon-Path'] = 'direct';
  headers['Content-Length'] = Buffer.byteLength(body);
  res.writeHead(status, headers);
  res.end(body);
}

async function sendError(res: ServerResponse, err: unknown, method: string): Promise<void> {
  let r: Response;
  if (err instanceof HttpError) r = errorResponse(err.code, err.message, err.issues, err.extra, err.headers);
  else {
    console.error('[sunreckon] unexpected error', method, '/api/forecasts/preview', err);
    r = errorResponse('internal', 'Something went wrong on our side. Your data was not changed; try again.');
  }
  const extra: Record<string, string> = {};
  r.headers.forEach((v, k) => {
    if (k !== 'content-type' && k !== 'cache-control') extra[k] = v;
  });
  send(res, r.status, await r.text(), extra);
}

/**
 * server.mjs calls this for `POST /api/forecasts/preview` before Astro. It answers the plain case
 * itself — the route's exact path (with no query or `?hourly=columns`), a JSON body of a declared
 * length within the limit, and either no Origin or the one middleware.ts would accept — and
 * returns true; otherwise it touches nothing and returns false, and Astro's pipeline answers
 * (cross-site origins, proxies' forwarded hosts, chunked or oversized bodies, wrong content types).
 * What it does is what the route and middleware.ts do for such a request: the rate limit, the body
 * read and parsed, the forecast, the security headers; no session is looked up for this route.
 */
export function previewDirect(req: IncomingMessage, res: ServerResponse): boolean {
  if (req.method !== 'POST') return false;
  const url = req.url;
  if (url !== '/api/forecasts/preview' && url !== '/api/forecasts/preview?hourly=columns') return false;
  const h = req.headers;
  if (!/^application\/json\b/i.test((h['content-type'] ?? '').trim())) return false;
  const length = Number(h['content-length']);
  if (!Number.isSafeInteger(length) || length < 0 || length > PREVIEW_MAX_BYTES || h['transfer-encoding'] !== undefined) return false;
  const origin = h.origin;
  if (origin !== undefined && origin !== expectedOrigin(req)) return false;
  const forwarded = h['x-forwarded-for'];
  const client = clientKeyOf(typeof forwarded === 'string' ? forwarded : (forwarded?.join(', ') ?? null), req.socket.remoteAddress || 'unknown');
  void answer(req, res, client, length, url.endsWith('columns')).catch((err) => sendError(res, err, 'POST'));
  return true;
}

async function answer(req: IncomingMessage, res: ServerResponse, client: string, length: number, columns: boolean): Promise<void> {
  // As on the route: the limit first (a refused body is left for Node to discard), then the body.
  await limitClient(client, 'preview', env.PREVIEW_RATE_LIMIT);
  const body = Buffer.allocUnsafe(length);
  let got = 0;
  for await (const chunk of req as AsyncIterable<Buffer>) {
    // Node's parser ends the body at its Content-Length; the bound is kept here all the same.
    got += chunk.copy(body, got);
  }
  const a = previewAnswer(new TextDecoder().decode(body.subarray(0, got)), columns);
  send(res, a.status, a.body);
}
