import { describe, expect, it } from 'vitest';
import { HttpError } from '../../src/server/errors';
import { multipartInPlace, type MultipartRules } from '../../src/server/upload';

// The monitor-log upload is taken apart where it lies in the worker: the file must come back as a
// view into the body (no copy), with the same fields a standard form parser (undici's) reads.

const RULES: MultipartRules = {
  maxFileBytes: 64,
  maxBodyBytes: 4096,
  tooLarge: () => new HttpError('payload_too_large', 'too large'),
  sendAs: 'send a form',
  defaultName: 'log.csv',
};

/** A form as a browser sends it, serialised by undici (the same code as fetch). */
async function encoded(form: FormData): Promise<{ body: Uint8Array; type: string }> {
  const res = new Response(form);
  return { body: new Uint8Array(await res.arrayBuffer()), type: res.headers.get('content-type')! };
}

describe('multipartInPlace', () => {
  it('reads the file and the text fields as a standard parser does, the file as a view into the body', async () => {
    const csv = 'Time,Voltage (V)\r\n2027-05-01 00:00,13.2\r\n';
    const form = new FormData();
    form.set('name', 'Señora’s log');
    form.set('mapping', '{"time":"Time"}');
    form.set('file', new File([csv], 'trip "one".csv', { type: 'text/csv' }));
    const { body, type } = await encoded(form);
    const up = multipartInPlace(body, type, RULES);
    const standard = await new Response(body.slice(), { headers: { 'content-type': type } }).formData();
    const file = standard.get('file') as File;
    expect(new TextDecoder().decode(up.bytes)).toBe(await file.text());
    expect(new TextDecoder().decode(up.bytes)).toBe(csv);
    expect(up.fileName).toBe(file.name);
    expect(Object.fromEntries(up.fields)).toEqual({ name: 'Señora’s log', mapping: '{"time":"Time"}' });
    // No copy: the file's bytes are the body's.
    expect(up.bytes.buffer).toBe(body.buffer);
  });

  it('answers as readMultipart does: no file, a file over the limit, a broken form, not a form', async () => {
    const codeOf = (f: () => unknown) => {
      try {
        f();
      } catch (e) {
        return [(e as HttpError).code, (e as HttpError).issues[0]?.path];
      }
      return null;
    };
    const noFile = new FormData();
    noFile.set('name', 'x');
    const a = await encoded(noFile);
    expect(codeOf(() => multipartInPlace(a.body, a.type, RULES))).toEqual(['invalid_request', 'file']);

    const big = new FormData();
    big.set('file', new File(['x'.repeat(65)], 'big.csv'));
    const b = await encoded(big);
    expect(codeOf(() => multipartInPlace(b.body, b.type, RULES))).toEqual(['payload_too_large', undefined]);

    const ok = new FormData();
    ok.set('file', new File(['a,b\n'], 'ok.csv'));
    const c = await encoded(ok);
    expect(codeOf(() => multipartInPlace(c.body.subarray(0, c.body.byteLength - 30), c.type, RULES))).toEqual(['invalid_request', '(body)']);
    expect(codeOf(() => multipartInPlace(c.body, 'multipart/form-data; boundary=elsewhere', RULES))).toEqual(['invalid_request', '(body)']);
    expect(codeOf(() => multipartInPlace(c.body, 'text/csv', RULES))).toEqual(['unsupported_media_type', '(headers).content-type']);
  });
});
