import { env } from './env';

/**
 * The origin that links in e-mails point to: BETTER_AUTH_URL's in production (one public name),
 * otherwise the origin the request came in on (dev, demo and tests run on loopback ports).
 */
export function appOrigin(requestUrl: URL): string {
  return env.authUrl ? new URL(env.authUrl).origin : requestUrl.origin;
}
