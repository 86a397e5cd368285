import { useMemo, useSyncExternalStore } from 'react';
import { deviceZone, FALLBACK_ZONE, zoneClock, type ZoneClock } from '../../lib/clock';

const never = () => () => undefined;

/**
 * This browser's own zone, or null while rendering on the server and hydrating (React renders the
 * server's value first, then the browser's, so the two renders never differ).
 */
export function useDeviceZone(): string | null {
  return useSyncExternalStore(never, deviceZone, () => null);
}

/**
 * The clock an island shows app-event times with: the user's zone as the server knows it (a page
 * passes `userClock(Astro.locals.user)`). Before the user has a zone, the server render and
 * hydration use UTC and this browser's own zone follows right after, so no text differs between
 * the two renders.
 */
export function useUserZone(stored: ZoneClock | null | undefined): ZoneClock {
  const device = useDeviceZone();
  return useMemo(() => stored ?? zoneClock(device ?? FALLBACK_ZONE), [stored, device]);
}
