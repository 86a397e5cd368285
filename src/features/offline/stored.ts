// What the phone really keeps of a trip for use without signal, in words. The service worker (public/sw.js,
// "warm") keeps, for the camper's current and coming trips (or the 3 most recent), the trip's page, its
// check-ins, its rig and loads, and only the *latest* saved forecast with its page; it answers with the
// pages it holds, which register.ts puts on <html data-offline-pages>. Pure, so it is unit-tested.

export interface StoredFacts {
  online: boolean;
  /** The pages the service worker holds (paths), or null before it has answered. */
  pages: string[] | null;
  /** This page is itself the copy kept on the phone (served without the server). */
  savedCopy: boolean;
  tripId: string;
  /** The trip's latest saved forecast, or null when it has none. */
  latest: { id: string; name: string } | null;
  /** How many saved forecasts the trip has. */
  forecastCount: number;
}

/** The sentence above a trip's check-ins saying what of this trip is on this phone. */
export function storedOnPhone(f: StoredFacts): string {
  if (!f.online) return 'No signal: check-ins are worked out on this phone and sent when the signal is back.';
  if (f.pages === null)
    return f.savedCopy ? 'This is the copy of the trip kept on this phone.' : 'Keeping this trip on this phone for use without signal…';
  const trip = `/trips/${encodeURIComponent(f.tripId)}`;
  if (!f.pages.includes(trip)) {
    return 'This trip is not kept on this phone: without signal the phone has your current and coming trips (or the three most recent).';
  }
  if (!f.latest) {
    return 'Kept on this phone for use without signal: this trip and its check-ins. It has no saved forecast yet — save one while you have signal to check in against it without signal.';
  }
  const others = f.forecastCount > 1 ? ' Older saved forecasts open only with signal.' : '';
  if (!f.pages.includes(`${trip}/forecasts/${encodeURIComponent(f.latest.id)}`)) {
    return `Kept on this phone for use without signal: this trip and its check-ins. Its latest saved forecast, “${f.latest.name}”, is not on this phone yet.${others}`;
  }
  return `Kept on this phone for use without signal: this trip, its check-ins and its latest saved forecast, “${f.latest.name}”.${others}`;
}

/** Why a check-in cannot be re-forecast on the phone right now (no forecast to start from). */
export function noBasisText(forecastCount: number): string {
  return forecastCount === 0
    ? 'This trip has no saved forecast yet, so a check-in is re-forecast when it reaches the server.'
    : 'The latest saved forecast of this trip is not on this phone, so a check-in made now is re-forecast when it reaches the server.';
}
