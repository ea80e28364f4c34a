/**
 * Numbers as ASCII text for the writers' `ascii` encodings. Every value reads back to the identical
 * number: Float64 uses the shortest round-trip form, Float32 the shortest of 7–9 significant digits
 * that rounds back to the same single, −0 keeps its sign. Text is emitted in chunks of lines.
 */
import type { NumericArray } from '../model/fieldArray.ts';
import type { ByteSink } from './byteSink.ts';

/** Drops trailing zeros of the mantissa of a `toPrecision` result (`1.500e-7` → `1.5e-7`). */
function trimMantissa(s: string): string {
  const e = s.indexOf('e');
  const m = e < 0 ? s : s.slice(0, e);
  if (m.indexOf('.') < 0) return s;
  let end = m.length;
  while (m.charCodeAt(end - 1) === 48) end--;
  if (m.charCodeAt(end - 1) === 46) end--;
  return m.slice(0, end) + (e < 0 ? '' : s.slice(e));
}

/** Shortest text of a double that parses back to the same double. */
export function formatFloat64(x: number): string {
  return x === 0 && 1 / x < 0 ? '-0' : String(x);
}

/** Short text of a single-precision value that parses (and rounds to single) back to the same value. */
export function formatFloat32(x: number): string {
  if (x === 0) return 1 / x < 0 ? '-0' : '0';
  const s = String(x);
  if (s.length <= 9) return s;
  for (let p = 7; p < 9; p++) {
    const t = x.toPrecision(p);
    if (Math.fround(Number(t)) === x) return trimMantissa(t);
  }
  return trimMantissa(x.toPrecision(9));
}

/** Values per text chunk handed to the sink (bounds the size of intermediate strings). */
const CHUNK_VALUES = 1 << 15;

/**
 * Writes `values` as text, `perLine` numbers per line, each line starting with `indent` and ending in a
 * newline. Integers print exactly; floats as described above.
 */
export function writeAsciiValues(sink: ByteSink, values: NumericArray, perLine: number, indent: string): void {
  const n = values.length;
  const fmt = values instanceof Float32Array ? formatFloat32 : values instanceof Float64Array ? formatFloat64 : String;
  for (let start = 0; start < n; start += CHUNK_VALUES) {
    const end = Math.min(n, start + CHUNK_VALUES);
    let s = '';
    for (let i = start; i < end; i++) {
      const col = i % perLine;
      s += (col === 0 ? indent : ' ') + fmt(values[i]!) + (col === perLine - 1 || i === n - 1 ? '\n' : '');
    }
    sink.text(s);
  }
}
