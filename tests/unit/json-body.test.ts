import { describe, expect, it } from 'vitest';
import { HttpError } from '../../src/server/errors';
import { parseJsonText } from '../../src/server/http';

/** The one JSON reader of request bodies: bad JSON and the NUL character are 400s naming the field. */
function refusal(text: string): HttpError {
  try {
    parseJsonText(text);
  } catch (e) {
    if (e instanceof HttpError) return e;
    throw e;
  }
  throw new Error(`expected a refusal of ${JSON.stringify(text)}`);
}

describe('parseJsonText', () => {
  it('names the field that holds an escaped NUL, at any depth, in keys too', () => {
    expect(refusal(JSON.stringify({ name: 'Fridge\u0000' })).issues?.[0]?.path).toBe('name');
    expect(refusal(JSON.stringify({ loads: [{ watts: 5 }, { name: 'a\u0000b' }] })).issues?.[0]?.path).toBe('loads.1.name');
    expect(refusal('{"loads":[{"na\\u0000me":1}]}').issues?.[0]?.path).toBe('loads.0.na\u0000me');
    expect(refusal('"\\u0000"').issues?.[0]?.path).toBe('(body)');
  });

  it('refuses a raw NUL as bad JSON (it cannot stand unescaped in JSON text)', () => {
    const e = refusal('{"name":"Fridge\u0000"}');
    expect(e.message).toBe('The body is not valid JSON.');
  });

  it('keeps a backslash followed by the letters u0000 (an escaped backslash, not a NUL)', () => {
    expect(parseJsonText('{"note":"C:\\\\u0000"}')).toEqual({ note: 'C:\\u0000' });
  });

  it('parses a plain body unchanged', () => {
    expect(parseJsonText('{"a":[1,"x",{"b":null}]}')).toEqual({ a: [1, 'x', { b: null }] });
  });
});
