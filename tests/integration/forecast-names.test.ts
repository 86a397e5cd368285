// A forecast nobody names is named by when it was made in the local time of the trip's first stop, not UTC
// (#16 item 11).
import { beforeAll, describe, expect, it } from 'vitest';
import { demoPlan } from '../../src/engine';
import { api, signUp, type Session } from '../helpers/api';
import { openTestDb } from '../helpers/test-db';

/** "Fri 4 Dec, 14:41" in `zone`, worked out with Intl (not the app's formatter). */
function wallClock(iso: string, zone: string): string {
  const parts = Object.fromEntries(
    new Intl.DateTimeFormat('en-US', {
      timeZone: zone,
      weekday: 'short',
      day: 'numeric',
      month: 'short',
      hour: '2-digit',
      minute: '2-digit',
      hourCycle: 'h23',
    })
      .formatToParts(new Date(iso))
      .map((p) => [p.type, p.value]),
  );
  return `${parts.weekday} ${parts.day} ${parts.month}, ${parts.hour}:${parts.minute}`;
}

describe('names of saved forecasts', () => {
  let owner: Session;
  let tripId: string;

  beforeAll(async () => {
    owner = await signUp({ name: 'Namer' });
    const plan = demoPlan() as Record<string, any>;
    const rig = await (
      await api('/api/rigs', {
        method: 'POST',
        session: owner,
        json: { name: 'Van', bank: plan.bank, arrays: plan.arrays, chargers: plan.chargers, inverter: plan.inverter ?? null },
      })
    ).json();
    // The first stop is Juniper Mesa in America/Denver (UTC−7 in December, UTC−6 in summer).
    const trip = await (
      await api('/api/trips', {
        method: 'POST',
        session: owner,
        json: { rigId: rig.id, name: 'Loop', stops: plan.stops, drives: plan.drives },
      })
    ).json();
    tripId = trip.id;
  });

  it('names an unnamed run in the first stop’s local time, saying so in plain words', async () => {
    const res = await api(`/api/trips/${tripId}/forecasts`, { method: 'POST', session: owner });
    expect(res.status).toBe(201);
    const f = await res.json();
    expect(f.name).toBe(`Forecast of ${wallClock(f.createdAt, 'America/Denver')} (local time at Juniper Mesa)`);
    expect(f.name).not.toMatch(/UTC/);
    // The list says the same.
    const list = await (await api(`/api/trips/${tripId}/forecasts`, { session: owner })).json();
    expect(list.find((x: { id: string }) => x.id === f.id)?.name).toBe(f.name);
  });

  it('calls a forecast saved with the old UTC default name by the first stop’s local time, in the list and alone', async () => {
    const f = await (await api(`/api/trips/${tripId}/forecasts`, { method: 'POST', session: owner, json: { name: 'to be renamed below' } })).json();
    // As the server named forecasts before: "Forecast of 2026-12-12 15:08 UTC" (the UTC minute it was made).
    const db = openTestDb({ write: true });
    db.prepare('update forecasts set name = ?, created_at = ? where id = ?').run('Forecast of 2026-12-12 15:08 UTC', '2026-12-12T15:08:00.000Z', f.id);
    db.close();
    // 15:08 UTC on Sat 12 Dec 2026 is 08:08 in Denver (MST, UTC−7).
    const want = 'Forecast of Sat 12 Dec, 08:08 (local time at Juniper Mesa)';
    expect((await (await api(`/api/forecasts/${f.id}`, { session: owner })).json()).name).toBe(want);
    const list = await (await api(`/api/trips/${tripId}/forecasts`, { session: owner })).json();
    expect(list.find((x: { id: string }) => x.id === f.id)?.name).toBe(want);
  });

  it('keeps a name someone gives', async () => {
    const res = await api(`/api/trips/${tripId}/forecasts`, { method: 'POST', session: owner, json: { name: 'Before the new panel' } });
    expect((await res.json()).name).toBe('Before the new panel');
  });
});
