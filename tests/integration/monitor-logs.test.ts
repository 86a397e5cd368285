import { isPostgres, openTestDb, type TestDb } from '../helpers/test-db';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { api, baseUrl, signUp, type Session } from '../helpers/api';
import { createRig, dbAll, dbGet } from '../helpers/fixtures';
import { toCsv, truth } from '../fixtures/monitor/synthetic';
import { at } from '../../src/lib/invariant';

// Monitor-log uploads against the built server and a real SQLite file: preview, save, what the log
// tells, the size limit, wrong types, empty and broken files, and a fault inside the transaction.

const TZ = 'America/Denver';
let owner: Session;
let rig: { id: string };

beforeAll(async () => {
  owner = await signUp({ name: 'Log Owner' });
  rig = await createRig(owner, { name: 'Van with a shunt' });
});

interface Send {
  text?: string;
  bytes?: Uint8Array;
  fileName?: string;
  mapping?: unknown;
  preview?: boolean;
  timeZone?: string;
}

function upload(o: Send, rigId = rig.id, session = owner): Promise<Response> {
  const form = new FormData();
  const data = o.bytes ?? new TextEncoder().encode(o.text ?? '');
  form.set('file', new Blob([Buffer.from(data)], { type: 'text/csv' }), o.fileName ?? 'trip-log.csv');
  form.set('timeZone', o.timeZone ?? TZ);
  if (o.mapping !== undefined) form.set('mapping', typeof o.mapping === 'string' ? o.mapping : JSON.stringify(o.mapping));
  return api(`/api/rigs/${rigId}/monitor-logs${o.preview ? '?preview=1' : ''}`, { method: 'POST', session, body: form });
}

const logCount = () => dbGet<{ n: number }>('select count(*) as n from monitor_logs where rig_id = ?', rig.id)!.n;
const sampleCount = () => dbGet<{ n: number }>('select count(*) as n from monitor_samples s join monitor_logs l on l.id = s.log_id where l.rig_id = ?', rig.id)!.n;

const rows = truth({ days: 3, nightDrawA: 1.5 });
const firstRow = at(rows, 0, 'synthetic reading');
const semicolonLog = toCsv(rows, { delimiter: ';', decimal: ',', time: 'dmy', preamble: ['Battery monitor export', 'Serial;0042'] });

describe('preview, then save with the confirmed mapping', () => {
  let mapping: Record<string, unknown>;
  let logId: string;

  it('detects the layout and shows the first readings without saving anything', async () => {
    const before = logCount();
    const res = await upload({ text: semicolonLog, preview: true });
    expect(res.status).toBe(200);
    const p = await res.json();
    expect(p.mapping).toMatchObject({ delimiter: ';', decimal: ',', headerLine: 3, time: { format: 'dmy', column: 0 }, current: { sign: 'charge-positive' }, timeZone: TZ });
    expect(p.errorCount).toBe(0);
    expect(p.count).toBe(rows.length);
    expect(p.sample[0]).toMatchObject({ line: 4, t: firstRow.t, amps: firstRow.amps });
    expect(p.headers[0]).toBe('Timestamp');
    expect(logCount()).toBe(before);
    mapping = p.mapping;
  });

  it('saves the original file and every reading', async () => {
    const res = await upload({ text: semicolonLog, mapping });
    expect(res.status).toBe(201);
    const log = await res.json();
    logId = log.id;
    expect(log).toMatchObject({ rigId: rig.id, name: 'trip-log.csv', sampleCount: rows.length, timeZone: TZ, version: 1, has: { volts: true, amps: true, soc: true, temperature: true } });
    expect(log.startedAt).toBe(new Date(firstRow.t).toISOString());
    const stored = dbGet<{ original: Buffer; original_bytes: number }>('select original, original_bytes from monitor_logs where id = ?', logId)!;
    expect(Buffer.from(stored.original).toString('utf8')).toBe(semicolonLog);
    const n = dbGet<{ n: number }>('select count(*) as n from monitor_samples where log_id = ?', logId)!.n;
    expect(n).toBe(rows.length);
    const first = dbGet<{ t: number; amps: number; volts: number }>('select t, amps, volts from monitor_samples where log_id = ? order by t limit 1', logId)!;
    expect(first).toEqual({ t: firstRow.t, amps: firstRow.amps, volts: firstRow.volts });
  });

  it('lists it, tells the night-time baseline and daily Ah, and gives back the file', async () => {
    const list = await (await api(`/api/rigs/${rig.id}/monitor-logs`, { session: owner })).json();
    expect(list.map((l: { id: string }) => l.id)).toContain(logId);
    const res = await api(`/api/monitor-logs/${logId}`, { session: owner });
    expect(res.status).toBe(200);
    const d = await res.json();
    expect(d.baseline).toMatchObject({ ok: true, baseline: { drawA: 1.5, fromHour: 1, toHour: 5 } });
    expect(d.days.map((x: { date: string }) => x.date)).toEqual(['2027-10-21', '2027-10-22', '2027-10-23']);
    expect(d.series.length).toBeGreaterThan(100);
    expect(d.series.length).toBeLessThan(rows.length);
    const orig = await api(`/api/monitor-logs/${logId}/original`, { session: owner });
    expect(orig.status).toBe(200);
    expect(orig.headers.get('content-disposition')).toContain('trip-log.csv');
    expect(await orig.text()).toBe(semicolonLog);
  });

  it('deletes with the version read: a stale one is 409 with the log, then the readings go too', async () => {
    const stale = await api(`/api/monitor-logs/${logId}?version=2`, { method: 'DELETE', session: owner });
    expect(stale.status).toBe(409);
    expect((await stale.json()).current).toMatchObject({ id: logId, version: 1 });
    const noVersion = await api(`/api/monitor-logs/${logId}`, { method: 'DELETE', session: owner });
    expect(noVersion.status).toBe(400);
    const ok = await api(`/api/monitor-logs/${logId}?version=1`, { method: 'DELETE', session: owner });
    expect(ok.status).toBe(204);
    expect(dbGet<{ n: number }>('select count(*) as n from monitor_samples where log_id = ?', logId)!.n).toBe(0);
    expect((await api(`/api/monitor-logs/${logId}`, { session: owner })).status).toBe(404);
  });
});

const MAPPING = { delimiter: ',', headerLine: 1, timeZone: TZ, time: { column: 0, format: 'iso' }, voltage: { column: 1, unit: 'V' }, current: { column: 2, unit: 'A', sign: 'charge-positive' }, soc: { column: 3, unit: '%' } };
const HEAD = 'Timestamp,Voltage (V),Current (A),SOC (%)';

describe('refused uploads save nothing', () => {
  it('a file over 10 MB is 413, even streamed without a Content-Length', async () => {
    const line = '2027-10-21 00:00:00,13.200,-1.500,80.0\n';
    const big = HEAD + '\n' + line.repeat(Math.ceil((10 * 1024 * 1024) / line.length) + 10);
    const before = logCount();
    const res = await upload({ text: big, mapping: MAPPING });
    expect(res.status).toBe(413);
    expect((await res.json()).error.code).toBe('payload_too_large');
    // The same body as a stream, so the server cannot trust a declared length.
    const form = new FormData();
    form.set('file', new Blob([big]), 'big.csv');
    form.set('mapping', JSON.stringify(MAPPING));
    const encoded = new Response(form);
    const streamed = await fetch(`${baseUrl()}/api/rigs/${rig.id}/monitor-logs`, {
      method: 'POST',
      headers: { cookie: owner.cookie, origin: baseUrl(), 'content-type': encoded.headers.get('content-type')! },
      body: encoded.body,
      duplex: 'half',
    } as RequestInit);
    expect(streamed.status).toBe(413);
    expect(logCount()).toBe(before);
  });

  it.each([
    ['a workbook', new Uint8Array([0x50, 0x4b, 0x03, 0x04, 0x14, 0x00, 0x06, 0x00]), 'log.xlsx', 415],
    ['a workbook named .csv', new Uint8Array([0x50, 0x4b, 0x03, 0x04, 0x14, 0x00, 0x06, 0x00]), 'log.csv', 415],
    ['an image', new Uint8Array([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]), 'photo.png', 415],
    ['a PDF named .txt', new TextEncoder().encode('%PDF-1.7\n'), 'log.txt', 415],
    ['an empty file', new Uint8Array(), 'log.csv', 400],
  ])('%s is refused, naming the file field', async (_what, bytes, fileName, status) => {
    const before = logCount();
    const res = await upload({ bytes, fileName, mapping: MAPPING });
    expect(res.status).toBe(status);
    const body = await res.json();
    expect(body.issues[0].path).toBe('file');
    expect(logCount()).toBe(before);
  });

  it('a body that is not a file upload is 415', async () => {
    const res = await api(`/api/rigs/${rig.id}/monitor-logs`, { method: 'POST', session: owner, json: { csv: HEAD } });
    expect(res.status).toBe(415);
    const none = await api(`/api/rigs/${rig.id}/monitor-logs`, { method: 'POST', session: owner, body: new FormData() });
    expect(none.status).toBe(400);
    expect((await none.json()).issues[0].path).toBe('file');
  });

  it('a header without readings names the line', async () => {
    const res = await upload({ text: HEAD + '\n', mapping: MAPPING });
    expect(res.status).toBe(400);
    expect((await res.json()).issues).toEqual([{ path: 'line 1', message: 'The file has a header but no readings under it.' }]);
  });

  it('a file without a time column: the preview says so and a mapping without time is refused', async () => {
    const text = 'Voltage (V),Current (A)\n13.2,-1.5\n13.1,-1.4\n';
    const p = await (await upload({ text, preview: true })).json();
    expect(p.mapping.time).toBeNull();
    expect(p.errors[0].message).toMatch(/no time column/);
    const { time: _t, ...noTime } = MAPPING;
    const res = await upload({ text, mapping: { ...noTime, voltage: { column: 0, unit: 'V' }, current: null, soc: null } });
    expect(res.status).toBe(400);
    expect((await res.json()).issues.map((i: { path: string }) => i.path)).toEqual(['mapping.time']);
    const wrongColumn = await upload({ text, mapping: { ...MAPPING, time: { column: 0, format: 'iso' }, voltage: { column: 1, unit: 'V' }, current: null, soc: null } });
    expect(wrongColumn.status).toBe(400);
    expect((await wrongColumn.json()).issues[0]).toEqual({ path: 'line 2.Voltage (V)', message: '"13.2" is not a time like 2027-10-21 14:05:00' });
  });

  it('absurd values and broken lines refuse the whole file, each by line and column', async () => {
    const before = [logCount(), sampleCount()];
    const good = toCsv(truth({ days: 1 }), { temperature: false });
    const lines = good.trimEnd().split('\n');
    lines[5] = at(lines, 5, 'log line').replace(/,13\.\d+,/, ',900,');
    lines[9] = at(lines, 9, 'log line').replace(/,[\d.]+$/, ',250');
    lines[12] = '2027-10-21 01:00:00,13.1';
    const res = await upload({ text: lines.join('\n') + '\n', mapping: MAPPING });
    expect(res.status).toBe(400);
    const body = await res.json();
    expect(body.error.message).toMatch(/^Nothing was saved: 3 problems on 3 lines need fixing\./);
    expect(body.issues).toEqual([
      { path: 'line 6.Voltage (V)', message: '900 V is not possible on a 12.8 V bank' },
      { path: 'line 10.SOC (%)', message: 'state of charge 250 % is outside 0–100 % — if this column is in per mille, choose ‰' },
      { path: 'line 13', message: expect.stringMatching(/^has 2 cells but the header names 4 columns/) },
    ]);
    expect([logCount(), sampleCount()]).toEqual(before);
  });

  it('a mapping that is not JSON, or not a mapping, names the field', async () => {
    const bad = await upload({ text: HEAD + '\n2027-10-21 00:00:00,13.2,-1.5,80\n', mapping: '{nope' });
    expect(bad.status).toBe(400);
    expect((await bad.json()).issues[0].path).toBe('mapping');
    const wrong = await upload({ text: HEAD + '\n2027-10-21 00:00:00,13.2,-1.5,80\n', mapping: { ...MAPPING, delimiter: 'x', timeZone: 'Mars/Olympus' } });
    expect(wrong.status).toBe(400);
    expect((await wrong.json()).issues.map((i: { path: string }) => i.path).sort()).toEqual(['mapping.delimiter', 'mapping.timeZone']);
  });
});

describe('one transaction', () => {
  // A fault injected into the real database: inserting one particular reading fails. The log row
  // and the readings inserted before it must all be rolled back.
  const six = truth({ days: 6 });
  const failAt = at(six, 1500, 'synthetic reading').t;
  let rw: TestDb;
  const onPostgres = isPostgres(inject('dbPath'));
  const dropTrigger = onPostgres ? 'drop trigger if exists fail_one_reading on monitor_samples' : 'drop trigger if exists fail_one_reading';
  beforeAll(() => {
    rw = openTestDb({ write: true });
    rw.exec(
      onPostgres
        ? `create function fail_one_reading() returns trigger language plpgsql as $$ begin if new.t = ${failAt} then raise exception 'injected fault'; end if; return new; end $$;
           create trigger fail_one_reading before insert on monitor_samples for each row execute function fail_one_reading();`
        : `create trigger fail_one_reading before insert on monitor_samples when new.t = ${failAt} begin select raise(abort, 'injected fault'); end;`,
    );
  });
  afterAll(() => {
    rw.exec(dropTrigger);
    rw.close();
  });

  it('a failure on the 1501st reading leaves neither the log nor any reading behind', async () => {
    const text = toCsv(six);
    const before = [logCount(), sampleCount()] as const;
    const res = await upload({ text, mapping: { ...MAPPING, temperature: { column: 4, unit: 'C' } } });
    expect(res.status).toBe(500);
    expect((await res.json()).error.message).toMatch(/Your data was not changed/);
    expect([logCount(), sampleCount()]).toEqual(before);
    rw.exec(dropTrigger);
    const again = await upload({ text, mapping: { ...MAPPING, temperature: { column: 4, unit: 'C' } } });
    expect(again.status).toBe(201);
    expect(logCount()).toBe(before[0] + 1);
    expect(dbAll('select 1 from monitor_samples where log_id = ?', (await again.json()).id)).toHaveLength(six.length);
  });
});

describe('what the log tells, next to a saved forecast of the same dates', () => {
  it('lists the rig’s saved forecasts the log overlaps', async () => {
    const trip = await (
      await api('/api/trips', {
        method: 'POST',
        session: owner,
        json: { rigId: rig.id, name: 'Log trip', stops: [{ name: 'Mesa camp', lat: 36.1, lon: -111.5, timeZone: TZ, arrive: '2027-10-21', nights: 2 }] },
      })
    ).json();
    const f = await (await api(`/api/trips/${trip.id}/forecasts`, { method: 'POST', session: owner, json: { name: 'Before the trip' } })).json();
    const saved = await (await upload({ text: toCsv(truth({ days: 3 })), mapping: { ...MAPPING, temperature: { column: 4, unit: 'C' } } })).json();
    const d = await (await api(`/api/monitor-logs/${saved.id}`, { session: owner })).json();
    expect(d.forecasts[0]).toMatchObject({ id: f.id, name: 'Before the trip', tripName: 'Log trip' });
    // 21 Oct 15:00 to 23 Oct 11:00 local, all inside the log.
    expect(d.forecasts[0].overlapHours).toBe(44);
  });
});
