import { createServer, type IncomingMessage, type Server, type ServerResponse } from 'node:http';
import type { Socket } from 'node:net';
import { Builder } from 'flatbuffers';
import { Model } from '@openmeteo/sdk/model';
import { Unit } from '@openmeteo/sdk/unit';
import { Variable } from '@openmeteo/sdk/variable';

// The local fake of the hosted weather service, for development, the demo and the tests: a real
// HTTP server on loopback that answers the service's forecast (`/v1/forecast`) and archive
// (`/v1/archive`) requests in its own wire format — size-prefixed FlatBuffers `WeatherApiResponse`
// roots, one per location — so the app, through the service's SDK, never knows it is talking to
// a fake. The data are invented but deterministic and plausible: a clear-sky day shape (Haurwitz
// on the fake's own sun geometry) times a cloud pattern seeded by place and date, and a daily
// temperature cycle set by latitude and season. Never used in production.
//
// Controls (for tests, never part of the service's protocol):
//   POST /__fake/mode  {"mode": "normal" | "fail" | "hang" | "garbage", "status"?: 500}
//   GET  /__fake/stats → {"forecast": n, "archive": n}   (requests answered or held since the last reset)
//   POST /__fake/reset  (mode normal, counts 0, weather normal)
//   POST /__fake/turn  {"mode": "storm" | "normal", "from"?: "YYYY-MM-DD"}  turns the weather: from
//        local midnight of `from` (every hour when left out) the forecast answers are a storm —
//        overcast, dim and cold — so a trip that made it on the normal forecast runs out. The archive
//        (past years' weather) never turns. `GET /__fake/turn` reads it back.
//   `fake_sky=clear` in a weather request: no clouds (the reference check of the clear-sky shape).

export type FakeMode = 'normal' | 'fail' | 'hang' | 'garbage';

/** The fake's turned weather: a storm in its forecast answers from local midnight of `from` on. */
export interface FakeTurn {
  mode: 'normal' | 'storm';
  /** YYYY-MM-DD, or null for every hour. */
  from: string | null;
}

const NORMAL: FakeTurn = { mode: 'normal', from: null };

export interface FakeWeather {
  /** Base URL, e.g. http://127.0.0.1:41234 */
  url: string;
  forecastUrl: string;
  archiveUrl: string;
  port: number;
  stop(): Promise<void>;
  /** Lets the process end while the fake still listens (a shared fake of a test file or script). */
  unref(): void;
}

const DAY_S = 86_400;
const RAD = Math.PI / 180;

/** The variables the fake knows, by the service's names: SDK enum, unit and altitude. */
const VARIABLES: Record<string, { variable: Variable; unit: Unit; altitude: number }> = {
  shortwave_radiation: { variable: Variable.shortwave_radiation, unit: Unit.watt_per_square_metre, altitude: 0 },
  temperature_2m: { variable: Variable.temperature, unit: Unit.celsius, altitude: 2 },
  cloud_cover: { variable: Variable.cloud_cover, unit: Unit.percentage, altitude: 0 },
};

class BadRequest extends Error {}

// ---------- the invented weather ----------

/** A 32-bit hash of integers (xorshift-multiply), the seed of one place and day. */
function hash(...parts: number[]): number {
  let h = 0x811c9dc5;
  for (const p of parts) {
    h ^= p | 0;
    h = Math.imul(h, 0x01000193);
    h ^= h >>> 15;
    h = Math.imul(h, 0x2c1b3c6d);
    h ^= h >>> 12;
  }
  return (h >>> 0) / 0xffffffff;
}

/** Day of the year (1..366) of a UTC day number. */
function dayOfYear(day: number): number {
  const d = new Date(day * DAY_S * 1000);
  return day - Math.floor(Date.UTC(d.getUTCFullYear(), 0, 1) / (DAY_S * 1000)) + 1;
}

/**
 * Cosine of the solar zenith at a UTC instant (seconds): Spencer (1971) declination and equation of
 * time, hour angle from local solar time. Written here, not taken from the app's engine, so the
 * reference check compares two independent sun models.
 */
export function fakeCosZenith(tSec: number, lat: number, lon: number): number {
  const day = Math.floor(tSec / DAY_S);
  const g = (2 * Math.PI * (dayOfYear(day) - 1)) / 365;
  const decl =
    0.006918 -
    0.399912 * Math.cos(g) +
    0.070257 * Math.sin(g) -
    0.006758 * Math.cos(2 * g) +
    0.000907 * Math.sin(2 * g) -
    0.002697 * Math.cos(3 * g) +
    0.00148 * Math.sin(3 * g);
  const eotMin =
    229.18 * (0.000075 + 0.001868 * Math.cos(g) - 0.032077 * Math.sin(g) - 0.014615 * Math.cos(2 * g) - 0.040849 * Math.sin(2 * g));
  const utcHours = (tSec - day * DAY_S) / 3600;
  const solarHours = utcHours + lon / 15 + eotMin / 60;
  const omega = (solarHours - 12) * 15 * RAD;
  const phi = lat * RAD;
  return Math.sin(phi) * Math.sin(decl) + Math.cos(phi) * Math.cos(decl) * Math.cos(omega);
}

/** Clear-sky GHI, W/m², Haurwitz (1945): 1098·cos z·exp(−0.059/cos z). */
function clearSky(cosZ: number): number {
  return cosZ > 0 ? 1098 * cosZ * Math.exp(-0.059 / cosZ) : 0;
}

/** Mean clear-sky GHI over the hour ending at `tSec` (the service's "preceding hour mean"). */
function clearSkyHourMean(tSec: number, lat: number, lon: number): number {
  const n = 12;
  let sum = 0;
  for (let i = 0; i < n; i++) sum += clearSky(fakeCosZenith(tSec - 3600 + ((i + 0.5) * 3600) / n, lat, lon));
  return sum / n;
}

/** Winter-ness of a day at a latitude: 1 at midwinter, −1 at midsummer (peak ~20 July north). */
function winterness(day: number, lat: number): number {
  const c = Math.cos((2 * Math.PI * (dayOfYear(day) - 201)) / 365.25);
  return lat >= 0 ? -c : c;
}

/** Cloud fraction 0..1 of a place at an instant: a seeded day value with a slow wave through the day. */
function cloudFraction(tSec: number, latT: number, lonT: number, lat: number): number {
  const day = Math.floor(tSec / DAY_S);
  // Mid-latitude winters are cloudier; the tropics a little cloudy all year.
  const mean = 0.3 + 0.18 * winterness(day, lat) * Math.min(1, Math.abs(lat) / 50);
  const u = hash(latT, lonT, day);
  // Skewed so clear days and grey days both happen: u² pulls toward clear, the mean shifts it.
  const base = Math.min(1, Math.max(0, mean + (u * u - 0.33) * 1.4));
  const next = Math.min(1, Math.max(0, mean + (hash(latT, lonT, day + 1) ** 2 - 0.33) * 1.4));
  const f = (tSec - day * DAY_S) / DAY_S;
  const blend = base + (next - base) * f;
  const wave = 0.15 * Math.sin(2 * Math.PI * f + hash(lonT, latT, day) * 6);
  return Math.min(1, Math.max(0, blend + wave));
}

/** Air temperature at 2 m, °C: yearly mean by latitude, season, a seeded day anomaly and a daily cycle. */
function temperature(tSec: number, latT: number, lonT: number, lat: number, lon: number, cloud: number): number {
  const day = Math.floor(tSec / DAY_S);
  const absLat = Math.abs(lat);
  const yearly = 27 - 0.5 * Math.max(0, absLat - 12);
  const amplitude = 2 + 0.28 * absLat;
  const anomaly = (hash(latT * 7, lonT * 3, day) - 0.5) * 6;
  const dayMean = yearly - amplitude * winterness(day, lat) + anomaly;
  const range = 12 * (1 - 0.6 * cloud);
  const solarHours = ((tSec - day * DAY_S) / 3600 + lon / 15 + 48) % 24;
  return dayMean + (range / 2) * Math.cos((2 * Math.PI * (solarHours - 15)) / 24);
}

// The turned weather (invented for the fake, deterministic): thick storm cloud, 94–100 % cover, lets
// through about a tenth of the clear-sky light, and the air is 12 °C colder than the normal answer
// with almost no daily swing.
const STORM_LIGHT = 0.1;
const STORM_COOLING_C = 12;

function stormCloud(tSec: number, latT: number, lonT: number): number {
  return 94 + Math.round(6 * hash(latT, lonT, Math.floor(tSec / 3600)));
}

/**
 * The hourly values of one variable at the instants `times` (seconds, UTC); the instants at or after
 * `stormFrom` (seconds, UTC) are the turned storm.
 */
function series(name: string, times: number[], lat: number, lon: number, clear: boolean, stormFrom = Infinity): Float32Array {
  const latT = Math.round(lat * 10);
  const lonT = Math.round(lon * 10);
  const out = new Float32Array(times.length);
  times.forEach((t, i) => {
    if (t >= stormFrom) {
      if (name === 'shortwave_radiation') out[i] = clearSkyHourMean(t, lat, lon) * STORM_LIGHT;
      else if (name === 'cloud_cover') out[i] = stormCloud(t, latT, lonT);
      else {
        // The day's mean of the normal answer, cooled, with a 2 °C swing instead of up to 12 °C.
        const day = Math.floor(t / DAY_S) * DAY_S;
        let mean = 0;
        for (let h = 0; h < 24; h++) mean += temperature(day + h * 3600, latT, lonT, lat, lon, 1) / 24;
        const solarHours = ((t - day) / 3600 + lon / 15 + 48) % 24;
        out[i] = Math.round((mean - STORM_COOLING_C + Math.cos((2 * Math.PI * (solarHours - 15)) / 24)) * 10) / 10;
      }
      return;
    }
    if (name === 'shortwave_radiation') {
      // Hour-ending mean, as the service gives it; clouds by Kasten & Czeplak (1980) at mid-hour.
      const c = clear ? 0 : cloudFraction(t - 1800, latT, lonT, lat);
      out[i] = clearSkyHourMean(t, lat, lon) * (1 - 0.75 * Math.pow(c, 3.4));
    } else if (name === 'cloud_cover') {
      out[i] = clear ? 0 : Math.round(cloudFraction(t, latT, lonT, lat) * 100);
    } else {
      const c = clear ? 0 : cloudFraction(t, latT, lonT, lat);
      out[i] = Math.round(temperature(t, latT, lonT, lat, lon, c) * 10) / 10;
    }
  });
  return out;
}

// ---------- the request ----------

const DATE_RE = /^(\d{4})-(\d{2})-(\d{2})$/;

function dayOf(s: string, field: string): number {
  const m = DATE_RE.exec(s);
  const ms = m ? Date.UTC(Number(m[1]), Number(m[2]) - 1, Number(m[3])) : NaN;
  if (!m || !Number.isFinite(ms) || new Date(ms).toISOString().slice(0, 10) !== s)
    throw new BadRequest(`Parameter '${field}' is invalid: ${s}`);
  return ms / 1000 / DAY_S;
}

function offsetSeconds(timeZone: string, tSec: number): number {
  if (timeZone === 'GMT' || timeZone === 'UTC') return 0;
  const f = new Intl.DateTimeFormat('en-US', { timeZone, timeZoneName: 'longOffset' });
  const m = /GMT(?:([+-])(\d{1,2})(?::?(\d{2}))?)?/.exec(f.format(new Date(tSec * 1000)));
  if (!m || !m[1]) return 0;
  const v = Number(m[2]) * 3600 + Number(m[3] ?? 0) * 60;
  return m[1] === '-' ? -v : v;
}

function numbers(q: URLSearchParams, field: string): number[] {
  const raw = q.get(field);
  if (raw === null || raw === '') throw new BadRequest(`Parameter '${field}' is required`);
  const out = raw.split(',').map(Number);
  if (out.some((v) => !Number.isFinite(v))) throw new BadRequest(`Parameter '${field}' must be numbers`);
  return out;
}

interface Answer {
  lat: number;
  lon: number;
  timeZone: string;
  start: number;
  hours: number;
  variables: string[];
  clear: boolean;
  /** The first instant (seconds, UTC) of the turned storm; Infinity when the weather is normal. */
  stormFrom: number;
}

/** Reads a forecast or archive request the way the service does; refuses what it would refuse. */
function readRequest(kind: 'forecast' | 'archive', q: URLSearchParams, todaySec: number, turn: FakeTurn): Answer[] {
  if (q.get('format') !== 'flatbuffers') throw new BadRequest('This fake only answers format=flatbuffers');
  const lats = numbers(q, 'latitude');
  const lons = numbers(q, 'longitude');
  if (lats.length !== lons.length) throw new BadRequest('Parameter latitude and longitude must have the same number of elements');
  if (lats.some((l) => l < -90 || l > 90)) throw new BadRequest('Latitude must be in range of -90 to 90°.');
  if (lons.some((l) => l < -180 || l > 180)) throw new BadRequest('Longitude must be in range of -180 to 180°.');
  const variables = (q.get('hourly') ?? '').split(',').filter(Boolean);
  for (const v of variables) if (!VARIABLES[v]) throw new BadRequest(`Cannot initialize ForecastVariable from invalid String value ${v}`);
  const tzRaw = q.get('timezone') ?? 'GMT';
  const timeZone = tzRaw === 'auto' ? 'GMT' : tzRaw;
  try {
    offsetSeconds(timeZone, 0);
  } catch {
    throw new BadRequest(`Invalid timezone ${tzRaw}`);
  }
  const today = Math.floor(todaySec / DAY_S);
  let first: number;
  let last: number;
  if (q.get('start_date') || q.get('end_date')) {
    first = dayOf(q.get('start_date') ?? '', 'start_date');
    last = dayOf(q.get('end_date') ?? '', 'end_date');
    if (last < first) throw new BadRequest('End-date must be larger or equals than start-date');
  } else if (kind === 'forecast') {
    const days = Number(q.get('forecast_days') ?? 7);
    if (!Number.isInteger(days) || days < 1 || days > 16) throw new BadRequest("Parameter 'forecast_days' must be between 0 and 16");
    first = today;
    last = today + days - 1;
  } else {
    throw new BadRequest("Parameter 'start_date' is required");
  }
  // The forecast reaches back 92 days and 16 days ahead; the archive ends five days ago.
  if (kind === 'forecast' && (first < today - 92 || last > today + 15))
    throw new BadRequest("Parameter 'start_date' is out of allowed range");
  if (kind === 'archive' && (first < dayOf('1940-01-01', 'start_date') || last > today - 5))
    throw new BadRequest("Parameter 'end_date' is out of allowed range");
  if (last - first > 400) throw new BadRequest('The requested time range is too long');
  const clear = q.get('fake_sky') === 'clear';
  return lats.map((lat, i) => {
    const lon = lons[i]!;
    // Data start at local midnight of the first day, as the service does with a time zone.
    const midnight = first * DAY_S;
    const start = midnight - offsetSeconds(timeZone, midnight);
    let stormFrom = Infinity;
    if (kind === 'forecast' && turn.mode === 'storm') {
      const fromMidnight = turn.from === null ? -Infinity : dayOf(turn.from, 'from') * DAY_S;
      stormFrom = fromMidnight - (Number.isFinite(fromMidnight) ? offsetSeconds(timeZone, fromMidnight) : 0);
    }
    return { lat, lon, timeZone, start, hours: (last - first + 1) * 24, variables, clear, stormFrom };
  });
}

/** One location's answer as a FlatBuffers `WeatherApiResponse`, size-prefixed. */
function encode(a: Answer, model: Model): Uint8Array {
  const b = new Builder(1024 + a.hours * 4 * a.variables.length);
  const times = Array.from({ length: a.hours }, (_, i) => a.start + i * 3600);
  const varOffsets = a.variables.map((name) => {
    const spec = VARIABLES[name]!;
    const values = series(name, times, a.lat, a.lon, a.clear, a.stormFrom);
    b.startVector(4, values.length, 4);
    for (let i = values.length - 1; i >= 0; i--) b.addFloat32(values[i]!);
    const vec = b.endVector();
    // VariableWithValues: slot 0 variable (u8), 1 unit (u8), 3 values ([f32]), 5 altitude (i16).
    b.startObject(14);
    b.addFieldInt8(0, spec.variable, 0);
    b.addFieldInt8(1, spec.unit, 0);
    b.addFieldOffset(3, vec, 0);
    b.addFieldInt16(5, spec.altitude, 0);
    return b.endObject();
  });
  b.startVector(4, varOffsets.length, 4);
  for (let i = varOffsets.length - 1; i >= 0; i--) b.addOffset(varOffsets[i]!);
  const varsVec = b.endVector();
  // VariablesWithTime: slot 0 time (i64), 1 timeEnd (i64), 2 interval (i32), 3 variables.
  b.startObject(4);
  b.addFieldInt64(0, BigInt(a.start), BigInt(0));
  b.addFieldInt64(1, BigInt(a.start + a.hours * 3600), BigInt(0));
  b.addFieldInt32(2, 3600, 0);
  b.addFieldOffset(3, varsVec, 0);
  const hourly = b.endObject();
  const tz = b.createString(a.timeZone);
  const abbr = b.createString(a.timeZone === 'GMT' || a.timeZone === 'UTC' ? 'GMT' : a.timeZone);
  // WeatherApiResponse: 0 latitude, 1 longitude, 2 elevation, 3 generation ms (f32), 5 model (u8),
  // 6 utcOffsetSeconds (i32), 7 timezone, 8 abbreviation, 11 hourly.
  b.startObject(15);
  b.addFieldFloat32(0, a.lat, 0);
  b.addFieldFloat32(1, a.lon, 0);
  b.addFieldFloat32(2, 0, 0);
  b.addFieldFloat32(3, 0.1, 0);
  b.addFieldInt8(5, model, 0);
  b.addFieldInt32(6, offsetSeconds(a.timeZone, a.start), 0);
  b.addFieldOffset(7, tz, 0);
  b.addFieldOffset(8, abbr, 0);
  b.addFieldOffset(11, hourly, 0);
  b.finishSizePrefixed(b.endObject());
  return b.asUint8Array();
}

/** The body of a weather request: every location's root, one after another. */
export function answerWeather(
  kind: 'forecast' | 'archive',
  query: URLSearchParams,
  nowMs = Date.now(),
  turn: FakeTurn = NORMAL,
): Uint8Array {
  const answers = readRequest(kind, query, Math.floor(nowMs / 1000), turn);
  const parts = answers.map((a) => encode(a, kind === 'archive' ? Model.era5 : Model.best_match));
  const out = new Uint8Array(parts.reduce((n, p) => n + p.length, 0));
  let at = 0;
  for (const p of parts) {
    out.set(p, at);
    at += p.length;
  }
  return out;
}

// ---------- the server ----------

function readBody(req: IncomingMessage): Promise<string> {
  return new Promise((resolve, reject) => {
    let s = '';
    req.setEncoding('utf8');
    req.on('data', (d: string) => {
      s += d;
      if (s.length > 10_000) req.destroy();
    });
    req.on('end', () => resolve(s));
    req.on('error', reject);
  });
}

function sendJson(res: ServerResponse, status: number, body: unknown): void {
  res.writeHead(status, { 'content-type': 'application/json' });
  res.end(JSON.stringify(body));
}

/** Reads the body of `POST /__fake/turn`; a message naming the field when it is wrong. */
export function readTurn(body: unknown): FakeTurn | string {
  if (typeof body !== 'object' || body === null || Array.isArray(body)) return 'body must be a JSON object';
  const b = body as Record<string, unknown>;
  if (b.mode !== 'storm' && b.mode !== 'normal') return "mode must be 'storm' or 'normal'";
  if (b.from === undefined || b.from === null) return { mode: b.mode, from: null };
  if (typeof b.from !== 'string') return 'from must be a date, YYYY-MM-DD';
  try {
    dayOf(b.from, 'from');
  } catch {
    return 'from must be a date, YYYY-MM-DD';
  }
  return { mode: b.mode, from: b.from };
}

/** Starts the fake on 127.0.0.1 (port 0 picks a free one). */
export async function startFakeWeather(opts: { port?: number; quiet?: boolean } = {}): Promise<FakeWeather> {
  let mode: FakeMode = 'normal';
  let turn: FakeTurn = NORMAL;
  let failStatus = 500;
  const counts = { forecast: 0, archive: 0 };
  const sockets = new Set<Socket>();

  const server: Server = createServer((req, res) => {
    const url = new URL(req.url ?? '/', 'http://127.0.0.1');
    void (async () => {
      if (url.pathname === '/__fake/stats' && req.method === 'GET') return sendJson(res, 200, { ...counts, mode, turn });
      if (url.pathname === '/__fake/turn' && req.method === 'GET') return sendJson(res, 200, turn);
      if (url.pathname === '/__fake/turn' && req.method === 'POST') {
        let body: unknown;
        try {
          body = JSON.parse(await readBody(req));
        } catch {
          return sendJson(res, 400, { error: 'body must be JSON' });
        }
        const read = readTurn(body);
        if (typeof read === 'string') return sendJson(res, 400, { error: read });
        turn = read;
        return sendJson(res, 200, turn);
      }
      if (url.pathname === '/__fake/reset' && req.method === 'POST') {
        turn = NORMAL;
        mode = 'normal';
        failStatus = 500;
        counts.forecast = 0;
        counts.archive = 0;
        return sendJson(res, 200, { ok: true });
      }
      if (url.pathname === '/__fake/mode' && req.method === 'POST') {
        let body: { mode?: unknown; status?: unknown };
        try {
          body = JSON.parse(await readBody(req)) as typeof body;
        } catch {
          return sendJson(res, 400, { error: 'body must be JSON' });
        }
        if (!['normal', 'fail', 'hang', 'garbage'].includes(String(body.mode)))
          return sendJson(res, 400, { error: 'mode must be normal, fail, hang or garbage' });
        mode = body.mode as FakeMode;
        failStatus = typeof body.status === 'number' && body.status >= 500 && body.status < 600 ? body.status : 500;
        return sendJson(res, 200, { mode, status: failStatus });
      }
      const kind = url.pathname === '/v1/forecast' ? 'forecast' : url.pathname === '/v1/archive' ? 'archive' : null;
      if (!kind || req.method !== 'GET') return sendJson(res, 404, { error: true, reason: 'Not found' });
      counts[kind]++;
      if (mode === 'hang') return; // holds the socket until the client gives up or the fake stops
      if (mode === 'fail') return sendJson(res, failStatus, { error: true, reason: 'The fake weather service is told to fail' });
      if (mode === 'garbage') {
        res.writeHead(200, { 'content-type': 'application/octet-stream' });
        // Not a FlatBuffers answer: a length prefix that points past the end, then text.
        return res.end(Buffer.concat([Buffer.from([0x10, 0, 0, 0]), Buffer.from('<html>gateway says hello</html>')]));
      }
      try {
        const body = answerWeather(kind, url.searchParams, Date.now(), turn);
        res.writeHead(200, { 'content-type': 'application/octet-stream', 'content-length': String(body.length) });
        res.end(body);
      } catch (err) {
        if (err instanceof BadRequest) return sendJson(res, 400, { error: true, reason: err.message });
        sendJson(res, 500, { error: true, reason: String(err) });
      }
    })();
  });
  server.on('connection', (s) => {
    sockets.add(s);
    s.on('close', () => sockets.delete(s));
  });
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(opts.port ?? 0, '127.0.0.1', () => {
      server.off('error', reject);
      resolve();
    });
  });
  const addr = server.address();
  const port = typeof addr === 'object' && addr ? addr.port : 0;
  const url = `http://127.0.0.1:${port}`;
  if (!opts.quiet) console.log(`[fake weather] ${url}/v1/forecast and ${url}/v1/archive`);
  return {
    url,
    port,
    forecastUrl: `${url}/v1/forecast`,
    archiveUrl: `${url}/v1/archive`,
    stop: () =>
      new Promise<void>((resolve) => {
        for (const s of sockets) s.destroy();
        server.close(() => resolve());
      }),
    unref: () => {
      server.unref();
      for (const s of sockets) s.unref();
      server.on('connection', (s) => s.unref());
    },
  };
}

/**
 * Turns the weather of the fake at `baseUrl` (its origin, e.g. http://127.0.0.1:8642): a storm in its
 * forecast answers from local midnight of `from` on (every hour when left out), or back to normal.
 */
export async function turnFakeWeather(baseUrl: string, mode: FakeTurn['mode'], from?: string): Promise<FakeTurn> {
  const res = await fetch(`${new URL(baseUrl).origin}/__fake/turn`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify(from ? { mode, from } : { mode }),
  });
  const body = (await res.json()) as FakeTurn | { error: string };
  if (!res.ok || 'error' in body) throw new Error(`The fake weather refused the turn: ${'error' in body ? body.error : res.status}`);
  return body;
}

/** The settings that point a server at a weather service. */
export interface WeatherEnv {
  WEATHER_FORECAST_URL: string;
  WEATHER_ARCHIVE_URL: string;
}

let shared: Promise<FakeWeather> | null = null;

/**
 * The one way a script or test points a server at weather: `given`'s own WEATHER_FORECAST_URL and
 * WEATHER_ARCHIVE_URL when it names both, otherwise this process's shared local fake (started on
 * first use, on `port` if free, else any; it does not keep the process alive). Every server the
 * tests, the measuring scripts and `npm run demo` start goes through here, so none of them asks
 * the real service unless told to.
 */
export async function weatherEnvFor(
  given: Partial<Record<keyof WeatherEnv, string | undefined>> = {},
  opts: { port?: number } = {},
): Promise<WeatherEnv & { fake: FakeWeather | null }> {
  if (given.WEATHER_FORECAST_URL && given.WEATHER_ARCHIVE_URL)
    return { WEATHER_FORECAST_URL: given.WEATHER_FORECAST_URL, WEATHER_ARCHIVE_URL: given.WEATHER_ARCHIVE_URL, fake: null };
  shared ??= startFakeWeather({ port: opts.port ?? 0, quiet: true })
    .catch(() => startFakeWeather({ port: 0, quiet: true }))
    .then((f) => {
      f.unref();
      return f;
    });
  const fake = await shared;
  return { WEATHER_FORECAST_URL: fake.forecastUrl, WEATHER_ARCHIVE_URL: fake.archiveUrl, fake };
}

// `npx tsx scripts/fakes/weather.ts [port]` for `npm run dev`.
if (process.argv[1] && import.meta.url === new URL(`file://${process.argv[1]}`).href) {
  const fake = await startFakeWeather({ port: Number(process.argv[2] ?? 8642) });
  console.log(`WEATHER_FORECAST_URL=${fake.forecastUrl} WEATHER_ARCHIVE_URL=${fake.archiveUrl}`);
}
