import { describe, expect, it } from 'vitest';
import { HttpError } from '../../src/server/errors';
import { decodeText, lineIssues, readCsvBody, readMultipart, wantsPreview } from '../../src/server/upload';

// Reading uploads for both imports (loads CSV and monitor logs): one decoder, one multipart reader.

const tooLarge = () => new HttpError('payload_too_large', 'too large');
const bytes = (...b: number[]) => new Uint8Array(b);

describe('decodeText', () => {
  it('reads UTF-8, and Windows-1252 when the bytes are not UTF-8 (a spreadsheet on Windows)', () => {
    expect(decodeText(new TextEncoder().encode('Señora,5\n'))).toBe('Señora,5\n');
    // "Señora" in Windows-1252: ñ is the single byte 0xF1, which is not valid UTF-8 on its own.
    expect(decodeText(bytes(0x53, 0x65, 0xf1, 0x6f, 0x72, 0x61))).toBe('Señora');
  });

  it('reads UTF-16 by its byte-order mark, drops a UTF-8 mark, and ends every line in \\n', () => {
    expect(decodeText(bytes(0xff, 0xfe, 0x61, 0x00, 0x0d, 0x00, 0x0a, 0x00, 0x62, 0x00))).toBe('a\nb');
    expect(decodeText(bytes(0xfe, 0xff, 0x00, 0x61, 0x00, 0x0d, 0x00, 0x62))).toBe('a\nb');
    expect(decodeText(bytes(0xef, 0xbb, 0xbf, 0x78, 0x0d, 0x0a, 0x79, 0x0d))).toBe('x\ny\n');
  });
});

describe('readCsvBody (the loads import)', () => {
  const post = (body: BodyInit, type: string) => new Request('http://localhost/x', { method: 'POST', body, headers: { 'content-type': type } });

  it('decodes a text/csv body with the one decoder, and takes JSON { csv } as it is', async () => {
    expect(await readCsvBody(post(bytes(0x53, 0x65, 0xf1, 0x6f, 0x72, 0x61), 'text/csv'), 1024, tooLarge)).toBe('Señora');
    expect(await readCsvBody(post(JSON.stringify({ csv: 'a,b\r\n' }), 'application/json'), 1024, tooLarge)).toBe('a,b\r\n');
  });

  it('refuses another content type (415) and a body over the limit (413)', async () => {
    await expect(readCsvBody(post('a', 'image/png'), 1024, tooLarge)).rejects.toMatchObject({ code: 'unsupported_media_type' });
    await expect(readCsvBody(post('x'.repeat(2000), 'text/csv'), 1024, tooLarge)).rejects.toMatchObject({ code: 'payload_too_large' });
  });
});

describe('readMultipart (the monitor-log upload)', () => {
  const rules = { maxFileBytes: 100, maxBodyBytes: 2000, tooLarge, sendAs: 'Send a form.', defaultName: 'log.csv' };

  it('returns the file’s bytes, its name and the text fields', async () => {
    const form = new FormData();
    form.set('file', new Blob(['t,v\n1,2\n']), 'shunt.csv');
    form.set('timeZone', 'America/Denver');
    const up = await readMultipart(new Request('http://localhost/x', { method: 'POST', body: form }), rules);
    expect(up.fileName).toBe('shunt.csv');
    expect(decodeText(up.bytes)).toBe('t,v\n1,2\n');
    expect(up.fields.get('timeZone')).toBe('America/Denver');
  });

  it('refuses a body that is not a form, a form without a file, and a file over the limit', async () => {
    await expect(readMultipart(new Request('http://localhost/x', { method: 'POST', body: 'x', headers: { 'content-type': 'text/csv' } }), rules)).rejects.toMatchObject({ code: 'unsupported_media_type', message: 'Send a form.' });
    const empty = new FormData();
    empty.set('name', 'x');
    await expect(readMultipart(new Request('http://localhost/x', { method: 'POST', body: empty }), rules)).rejects.toMatchObject({ issues: [{ path: 'file' }] });
    const big = new FormData();
    big.set('file', new Blob(['x'.repeat(500)]), 'big.csv');
    await expect(readMultipart(new Request('http://localhost/x', { method: 'POST', body: big }), rules)).rejects.toMatchObject({ code: 'payload_too_large' });
  });
});

describe('preview switch and line issues', () => {
  it.each([
    ['?preview=1', true],
    ['?preview=yes', true],
    ['?preview=0', false],
    ['', false],
  ])('%s → %s', (q, want) => expect(wantsPreview(new URL(`http://localhost/x${q}`))).toBe(want));

  it('names the line, and the column when there is one', () => {
    expect(lineIssues([{ line: 4, column: 'watts', message: 'must be a number' }, { line: 7, column: null, message: 'too many cells' }])).toEqual([
      { path: 'line 4.watts', message: 'must be a number' },
      { path: 'line 7', message: 'too many cells' },
    ]);
  });
});
