import type { APIContext } from 'astro';
import type { z } from 'zod';
import { ERROR_STATUS, HttpError, type ErrorCode, type Issue } from './errors';

export const JSON_HEADERS = { 'content-type': 'application/json; charset=utf-8', 'cache-control': 'no-store' };

/** A JSON response. */
export function json(body: unknown, status = 200, headers: Record<string, string> = {}): Response {
  return new Response(JSON.stringify(body), { status, headers: { ...JSON_HEADERS, ...headers } });
}

/** The error envelope as a response. */
export function errorResponse(
  code: ErrorCode,
  message: string,
  issues: Issue[] = [],
  extra: Record<string, unknown> = {},
  headers: Record<string, string> = {},
): Response {
  return json({ error: { code, message }, issues, ...extra }, ERROR_STATUS[code], headers);
}

/** Turns zod issues into dot paths (`stops.0.lat`). */
export function zodIssues(error: z.ZodError, prefix = ''): Issue[] {
  return error.issues.map((i) => ({
    path: [prefix, ...i.path.map(String)].filter(Boolean).join('.') || '(body)',
    message: i.message,
  }));
}

/**
 * Where a JSON value holds the NUL character (U+0000) in a string or key, as a field path, or null.
 * Text columns cannot store it (PostgreSQL refuses it outright), and no field of ours needs it.
 */
export function nulPath(value: unknown, path = ''): string | null {
  if (typeof value === 'string') return value.includes('\u0000') ? path || '(body)' : null;
  if (Array.isArray(value)) {
    for (let i = 0; i < value.length; i++) {
      const at = nulPath(value[i], path ? `${path}.${i}` : String(i));
      if (at) return at;
    }
    return null;
  }
  if (value && typeof value === 'object') {
    for (const [k, v] of Object.entries(value)) {
      const here = path ? `${path}.${k}` : k;
      if (k.includes('\u0000')) return here;
      const at = nulPath(v, here);
      if (at) return at;
    }
  }
  return null;
}

/** A 400 naming the field that holds the NUL character. */
export function nulError(path: string): HttpError {
  return new HttpError('invalid_request', 'Some fields need fixing.', [{ path, message: 'contains an invisible NUL character (U+0000); remove it' }]);
}

/** Reads a JSON body (content type and size checked) as unknown; throws HttpError on bad input. */
export async function readJson(request: Request, maxBytes = 256 * 1024, invalidCode: ErrorCode = 'invalid_request'): Promise<unknown> {
  return parseJsonText(await readJsonText(request, maxBytes, invalidCode), invalidCode);
}

/** The body of a JSON request as text (content type and size checked, not yet parsed). */
export async function readJsonText(request: Request, maxBytes = 256 * 1024, invalidCode: ErrorCode = 'invalid_request'): Promise<string> {
  const type = request.headers.get('content-type') ?? '';
  if (!/^application\/json\b/i.test(type.trim())) {
    throw new HttpError(invalidCode, 'Send the body as JSON with the header Content-Type: application/json.', [
      { path: '(headers).content-type', message: `expected application/json, got ${type ? `"${type.slice(0, 60)}"` : 'none'}` },
    ]);
  }
  const buf = await readLimited(request, maxBytes);
  return new TextDecoder().decode(buf);
}

/** Parses a JSON body's text: an empty body, bad JSON or a NUL character anywhere is a 400 naming it. */
export function parseJsonText(text: string, invalidCode: ErrorCode = 'invalid_request'): unknown {
  if (!text.trim()) throw new HttpError(invalidCode, 'The body is empty; send a JSON object.', [{ path: '(body)', message: 'empty body' }]);
  let data: unknown;
  try {
    data = JSON.parse(text);
  } catch (e) {
    throw new HttpError(invalidCode, 'The body is not valid JSON.', [{ path: '(body)', message: (e as Error).message.slice(0, 200) }]);
  }
  // JSON text can hold U+0000 only as the escape \u0000 (a raw control character is not valid
  // JSON), so a body without that escape needs no walk through what it parsed to.
  const nul = text.includes('\\u0000') ? nulPath(data) : null;
  if (nul) throw nulError(nul);
  return data;
}

/**
 * The raw body, refused past `maxBytes` whatever Content-Length says (a missing or false one cannot
 * get past the count). `tooLarge` makes the refusal; by default a 413 naming the limit in KB.
 */
export async function readLimited(request: Request, maxBytes: number, tooLarge?: () => HttpError): Promise<Uint8Array> {
  const refuse = tooLarge ?? (() => new HttpError('payload_too_large', `The body is larger than ${Math.round(maxBytes / 1024)} KB.`));
  if (Number(request.headers.get('content-length') ?? '0') > maxBytes) throw refuse();
  if (!request.body) return new Uint8Array();
  const reader = request.body.getReader();
  // One buffer for the whole body: sized from Content-Length when it is given (and grown by doubling
  // when the body runs past it or none was given), so a body is never held twice. The answer is the
  // whole of its own buffer, which a worker thread can take over without a copy.
  const declared = Number(request.headers.get('content-length') ?? '');
  let out = new Uint8Array(Number.isSafeInteger(declared) && declared > 0 ? declared : 64 * 1024);
  let total = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    if (total + value.byteLength > maxBytes) {
      await reader.cancel().catch(() => {});
      throw refuse();
    }
    if (total + value.byteLength > out.byteLength) {
      const grown = new Uint8Array(Math.min(maxBytes, Math.max(out.byteLength * 2, total + value.byteLength)));
      grown.set(out.subarray(0, total));
      out = grown;
    }
    out.set(value, total);
    total += value.byteLength;
  }
  return total === out.byteLength ? out : out.slice(0, total);
}

/** Parses with a zod schema or throws a 400 naming each field. */
export function parseWith<S extends z.ZodType>(schema: S, data: unknown, code: ErrorCode = 'invalid_request', message = 'Some fields need fixing.'): z.infer<S> {
  const r = schema.safeParse(data);
  if (!r.success) throw new HttpError(code, message, zodIssues(r.error));
  return r.data;
}

type Handler = (ctx: APIContext) => Promise<Response> | Response;

/** Wraps a route so that HttpError becomes the envelope and anything unexpected a logged 500 envelope. */
export function route(handler: Handler): Handler {
  return async (ctx) => {
    try {
      return await handler(ctx);
    } catch (err) {
      if (err instanceof HttpError) return errorResponse(err.code, err.message, err.issues, err.extra, err.headers);
      console.error('[sunreckon] unexpected error', ctx.request.method, ctx.url.pathname, err);
      return errorResponse('internal', 'Something went wrong on our side. Your data was not changed; try again.');
    }
  };
}

/** The signed-in user, or a 401. */
export function requireUser(ctx: APIContext) {
  const user = ctx.locals.user;
  if (!user) throw new HttpError('unauthorized', 'Sign in to use this.');
  return user;
}
