import { betterAuth } from 'better-auth';
import { APIError } from 'better-auth/api';
import { database, db } from './db';
import { PASSWORD_MAX, PASSWORD_MIN } from '../domain/accounts/accounts.schema';
import { env } from './env';
import { personName } from './auth-input';
import { createPersonalCrew } from './crews';
import { passwordResetMail } from './mail';
import { enqueueMail, kickOutbox } from './outbox';

const RESET_TOKEN_SECONDS = 60 * 60;

export const CLIENT_IP_HEADER = 'x-sunreckon-client-ip';

export const ACCOUNT_KINDS = ['camper', 'installer'] as const;
export type AccountKind = (typeof ACCOUNT_KINDS)[number];

/** better-auth over our Kysely instance: e-mail and password accounts with a camper/installer kind. */
export const auth = betterAuth({
  database: { db: database.authDb, type: database.kind },
  secret: env.authSecret,
  // Production names its one URL; elsewhere any loopback host and port is accepted (dev, demo, tests on free ports).
  baseURL: env.authUrl ?? { allowedHosts: ['localhost:*', '127.0.0.1:*', 'localhost', '127.0.0.1'], protocol: 'http', fallback: 'http://localhost:4321' },
  emailAndPassword: {
    enabled: true,
    minPasswordLength: PASSWORD_MIN,
    maxPasswordLength: PASSWORD_MAX,
    autoSignIn: true,
    // better-auth's own reset flow; the link goes to our /reset-password page and the e-mail through the outbox.
    resetPasswordTokenExpiresIn: RESET_TOKEN_SECONDS,
    revokeSessionsOnPasswordReset: true,
    sendResetPassword: async ({ user, url, token }) => {
      const link = `${new URL(url).origin}/reset-password?token=${encodeURIComponent(token)}`;
      await enqueueMail(db, 'password-reset', user.email, passwordResetMail({ name: user.name, url: link, expiresInMinutes: RESET_TOKEN_SECONDS / 60 }));
      kickOutbox();
    },
  },
  // Reset tokens are stored hashed, like invitation tokens.
  verification: { storeIdentifier: { default: 'plain', overrides: { 'reset-password:': 'hashed' } } },
  user: {
    additionalFields: {
      kind: { type: 'string', required: false, defaultValue: 'camper', input: true },
      units: { type: 'string', required: false, defaultValue: 'metric', input: false },
      // The zone app-event times are shown in (Settings, or the browser's own, sent once); null until then.
      timeZone: { type: 'string', required: false, input: false },
    },
  },
  session: { expiresIn: 60 * 60 * 24 * 30, updateAge: 60 * 60 * 24 },
  advanced: {
    // The auth route copies Astro's socket address into this header (any client-sent value is replaced).
    ipAddress: { ipAddressHeaders: [CLIENT_IP_HEADER] },
    useSecureCookies: env.isProduction,
    defaultCookieAttributes: { httpOnly: true, sameSite: 'lax', secure: env.isProduction },
  },
  rateLimit: {
    enabled: env.AUTH_RATE_LIMIT > 0,
    window: 60,
    max: Math.max(env.AUTH_RATE_LIMIT * 10, 100),
    // In memory for one process; in the shared database when several instances run on PostgreSQL.
    storage: database.kind === 'postgres' ? 'database' : 'memory',
    customRules: {
      '/sign-in/email': { window: 60, max: env.AUTH_RATE_LIMIT },
      '/sign-up/email': { window: 60, max: env.AUTH_RATE_LIMIT },
      '/change-password': { window: 60, max: env.AUTH_RATE_LIMIT },
      '/request-password-reset': { window: 60, max: Math.max(1, Math.floor(env.AUTH_RATE_LIMIT / 2)) },
    },
  },
  databaseHooks: {
    user: {
      create: {
        before: async (user) => {
          const kind = (user as { kind?: unknown }).kind ?? 'camper';
          if (!ACCOUNT_KINDS.includes(kind as AccountKind)) {
            throw new APIError('BAD_REQUEST', { message: 'kind: choose "camper" or "installer".' });
          }
          const name = personName.safeParse(user.name);
          if (!name.success) throw new APIError('BAD_REQUEST', { message: `name: ${name.error.issues[0]!.message}` });
          return { data: { ...user, name: name.data, kind } };
        },
        after: async (user) => {
          if ((user as { kind?: string }).kind !== 'installer') await createPersonalCrew(db, user.id, user.name);
        },
      },
      // Every later write of a user row: the kind stays what sign-up made it, a name follows the one rule.
      update: {
        before: async (user) => {
          const { kind: _kind, ...rest } = user as typeof user & { kind?: unknown };
          if (rest.name !== undefined) {
            const name = personName.safeParse(rest.name);
            if (!name.success) throw new APIError('BAD_REQUEST', { message: `name: ${name.error.issues[0]!.message}` });
            rest.name = name.data;
          }
          return { data: rest };
        },
      },
    },
  },
});

export type AuthSession = typeof auth.$Infer.Session;
