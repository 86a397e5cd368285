import type { Session } from './api';
import { uniqueEmail } from './api';
import { LOAD_INPUT, TRIP_INPUT } from './crew';
import { TEST_PRICES } from './prices';

/**
 * Every API route of the app, with the status each kind of caller must get. The authorization
 * matrix test (tests/integration/authz-matrix.test.ts) runs each row for each actor, and fails
 * when a route file under src/pages/api has a method that is not listed here: a new route is
 * added to this table in the same change that adds the route.
 */

/** Who calls: nobody signed in; the fixture crew's owner, editor and viewer; a camper in another crew; an installer with a grant on the fixture rig; one without. */
export const ACTORS = ['anonymous', 'owner', 'editor', 'viewer', 'outsider', 'installer', 'stranger'] as const;
export type Actor = (typeof ACTORS)[number];

/** The people of the matrix, signed in once. */
export interface Cast {
  owner: Session;
  editor: Session;
  viewer: Session;
  outsider: Session;
  installer: Session;
  stranger: Session;
  crewId: string;
  /** A member (editor) whose role rows can change without affecting the actors. */
  spare: Session;
}

/** The rows a request targets, all in the owner's crew: a rig with a load, a trip with a saved forecast, an open invitation, the installer's grant. */
export interface World {
  cast: Cast;
  crewId: string;
  rig: { id: string; version: number };
  load: { id: string; version: number };
  trip: { id: string; version: number };
  forecast: { id: string };
  invitation: { id: string; version: number; token: string };
  grant: { id: string };
  /** The granted installer's proposals on the forecast: one sent to the crew, one still a draft. */
  proposal: { id: string; version: number };
  draft: { id: string; version: number };
  /** A monitor log uploaded on the rig, and a check-in on the trip. */
  monitorLog: { id: string; version: number };
  checkIn: { id: string; version: number };
  /** Present when the route asked for `needs: ['member']`: a member only this request touches. */
  member?: { userId: string };
  /** The current version of a crew or member row, read at request time. */
  crewVersion(): Promise<number>;
  memberVersion(userId: string): Promise<number>;
}

export type Expect = Record<Actor, number>;

export interface RouteCase {
  method: 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';
  /** The route as its file names it under src/pages: `/api/rigs/[id]/loads`. */
  route: string;
  url: (w: World) => string;
  /** A valid JSON body, so that an allowed caller gets the success status. */
  body?: (w: World) => unknown | Promise<unknown>;
  /** A non-JSON body (CSV). */
  raw?: { contentType: string; body: string };
  expect: Expect;
  /** The request changes or removes what it targets: each actor gets a world of its own. */
  fresh?: boolean;
  needs?: 'member'[];
}

const all = (status: number): Expect => ({ anonymous: status, owner: status, editor: status, viewer: status, outsider: status, installer: status, stranger: status });
const signedIn = (status: number): Expect => ({ ...all(status), anonymous: 401 });

/** Reading a rig and what hangs off it: the crew and a granted installer; everyone else never learns it exists. */
const RIG_READ: Expect = { anonymous: 401, owner: 200, editor: 200, viewer: 200, outsider: 404, installer: 200, stranger: 404 };
/** Changing a rig, its loads, trips or forecasts: owners and editors. */
const RIG_WRITE = (ok: number): Expect => ({ anonymous: 401, owner: ok, editor: ok, viewer: 403, outsider: 404, installer: 403, stranger: 404 });
/** What only the rig's crew sees (activity, the installer list). */
const RIG_CREW_READ: Expect = { ...RIG_READ, installer: 403 };
/** Deciding who sees the rig (installer grants): owners. */
const RIG_MANAGE = (ok: number): Expect => ({ anonymous: 401, owner: ok, editor: 403, viewer: 403, outsider: 404, installer: 403, stranger: 404 });
/** Reading a crew: its members. Installers are never members. */
const CREW_READ: Expect = { anonymous: 401, owner: 200, editor: 200, viewer: 200, outsider: 404, installer: 404, stranger: 404 };
/** Members, invitations, the crew's name: owners. */
const CREW_MANAGE = (ok: number): Expect => ({ anonymous: 401, owner: ok, editor: 403, viewer: 403, outsider: 404, installer: 404, stranger: 404 });

const PLAN = { bank: { chemistry: 'lifepo4', capacityAh: 200 }, stops: TRIP_INPUT('x').stops };

/** Sweeping and proposing on a rig's saved forecasts: an installer with a grant; the crew reads proposals but does not write them. */
const INSTALLER_WORK = (ok: number): Expect => ({ anonymous: 401, owner: 403, editor: 403, viewer: 403, outsider: 404, installer: ok, stranger: 404 });
/** A draft proposal: its installer only; nobody else learns it exists. */
const DRAFT = (ok: number): Expect => ({ ...signedIn(404), installer: ok });
/** Accepting or declining a sent proposal: the crew's owners. */
const DECIDE = (ok: number): Expect => ({ anonymous: 401, owner: ok, editor: 403, viewer: 403, outsider: 404, installer: 403, stranger: 404 });
/** An installer account's own price list. */
const INSTALLER_ACCOUNT = (ok: number): Expect => ({ ...signedIn(403), installer: ok, stranger: ok });


/** A two-reading monitor log in our generic layout, as a multipart upload (with the confirmed mapping when saving). */
export function monitorLogUpload(withMapping: boolean): { contentType: string; body: string } {
  const boundary = 'sunreckon-matrix-boundary';
  const csv = 'Timestamp,Voltage (V),Current (A),SOC (%)\r\n2027-10-20 22:00:00,13.2,-1.5,80\r\n2027-10-20 22:10:00,13.2,-1.4,79.9\r\n';
  const mapping = { delimiter: ',', headerLine: 1, timeZone: 'America/Phoenix', time: { column: 0, format: 'iso' }, voltage: { column: 1, unit: 'V' }, current: { column: 2, unit: 'A', sign: 'charge-positive' }, soc: { column: 3, unit: '%' } };
  const parts = [
    `--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="night.csv"\r\nContent-Type: text/csv\r\n\r\n${csv}\r\n`,
    `--${boundary}\r\nContent-Disposition: form-data; name="timeZone"\r\n\r\nAmerica/Phoenix\r\n`,
    ...(withMapping ? [`--${boundary}\r\nContent-Disposition: form-data; name="mapping"\r\n\r\n${JSON.stringify(mapping)}\r\n`] : []),
    `--${boundary}--\r\n`,
  ];
  return { contentType: `multipart/form-data; boundary=${boundary}`, body: parts.join('') };
}

/** A check-in inside the fixture trip (Mesa camp, America/Phoenix, 20–22 Oct 2027), with a new id each time. */
export const CHECK_IN_INPUT = () => ({ id: crypto.randomUUID(), at: '2027-10-21T08:00-07:00', socPct: 70 });

export const ROUTES: RouteCase[] = [
  // Public
  { method: 'GET', route: '/api/health', url: () => '/api/health', expect: all(200) },
  { method: 'GET', route: '/api/auth/[...all]', url: () => '/api/auth/get-session', expect: all(200) },
  { method: 'POST', route: '/api/forecasts/preview', url: () => '/api/forecasts/preview', body: () => PLAN, expect: all(200) },
  { method: 'GET', route: '/api/places', url: () => '/api/places?q=Flagstaff', expect: all(200) },
  { method: 'GET', route: '/api/timezone', url: () => '/api/timezone?lat=35.2&lon=-111.6', expect: all(200) },

  // The signed-in user's own things
  { method: 'POST', route: '/api/quick-plan/keep', url: () => '/api/quick-plan/keep', body: () => PLAN, expect: { ...signedIn(201), installer: 403, stranger: 403 } },
  { method: 'PATCH', route: '/api/settings', url: () => '/api/settings', body: () => ({ units: 'metric' }), expect: signedIn(200) },
  { method: 'GET', route: '/api/crews', url: () => '/api/crews', expect: signedIn(200) },
  { method: 'POST', route: '/api/crews', url: () => '/api/crews', body: () => ({ name: 'Second household' }), expect: { ...signedIn(201), installer: 403, stranger: 403 } },
  { method: 'GET', route: '/api/installer/rigs', url: () => '/api/installer/rigs', expect: { ...signedIn(403), installer: 200, stranger: 200 } },
  // A link addressed to someone else's e-mail: refused for every account.
  { method: 'POST', route: '/api/invitations/accept', url: () => '/api/invitations/accept', body: (w) => ({ token: w.invitation.token }), expect: signedIn(403) },

  // Crews
  { method: 'PUT', route: '/api/crews/active', url: () => '/api/crews/active', body: (w) => ({ crewId: w.crewId }), expect: CREW_READ },
  { method: 'GET', route: '/api/crews/[id]', url: (w) => `/api/crews/${w.crewId}`, expect: CREW_READ },
  { method: 'PATCH', route: '/api/crews/[id]', url: (w) => `/api/crews/${w.crewId}`, body: async (w) => ({ name: 'Reyes-Okafor', version: await w.crewVersion() }), expect: CREW_MANAGE(200) },
  { method: 'GET', route: '/api/crews/[id]/invitations', url: (w) => `/api/crews/${w.crewId}/invitations`, expect: CREW_MANAGE(200) },
  { method: 'POST', route: '/api/crews/[id]/invitations', url: (w) => `/api/crews/${w.crewId}/invitations`, body: () => ({ email: uniqueEmail('matrix'), role: 'viewer' }), expect: CREW_MANAGE(201) },
  {
    method: 'PATCH',
    route: '/api/crews/[id]/members/[userId]',
    url: (w) => `/api/crews/${w.crewId}/members/${w.cast.spare.userId}`,
    body: async (w) => ({ role: 'editor', version: await w.memberVersion(w.cast.spare.userId) }),
    expect: CREW_MANAGE(200),
  },
  {
    method: 'DELETE',
    route: '/api/crews/[id]/members/[userId]',
    url: (w) => `/api/crews/${w.crewId}/members/${w.member!.userId}?version=1`,
    expect: CREW_MANAGE(204),
    fresh: true,
    needs: ['member'],
  },
  { method: 'POST', route: '/api/invitations/[id]/resend', url: (w) => `/api/invitations/${w.invitation.id}/resend`, body: (w) => ({ version: w.invitation.version }), expect: CREW_MANAGE(200), fresh: true },
  { method: 'DELETE', route: '/api/invitations/[id]', url: (w) => `/api/invitations/${w.invitation.id}?version=${w.invitation.version}`, expect: CREW_MANAGE(204), fresh: true },

  // Rigs and their loads
  { method: 'GET', route: '/api/rigs', url: () => '/api/rigs', expect: signedIn(200) },
  {
    method: 'POST',
    route: '/api/rigs',
    url: () => '/api/rigs',
    body: (w) => ({ name: 'Matrix rig', bank: { chemistry: 'agm', capacityAh: 100 }, crewId: w.crewId }),
    expect: { anonymous: 401, owner: 201, editor: 201, viewer: 403, outsider: 404, installer: 404, stranger: 404 },
  },
  { method: 'GET', route: '/api/rigs/[id]', url: (w) => `/api/rigs/${w.rig.id}`, expect: RIG_READ },
  { method: 'PATCH', route: '/api/rigs/[id]', url: (w) => `/api/rigs/${w.rig.id}`, body: (w) => ({ name: 'Renamed van', version: w.rig.version }), expect: RIG_WRITE(200), fresh: true },
  // Deleting a rig or a trip takes its saved forecasts and check-ins with it: crew owners only (restorable for 30 days).
  { method: 'DELETE', route: '/api/rigs/[id]', url: (w) => `/api/rigs/${w.rig.id}?version=${w.rig.version}`, expect: RIG_MANAGE(204), fresh: true },
  { method: 'GET', route: '/api/rigs/[id]/deletion', url: (w) => `/api/rigs/${w.rig.id}/deletion`, expect: RIG_READ },
  { method: 'POST', route: '/api/rigs/[id]/restore', url: (w) => `/api/rigs/${w.rig.id}/restore`, expect: RIG_MANAGE(200), fresh: true },
  { method: 'GET', route: '/api/deleted', url: () => '/api/deleted', expect: signedIn(200) },
  { method: 'GET', route: '/api/rigs/[id]/loads', url: (w) => `/api/rigs/${w.rig.id}/loads`, expect: RIG_READ },
  { method: 'POST', route: '/api/rigs/[id]/loads', url: (w) => `/api/rigs/${w.rig.id}/loads`, body: () => LOAD_INPUT, expect: RIG_WRITE(201) },
  { method: 'POST', route: '/api/rigs/[id]/loads/import', url: (w) => `/api/rigs/${w.rig.id}/loads/import`, raw: { contentType: 'text/csv', body: 'name,watts\nWater pump,60\n' }, expect: RIG_WRITE(201) },
  { method: 'GET', route: '/api/rigs/[id]/loads.csv', url: (w) => `/api/rigs/${w.rig.id}/loads.csv`, expect: RIG_READ },
  { method: 'PATCH', route: '/api/loads/[id]', url: (w) => `/api/loads/${w.load.id}`, body: (w) => ({ watts: 50, version: w.load.version }), expect: RIG_WRITE(200), fresh: true },
  { method: 'DELETE', route: '/api/loads/[id]', url: (w) => `/api/loads/${w.load.id}?version=${w.load.version}`, expect: RIG_WRITE(204), fresh: true },
  { method: 'GET', route: '/api/rigs/[id]/activity', url: (w) => `/api/rigs/${w.rig.id}/activity`, expect: RIG_CREW_READ },
  { method: 'GET', route: '/api/rigs/[id]/grants', url: (w) => `/api/rigs/${w.rig.id}/grants`, expect: RIG_CREW_READ },
  // Granting the installer without a grant: each actor on a rig of its own, so the grant cannot leak into other rows.
  { method: 'POST', route: '/api/rigs/[id]/grants', url: (w) => `/api/rigs/${w.rig.id}/grants`, body: (w) => ({ email: w.cast.stranger.email }), expect: RIG_MANAGE(202), fresh: true },
  { method: 'DELETE', route: '/api/grants/[id]', url: (w) => `/api/grants/${w.grant.id}`, expect: RIG_MANAGE(204), fresh: true },

  // Trips and saved forecasts
  { method: 'GET', route: '/api/trips', url: () => '/api/trips', expect: signedIn(200) },
  { method: 'POST', route: '/api/trips', url: () => '/api/trips', body: (w) => TRIP_INPUT(w.rig.id), expect: RIG_WRITE(201) },
  { method: 'GET', route: '/api/trips/[id]', url: (w) => `/api/trips/${w.trip.id}`, expect: RIG_READ },
  { method: 'PATCH', route: '/api/trips/[id]', url: (w) => `/api/trips/${w.trip.id}`, body: (w) => ({ name: 'Renamed trip', version: w.trip.version }), expect: RIG_WRITE(200), fresh: true },
  { method: 'DELETE', route: '/api/trips/[id]', url: (w) => `/api/trips/${w.trip.id}?version=${w.trip.version}`, expect: RIG_MANAGE(204), fresh: true },
  { method: 'GET', route: '/api/trips/[id]/deletion', url: (w) => `/api/trips/${w.trip.id}/deletion`, expect: RIG_READ },
  { method: 'POST', route: '/api/trips/[id]/restore', url: (w) => `/api/trips/${w.trip.id}/restore`, expect: RIG_MANAGE(200), fresh: true },
  { method: 'GET', route: '/api/trips/[id]/forecasts', url: (w) => `/api/trips/${w.trip.id}/forecasts`, expect: RIG_READ },
  { method: 'POST', route: '/api/trips/[id]/forecasts', url: (w) => `/api/trips/${w.trip.id}/forecasts`, body: () => ({ name: 'Matrix run' }), expect: RIG_WRITE(201) },
  { method: 'GET', route: '/api/forecasts/[id]', url: (w) => `/api/forecasts/${w.forecast.id}`, expect: RIG_READ },
  { method: 'GET', route: '/api/forecasts/[id]/hourly.csv', url: (w) => `/api/forecasts/${w.forecast.id}/hourly.csv`, expect: RIG_READ },
  { method: 'DELETE', route: '/api/forecasts/[id]', url: (w) => `/api/forecasts/${w.forecast.id}`, expect: RIG_WRITE(204), fresh: true },

  // Monitor logs and check-ins
  { method: 'GET', route: '/api/rigs/[id]/monitor-logs', url: (w) => `/api/rigs/${w.rig.id}/monitor-logs`, expect: RIG_READ },
  { method: 'POST', route: '/api/rigs/[id]/monitor-logs', url: (w) => `/api/rigs/${w.rig.id}/monitor-logs?preview=1`, raw: monitorLogUpload(false), expect: RIG_WRITE(200) },
  { method: 'POST', route: '/api/rigs/[id]/monitor-logs', url: (w) => `/api/rigs/${w.rig.id}/monitor-logs`, raw: monitorLogUpload(true), expect: RIG_WRITE(201) },
  { method: 'GET', route: '/api/monitor-logs/[id]', url: (w) => `/api/monitor-logs/${w.monitorLog.id}`, expect: RIG_READ },
  { method: 'GET', route: '/api/monitor-logs/[id]/readings', url: (w) => `/api/monitor-logs/${w.monitorLog.id}/readings?limit=5`, expect: RIG_READ },
  { method: 'GET', route: '/api/monitor-logs/[id]/original', url: (w) => `/api/monitor-logs/${w.monitorLog.id}/original`, expect: RIG_READ },
  { method: 'DELETE', route: '/api/monitor-logs/[id]', url: (w) => `/api/monitor-logs/${w.monitorLog.id}?version=${w.monitorLog.version}`, expect: RIG_WRITE(204), fresh: true },
  { method: 'GET', route: '/api/trips/[id]/check-ins', url: (w) => `/api/trips/${w.trip.id}/check-ins`, expect: RIG_READ },
  { method: 'POST', route: '/api/trips/[id]/check-ins', url: (w) => `/api/trips/${w.trip.id}/check-ins`, body: () => CHECK_IN_INPUT(), expect: RIG_WRITE(201) },
  // Trip watch: anyone who sees the trip reads it; owners and editors turn it on or off; crew members follow it.
  { method: 'GET', route: '/api/trips/[id]/watch', url: (w) => `/api/trips/${w.trip.id}/watch`, expect: RIG_READ },
  { method: 'PUT', route: '/api/trips/[id]/watch', url: (w) => `/api/trips/${w.trip.id}/watch`, body: () => ({ enabled: true }), expect: RIG_WRITE(200) },
  { method: 'PUT', route: '/api/trips/[id]/watch/follow', url: (w) => `/api/trips/${w.trip.id}/watch/follow`, body: () => ({ following: true }), expect: { ...RIG_READ, installer: 403 } },
  // The dev tick (404 in production) needs no sign-in; a clock long before any trip's window runs nothing.
  { method: 'POST', route: '/api/dev/watch/tick', url: () => '/api/dev/watch/tick', body: () => ({ now: '2001-01-01T00:00:00Z' }), expect: all(200) },
  { method: 'GET', route: '/api/trips/[id]/weather', url: (w) => `/api/trips/${w.trip.id}/weather`, expect: RIG_READ },
  { method: 'DELETE', route: '/api/check-ins/[id]', url: (w) => `/api/check-ins/${w.checkIn.id}?version=${w.checkIn.version}`, expect: RIG_WRITE(204), fresh: true },

  // Installer proposals: sweeps, price lists, proposals and the crew's answer
  {
    method: 'POST',
    route: '/api/forecasts/[id]/sweep',
    url: (w) => `/api/forecasts/${w.forecast.id}/sweep`,
    body: () => ({ candidates: { banks: [{ chemistry: 'lifepo4', capacityAh: 300 }], panels: [{ watts: 200, mounting: 'flat' }] }, prices: TEST_PRICES }),
    expect: INSTALLER_WORK(200),
  },
  {
    method: 'POST',
    route: '/api/forecasts/[id]/after-plan',
    url: (w) => `/api/forecasts/${w.forecast.id}/after-plan`,
    body: () => ({ bank: { chemistry: 'lifepo4', capacityAh: 300, floorSocPct: 10 }, arrays: [], dcdcAmps: 0, shoreAmps: 0, generator: null }),
    expect: INSTALLER_WORK(200),
  },
  { method: 'GET', route: '/api/price-list', url: () => '/api/price-list', expect: INSTALLER_ACCOUNT(200) },
  // Each installer saves once in the matrix, so version 0 (a first save) is the current one.
  { method: 'PUT', route: '/api/price-list', url: () => '/api/price-list', body: () => ({ ...TEST_PRICES, version: 0 }), expect: INSTALLER_ACCOUNT(200) },
  { method: 'GET', route: '/api/proposals', url: () => '/api/proposals', expect: signedIn(200) },
  {
    method: 'POST',
    route: '/api/proposals',
    url: () => '/api/proposals',
    body: (w) => ({ forecastId: w.forecast.id, changes: { bank: { chemistry: 'lifepo4', capacityAh: 300 } }, prices: TEST_PRICES }),
    expect: INSTALLER_WORK(201),
  },
  { method: 'GET', route: '/api/proposals/[id]', url: (w) => `/api/proposals/${w.proposal.id}`, expect: RIG_READ },
  { method: 'PATCH', route: '/api/proposals/[id]', url: (w) => `/api/proposals/${w.draft.id}`, body: (w) => ({ notes: 'Mount the fuse by the bank.', version: w.draft.version }), expect: DRAFT(200), fresh: true },
  { method: 'DELETE', route: '/api/proposals/[id]', url: (w) => `/api/proposals/${w.draft.id}?version=${w.draft.version}`, expect: DRAFT(204), fresh: true },
  { method: 'POST', route: '/api/proposals/[id]/send', url: (w) => `/api/proposals/${w.draft.id}/send`, body: (w) => ({ version: w.draft.version }), expect: DRAFT(200), fresh: true },
  {
    method: 'POST',
    route: '/api/proposals/[id]/decision',
    url: (w) => `/api/proposals/${w.proposal.id}/decision`,
    body: (w) => ({ decision: 'accepted', comment: 'Go ahead.', name: 'Crew Owner', version: w.proposal.version }),
    expect: DECIDE(200),
    fresh: true,
  },
  // Development only (404 in production): the local fake's weather, for the /dev page's control.
  { method: 'GET', route: '/api/dev/weather', url: () => '/api/dev/weather', expect: signedIn(200) },
  { method: 'POST', route: '/api/dev/weather', url: () => '/api/dev/weather', body: () => ({ mode: 'normal' }), expect: signedIn(200) },
  { method: 'POST', route: '/api/dev/watch/due', url: () => '/api/dev/watch/due', body: () => ({}), expect: signedIn(200) },
];

/** Lists must show the fixture's rows to exactly these actors (and hide them from the rest). */
export const LISTS: { url: string; find: (body: unknown, w: World) => boolean; visibleTo: Actor[] }[] = [
  { url: '/api/rigs', find: (b, w) => (b as { id: string }[]).some((r) => r.id === w.rig.id), visibleTo: ['owner', 'editor', 'viewer', 'installer'] },
  { url: '/api/trips', find: (b, w) => (b as { id: string }[]).some((t) => t.id === w.trip.id), visibleTo: ['owner', 'editor', 'viewer', 'installer'] },
  { url: '/api/crews', find: (b, w) => (b as { id: string }[]).some((c) => c.id === w.crewId), visibleTo: ['owner', 'editor', 'viewer'] },
  { url: '/api/proposals', find: (b, w) => Array.isArray(b) && (b as { id: string }[]).some((p) => p.id === w.proposal.id), visibleTo: ['owner', 'editor', 'viewer', 'installer'] },
  { url: '/api/installer/rigs', find: (b, w) => Array.isArray(b) && (b as { rigId: string }[]).some((r) => r.rigId === w.rig.id), visibleTo: ['installer'] },
];

export { TEST_PRICES };
