/**
 * Fast parsing of whitespace-separated ASCII numbers straight from bytes (legacy ASCII files and XML
 * `format="ascii"` arrays), correctly rounded like `Number()`:
 *  - up to 15 significant digits with |exponent| ≤ 22: an exact integer mantissa times or over an exact
 *    power of ten is correctly rounded (Clinger's fast path);
 *  - 16 to 19 significant digits with |exponent| ≤ 44: the mantissa is held exactly as a double-double and
 *    scaled with about 2^-100 relative error; the rounded result is correct unless the exact value lies
 *    within that error of a rounding boundary, which is detected and sent to `Number()`;
 *  - anything else (more digits, huge exponents, nan/inf) goes through `Number()` on the token.
 */

const POW10 = [1e0, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19, 1e20, 1e21, 1e22];

const isSpace = (c: number) => c === 32 || c === 10 || c === 13 || c === 9 || c === 11 || c === 12;

/** A writable numeric array (typed arrays). */
export interface NumberSink { length: number; [i: number]: number }

const SPLIT = 134217729; // 2^27 + 1, Dekker's splitter
const F64 = new Float64Array(1);
const U32 = new Uint32Array(F64.buffer);
const HI = new Uint8Array(new Uint16Array([1]).buffer)[0] === 1 ? 1 : 0;

/** Double-double result registers of the slow-but-exact path (module scratch, no allocation). */
let ddH = 0, ddL = 0;

/** ddH + ddL = a·b exactly (Dekker). */
function twoProd(a: number, b: number): void {
  const p = a * b;
  let t = SPLIT * a; const ah = t - (t - a), al = a - ah;
  t = SPLIT * b; const bh = t - (t - b), bl = b - bh;
  ddH = p; ddL = ((ah * bh - p) + ah * bl + al * bh) + al * bl;
}

/** Renormalises (h, l) so that ddH = fl(h + l). */
function quickTwoSum(h: number, l: number): void {
  const s = h + l;
  ddH = s; ddL = l - (s - h);
}

/** (h, l) · 10^k for 0 ≤ k ≤ 22, into ddH/ddL. */
function ddMulPow(h: number, l: number, k: number): void {
  const p = POW10[k]!;
  twoProd(h, p);
  quickTwoSum(ddH, ddL + l * p);
}

/** (h, l) / 10^k for 0 ≤ k ≤ 22, into ddH/ddL. */
function ddDivPow(h: number, l: number, k: number): void {
  const p = POW10[k]!;
  const q1 = h / p;
  twoProd(q1, p);
  const r = (h - ddH) - ddL + l;
  quickTwoSum(q1, r / p);
}

/**
 * Correctly rounded value of (m1·10^d2 + m2)·10^e for a mantissa of 16–19 digits, or NaN when the
 * double-double cannot decide the rounding (the caller then parses the token exactly).
 */
function longMantissa(m1: number, d2: number, m2: number, e: number): number {
  twoProd(m1, POW10[d2]!);
  const h0 = ddH, l0 = ddL;
  const s = h0 + m2, bb = s - h0, err = (h0 - (s - bb)) + (m2 - bb);
  quickTwoSum(s, l0 + err);
  let h = ddH, l = ddL;
  if (e > 0) {
    if (e > 22) { ddMulPow(h, l, 22); h = ddH; l = ddL; e -= 22; }
    ddMulPow(h, l, e);
  } else if (e < 0) {
    if (e < -22) { ddDivPow(h, l, 22); h = ddH; l = ddL; e += 22; }
    ddDivPow(h, l, -e);
  }
  h = ddH; l = ddL;
  F64[0] = h;
  const halfUlp = 2 ** ((((U32[HI]! >>> 20) & 0x7ff) - 1023) - 53);
  if (Math.abs(Math.abs(l) - halfUlp) <= Math.abs(h) * 2 ** -95) return NaN;
  return h;
}

/**
 * Reads exactly `out.length` numbers from `bytes[pos, end)` into `out`, skipping whitespace. Returns the
 * position just after the last number. Throws naming `where` on a token that is not a number or when
 * the range ends early.
 */
export function parseNumbers(bytes: Uint8Array, pos: number, end: number, out: NumberSink, where: string): number {
  return parseInto(bytes, pos, end, out, where, false);
}

/** Numbers the last `parseSomeNumbers` call read. */
let someCount = 0;
export const parsedCount = (): number => someCount;

/**
 * Reads up to `out.length` numbers from `bytes[pos, end)` into `out`, stopping early at `end` (the text
 * is read in windows that end on whitespace); `parsedCount()` then tells how many. Returns the position
 * after the last number read. Throws as `parseNumbers` on a token that is not a number.
 */
export function parseSomeNumbers(bytes: Uint8Array, pos: number, end: number, out: NumberSink, where: string): number {
  return parseInto(bytes, pos, end, out, where, true);
}

function parseInto(bytes: Uint8Array, pos: number, end: number, out: NumberSink, where: string, partial: boolean): number {
  const n = out.length;
  let i = 0;
  while (i < n) {
    while (pos < end && isSpace(bytes[pos]!)) pos++;
    if (pos >= end) {
      if (partial) break;
      throw new Error(`${where}: expected ${n} numbers, found only ${i}`);
    }
    const start = pos;
    let c = bytes[pos]!;
    let neg = false;
    if (c === 45 || c === 43) { neg = c === 45; c = bytes[++pos]!; }
    // m1: first 15 significant digits; m2: the next up to 4 (d2 of them); beyond 19 the token goes slow.
    let m1 = 0, m2 = 0, d2 = 0, sig = 0, exp10 = 0, any = false, slow = false, frac = false;
    for (;;) {
      if (c >= 48 && c <= 57) {
        any = true;
        const d = c - 48;
        if (sig === 0 && d === 0) { if (frac) exp10--; }
        else if (sig < 15) { m1 = m1 * 10 + d; sig++; if (frac) exp10--; }
        else if (sig < 19) { m2 = m2 * 10 + d; d2++; sig++; if (frac) exp10--; }
        else { if (!frac) exp10++; if (d !== 0) slow = true; }
      } else if (c === 46 && !frac) {
        frac = true;
      } else break;
      c = bytes[++pos]!;
    }
    if (any && (c === 101 || c === 69)) {
      c = bytes[++pos]!;
      let eneg = false, e = 0, edig = false;
      if (c === 45 || c === 43) { eneg = c === 45; c = bytes[++pos]!; }
      while (c >= 48 && c <= 57) { e = e * 10 + (c - 48); edig = true; c = bytes[++pos]!; if (e > 100000) slow = true; }
      if (!edig) any = false;
      exp10 += eneg ? -e : e;
    }
    if (!any || (pos < end && !isSpace(bytes[pos]!))) {
      while (pos < end && !isSpace(bytes[pos]!)) pos++;
      out[i] = slowToken(bytes, start, pos, where, i);
      i++;
      continue;
    }
    if (pos > end) pos = end;
    let v = NaN;
    if (!slow) {
      if (d2 === 0) {
        if (exp10 >= -22 && exp10 <= 22) v = exp10 < 0 ? m1 / POW10[-exp10]! : m1 * POW10[exp10]!;
        else if (exp10 >= -44 && exp10 <= 44 && m1 !== 0) v = longMantissa(m1, 0, 0, exp10);
        else if (m1 === 0) v = 0;
      } else if (exp10 >= -44 && exp10 <= 44) {
        const whole = m1 * POW10[d2]! + m2;
        // Below 2^53 the whole mantissa is an exact double and Clinger's path applies again.
        if (whole < 9007199254740992 && exp10 >= -22 && exp10 <= 22) v = exp10 < 0 ? whole / POW10[-exp10]! : whole * POW10[exp10]!;
        else v = longMantissa(m1, d2, m2, exp10);
      }
    }
    if (v === v) out[i] = neg ? -v : v;
    else out[i] = slowToken(bytes, start, pos, where, i); // the token keeps its sign
    i++;
  }
  someCount = i;
  return pos;
}

function slowToken(bytes: Uint8Array, start: number, end: number, where: string, index: number): number {
  let s = '';
  for (let k = start; k < end && k < start + 64; k++) s += String.fromCharCode(bytes[k]!);
  if (/^[+-]?nan$/i.test(s)) return NaN;
  if (/^[+-]?inf(inity)?$/i.test(s)) return s.startsWith('-') ? -Infinity : Infinity;
  const v = Number(s);
  if (Number.isNaN(v) || s.length === 0) {
    throw new Error(`${where}: value ${index} is "${s}", expected a number`);
  }
  // A NaN/Inf token is returned as is; the piece validation reports it with its array and tuple.
  return v;
}

/** Skips whitespace from `pos`; returns the first non-space position (or `end`). */
export function skipSpace(bytes: Uint8Array, pos: number, end: number): number {
  while (pos < end && isSpace(bytes[pos]!)) pos++;
  return pos;
}
