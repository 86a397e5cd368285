// The forecast with its hours as columns (the preview's `?hourly=columns` answer), written as
// UTF-8 JSON bytes straight from the simulation's arrays: no object per hour, no string per number.
import { forecastTotals, r0, r1, r2 } from './forecast';
import type { PreparedTrip } from './prepare';
import type { SimResult } from './simulate';

const COMMA = 44;
const MINUS = 45;
const DOT = 46;
const ZERO = 48;
const CLOSE = 93; // ]
const TRUE = Uint8Array.from('true', (c) => c.charCodeAt(0));
const FALSE = Uint8Array.from('false', (c) => c.charCodeAt(0));
const encoder = new TextEncoder();

/** A growing byte buffer for JSON text. */
class JsonBytes {
  buf: Uint8Array;
  pos = 0;
  private readonly digits = new Uint8Array(16);

  constructor(size: number) {
    this.buf = new Uint8Array(size);
  }

  private room(extra: number): void {
    if (this.pos + extra <= this.buf.length) return;
    const next = new Uint8Array(Math.max(this.buf.length * 2, this.pos + extra));
    next.set(this.buf.subarray(0, this.pos));
    this.buf = next;
  }

  /** Any text, as UTF-8. */
  text(s: string): void {
    this.room(s.length * 3);
    this.pos += encoder.encodeInto(s, this.buf.subarray(this.pos)).written;
  }

  bytes(b: Uint8Array): void {
    this.room(b.length);
    this.buf.set(b, this.pos);
    this.pos += b.length;
  }

  byte(c: number): void {
    this.room(1);
    this.buf[this.pos++] = c;
  }

  /** A whole number 0 ≤ n < 1e15, in decimal (−0 writes "0"). */
  private whole(n: number): void {
    this.room(16);
    if (n < 10) {
      this.buf[this.pos++] = ZERO + n;
      return;
    }
    let k = 0;
    while (n > 0) {
      const q = Math.floor(n / 10);
      this.digits[k++] = n - q * 10;
      n = q;
    }
    while (k > 0) this.buf[this.pos++] = ZERO + this.digits[--k]!;
  }

  /** The rounded value as JSON.stringify writes it: r0 (watts). */
  w0(x: number): void {
    const v = r0(x);
    if (!(v < 1e15 && v > -1e15)) return this.text(String(v));
    if (v < 0) {
      this.byte(MINUS);
      this.whole(-v);
    } else this.whole(v);
  }

  /**
   * r1 (SOC, °C; `digits` 1) and r2 (volts; 2): a value rounded to n/10 or n/100 for a whole n is,
   * for |n| < 1e15, written by JSON.stringify as n's digits with the point put in and trailing zeros
   * dropped (the shortest decimal that reads back as that double). Larger or not finite: JSON.stringify itself.
   */
  dec(x: number, digits: 1 | 2): void {
    if (!Number.isFinite(x)) return this.byte(ZERO);
    const scale = digits === 1 ? 10 : 100;
    const n = Math.round(x * scale);
    if (!(n < 1e15 && n > -1e15)) return this.text(JSON.stringify(digits === 1 ? r1(x) : r2(x)));
    const a = n < 0 ? -n : n;
    const d = a % scale;
    if (n < 0 && a !== 0) this.byte(MINUS);
    this.whole((a - d) / scale);
    if (d === 0) return;
    this.byte(DOT);
    if (digits === 1) return this.byte(ZERO + d);
    this.byte(ZERO + Math.floor(d / 10));
    if (d % 10 !== 0) this.byte(ZERO + (d % 10));
  }

  /** `,"name":[…]` of one column, each value rounded to `digits` (0: r0, 1: r1, 2: r2). */
  column(name: string, values: ArrayLike<number>, n: number, digits: 0 | 1 | 2): void {
    this.text(`,"${name}":[`);
    for (let r = 0; r < n; r++) {
      if (r > 0) this.byte(COMMA);
      const x = values[r]!;
      if (digits === 0) this.w0(x);
      else this.dec(x, digits);
    }
    this.byte(CLOSE);
  }

  /** `,"name":[true,false,…]` of a 0/1 column. */
  flags(name: string, values: ArrayLike<number>, n: number): void {
    this.text(`,"${name}":[`);
    this.room(n * 6);
    const buf = this.buf;
    let pos = this.pos;
    for (let r = 0; r < n; r++) {
      if (r > 0) buf[pos++] = COMMA;
      const word = values[r] === 1 ? TRUE : FALSE;
      for (let i = 0; i < word.length; i++) buf[pos++] = word[i]!;
    }
    this.pos = pos;
    this.byte(CLOSE);
  }
}

/**
 * The UTF-8 bytes of `JSON.stringify` of the forecast in its columnar form
 * (`src/lib/forecast-columns.ts` `toColumns(toForecast(prepared, sim))`: the hours as one array per
 * field, in `HourlyRow`'s order), with the contract's rounding, written straight from the
 * simulation's arrays. The same text, byte for byte (tests/unit/engine/columns-json.test.ts).
 */
export function toColumnsJson(prepared: PreparedTrip, sim: SimResult): Uint8Array {
  const { n, grid } = prepared;
  const totals = encoder.encode(JSON.stringify(forecastTotals(prepared, sim)));
  // About 110 bytes an hour for the 22 columns; sized a little over so that it rarely grows.
  const out = new JsonBytes(totals.length + n * 128 + 256);
  out.bytes(totals.subarray(0, totals.length - 1));
  out.text(`,"hours":${n},"hourlyColumns":{`);
  if (n > 0) {
    // The first column opens without the comma the others start with.
    out.text(`"time":${JSON.stringify(grid.time.length === n ? grid.time : grid.time.slice(0, n))}`);
    out.column('socPct', sim.socEndPct, n, 1);
    out.column('volts', sim.volts, n, 2);
    out.column('solarWatts', sim.solarW, n, 0);
    out.column('chargeWatts', sim.chargeW, n, 0);
    out.column('loadWatts', sim.loadW, n, 0);
    out.column('unmetWatts', sim.unmetW, n, 0);
    out.column('curtailedWatts', sim.curtailedW, n, 0);
    out.column('ambientC', prepared.ambientC, n, 1);
    out.column('sunAltitudeDeg', prepared.sunAltitudeDeg, n, 1);
    out.column('poaWm2', prepared.poaWm2, n, 0);
    out.column('stop', grid.stop, n, 0);
    out.flags('driving', grid.driving, n);
    out.flags('generatorOn', sim.generatorOn, n);
    out.flags('disconnected', sim.disconnected, n);
    out.column('batteryC', sim.batteryC, n, 1);
    out.column('usablePct', sim.usablePct, n, 1);
    out.column('minVolts', sim.minVolts, n, 2);
    out.column('cabinC', sim.cabinC, n, 1);
    out.column('curtailedColdWatts', sim.curtailedColdW, n, 0);
    out.column('curtailedFullWatts', sim.curtailedFullW, n, 0);
    out.column('curtailedLimitWatts', sim.curtailedLimitW, n, 0);
  }
  out.text('}}');
  return out.buf.subarray(0, out.pos);
}

/** One rounded value as the columns write it (tests: the same text as JSON.stringify of r0/r1/r2). */
export function roundedJson(x: number, digits: 0 | 1 | 2): string {
  const out = new JsonBytes(32);
  if (digits === 0) out.w0(x);
  else out.dec(x, digits);
  return new TextDecoder().decode(out.buf.subarray(0, out.pos));
}
