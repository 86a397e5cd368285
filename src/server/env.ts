import { z } from 'zod';
import { DEFAULT_DATABASE_PATH } from '../../db/client';

/**
 * The one place that reads the environment. Plain process.env (not astro:env) because the
 * migrate, seed and demo scripts run outside Astro and must read the same settings.
 */
const schema = z.object({
  NODE_ENV: z.string().default('development'),
  DATABASE_PATH: z.string().min(1).default(DEFAULT_DATABASE_PATH),
  /** A postgres:// URL puts the data in PostgreSQL (several instances over one database); unset: SQLite at DATABASE_PATH. */
  DATABASE_URL: z
    .string()
    .regex(/^postgres(ql)?:\/\//, 'must be a postgres:// URL (leave it unset for the embedded SQLite file)')
    .optional()
    .or(z.literal('').transform(() => undefined)),
  /** Connections per instance in the PostgreSQL pool. */
  DATABASE_POOL_MAX: z.coerce.number().int().min(1).max(200).default(10),
  BETTER_AUTH_SECRET: z.string().min(32).optional(),
  BETTER_AUTH_URL: z.string().url().optional(),
  PREVIEW_RATE_LIMIT: z.coerce.number().int().min(0).default(30),
  AUTH_RATE_LIMIT: z.coerce.number().int().min(0).default(10),
  /** Crew invitations (new or resent) per crew per hour, and per invited address per hour; 0 turns a limit off. */
  INVITE_CREW_HOURLY: z.coerce.number().int().min(0).default(30),
  INVITE_ADDRESS_HOURLY: z.coerce.number().int().min(0).default(5),
  /** Rig shares with installers per owner per hour; 0 turns the limit off. */
  GRANT_HOURLY: z.coerce.number().int().min(0).default(30),
  /** Upgrade sweeps per user per minute; 0 turns the limit off. */
  SWEEP_RATE_LIMIT: z.coerce.number().int().min(0).default(6),
  SMTP_URL: z.string().optional(),
  MAIL_FROM: z.string().default('Sunreckon <no-reply@sunreckon.test>'),
  /** First retry delay of an unsent e-mail; doubles per attempt up to 15 minutes. */
  OUTBOX_RETRY_BASE_MS: z.coerce.number().int().min(50).default(30_000),
  /** Set to 1 behind one reverse proxy that appends the client to X-Forwarded-For; otherwise that header is never believed. */
  SUNRECKON_TRUST_PROXY: z.enum(['0', '1']).default('0'),
  SUNRECKON_ENV: z.enum(['production', 'development', 'test', 'demo']).optional(),
  /** The weather service's forecast and historical endpoints (the demo and the tests point them at the local fake). */
  WEATHER_FORECAST_URL: z.string().url().default('https://api.open-meteo.com/v1/forecast'),
  WEATHER_ARCHIVE_URL: z.string().url().default('https://archive-api.open-meteo.com/v1/archive'),
  /** How long one fill of a trip's weather waits for the service before using what it has, ms (at most 5 s). */
  WEATHER_TIMEOUT_MS: z.coerce.number().int().min(100).max(5000).default(5000),
  /** Trip watch: `off` stops the background re-runs (the API and the dev tick still answer). */
  WATCH: z.enum(['on', 'off'], { error: 'must be on or off' }).default('on'),
  /** Trip watch: minutes between two runs of one trip (default 6 hours). */
  WATCH_INTERVAL_MINUTES: z.coerce.number().int().min(1).max(10_080).default(360),
});

const parsed = schema.safeParse(process.env);
if (!parsed.success) {
  const fields = parsed.error.issues.map((i) => `${i.path.join('.')}: ${i.message}`).join('; ');
  throw new Error(`Invalid environment: ${fields}`);
}
const raw = parsed.data;

const DEV_SECRET = 'sunreckon-development-secret-change-me-0123456789';
const isProduction = (raw.SUNRECKON_ENV ?? raw.NODE_ENV) === 'production';

if (!raw.BETTER_AUTH_SECRET) {
  if (isProduction) throw new Error('BETTER_AUTH_SECRET must be set (32+ characters) in production.');
  console.warn('[sunreckon] BETTER_AUTH_SECRET is not set: using the development secret. Set it before real use.');
}
if (!raw.BETTER_AUTH_URL && isProduction) {
  console.warn('[sunreckon] BETTER_AUTH_URL is not set: sign-in only accepts requests from the host it is served on.');
}

export const env = {
  ...raw,
  isProduction,
  authSecret: raw.BETTER_AUTH_SECRET ?? DEV_SECRET,
  authUrl: raw.BETTER_AUTH_URL,
};
