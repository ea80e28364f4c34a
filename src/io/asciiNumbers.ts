/**
 * Fast parsing of whitespace-separated ASCII numbers straight from bytes (legacy ASCII files and XML
 * `format="ascii"` arrays). Decimal numbers with at most 15 significant digits and a small exponent
 * take an exact fast path (an integer mantissa times or over an exact power of ten is correctly
 * rounded); anything else goes through `Number()` on the token, so results equal a correct parser's.
 */

const POW10 = [1e0, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19, 1e20, 1e21, 1e22];

const isSpace = (c: number) => c === 32 || c === 10 || c === 13 || c === 9 || c === 11 || c === 12;

/** A writable numeric array (typed arrays). */
export interface NumberSink { length: number; [i: number]: number }

/**
 * Reads exactly `out.length` numbers from `bytes[pos, end)` into `out`, skipping whitespace. Returns the
 * position just after the last number. Throws naming `where` on a token that is not a number or when
 * the range ends early.
 */
export function parseNumbers(bytes: Uint8Array, pos: number, end: number, out: NumberSink, where: string): number {
  const n = out.length;
  let i = 0;
  while (i < n) {
    while (pos < end && isSpace(bytes[pos]!)) pos++;
    if (pos >= end) throw new Error(`${where}: expected ${n} numbers, found only ${i}`);
    const start = pos;
    let c = bytes[pos]!;
    let neg = false;
    if (c === 45 || c === 43) { neg = c === 45; c = bytes[++pos]!; }
    let mant = 0, digits = 0, exp10 = 0, any = false;
    while (c >= 48 && c <= 57) {
      any = true;
      if (digits < 15 || mant === 0) { mant = mant * 10 + (c - 48); if (mant !== 0) digits++; } else exp10++;
      c = bytes[++pos]!;
    }
    let slow = digits >= 15;
    if (c === 46) {
      c = bytes[++pos]!;
      while (c >= 48 && c <= 57) {
        any = true;
        if (digits < 15) { mant = mant * 10 + (c - 48); exp10--; if (mant !== 0) digits++; } else if (c !== 48) slow = true;
        c = bytes[++pos]!;
      }
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
    if (!slow && exp10 >= -22 && exp10 <= 22) {
      const v = exp10 < 0 ? mant / POW10[-exp10]! : mant * POW10[exp10]!;
      out[i] = neg ? -v : v;
    } else {
      out[i] = slowToken(bytes, start, pos, where, i); // the token keeps its sign
    }
    i++;
  }
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
