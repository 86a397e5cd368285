import { beforeAll, describe, expect, it } from 'vitest';
import { api, signUp, type Session } from '../helpers/api';
import { activeCrew, makeRig, member, RIG_INPUT, TRIP_INPUT } from '../helpers/crew';

// The trip page is drawn on the server with the trip, the saved forecasts and the check-ins in it.
// Each island render gets its own query cache there: one visitor's page must never show another's
// answers (a viewer must not be offered the editor because the owner opened the page first).

let owner: Session;
let viewer: Session;
let tripId: string;
let rigId: string;

async function page(s: Session, status = 200): Promise<string> {
  const res = await api(`/trips/${tripId}`, { session: s });
  expect(res.status).toBe(status);
  return res.text();
}

beforeAll(async () => {
  owner = await signUp({ name: 'Page owner' });
  const crew = await activeCrew(owner);
  viewer = await member(owner, crew.id, 'viewer', 'Page viewer');
  const rig = await makeRig(owner);
  rigId = rig.id;
  const res = await api('/api/trips', { method: 'POST', session: owner, json: TRIP_INPUT(rig.id) });
  expect(res.status).toBe(201);
  tripId = (await res.json()).id;
  const f = await api(`/api/trips/${tripId}/forecasts`, { method: 'POST', session: owner, json: { name: 'Server-drawn run' } });
  expect(f.status).toBe(201);
});

describe('the trip page as the server sends it', () => {
  it('holds the itinerary, the saved forecasts and the check-in form, with no loading lines', async () => {
    const html = await page(owner);
    expect(html).toContain('data-testid="trip-summary"');
    expect(html).toContain('Mesa camp');
    expect(html).toContain('Server-drawn run');
    expect(html).toContain('Check in at camp');
    expect(html).toContain('Edit the itinerary');
    expect(html).not.toMatch(/Loading the trip|Loading saved forecasts/);
  });

  it('shows each visitor their own access, whoever opened the page before', async () => {
    // The owner's render comes first and the viewer's straight after, on the same server process.
    expect(await page(owner)).toContain('Edit the itinerary');
    const seen = await page(viewer);
    expect(seen).toContain('Mesa camp');
    expect(seen).not.toContain('Edit the itinerary');
    expect(seen).toContain('You can view this trip');
    expect(seen).not.toContain('Check in at camp');
    expect(await page(owner)).toContain('Edit the itinerary');
  });

  it('names the trip’s rig to an installer it was granted to, who is in none of its crews, and offers no editor', async () => {
    const installer = await signUp({ kind: 'installer', name: 'Page installer' });
    const g = await api(`/api/rigs/${rigId}/grants`, { method: 'POST', session: owner, json: { email: installer.email } });
    expect(g.status).toBe(202);
    const html = await page(installer);
    expect(html).toContain('Mesa camp');
    expect(html).toContain(RIG_INPUT.name);
    expect(html).not.toContain('Edit the itinerary');
  });

  it('tells a stranger nothing about the trip', async () => {
    const stranger = await signUp({ name: 'Page stranger' });
    // A trip outside the visitor's crews is a real 404 page.
    const html = await page(stranger, 404);
    expect(html).not.toContain('Mesa camp');
    expect(html).not.toContain('Server-drawn run');
  });
});
