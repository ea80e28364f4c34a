/**
 * Test helper: builds legacy .vtk files from text and big-endian binary blocks (DataView), the way
 * VTK's legacy writer lays them out (a header line, a newline, then the raw big-endian values).
 */

export type BeType = 'u8' | 'i8' | 'i16' | 'u16' | 'i32' | 'u32' | 'i64' | 'f32' | 'f64';

const SIZE: Record<BeType, number> = { u8: 1, i8: 1, i16: 2, u16: 2, i32: 4, u32: 4, i64: 8, f32: 4, f64: 8 };

/** Big-endian bytes of `values` as `type`. */
export function be(type: BeType, values: number[]): Uint8Array {
  const out = new Uint8Array(values.length * SIZE[type]);
  const v = new DataView(out.buffer);
  values.forEach((x, i) => {
    const o = i * SIZE[type];
    switch (type) {
      case 'u8': v.setUint8(o, x); break;
      case 'i8': v.setInt8(o, x); break;
      case 'i16': v.setInt16(o, x, false); break;
      case 'u16': v.setUint16(o, x, false); break;
      case 'i32': v.setInt32(o, x, false); break;
      case 'u32': v.setUint32(o, x, false); break;
      case 'i64': v.setBigInt64(o, BigInt(x), false); break;
      case 'f32': v.setFloat32(o, x, false); break;
      case 'f64': v.setFloat64(o, x, false); break;
    }
  });
  return out;
}

/** Concatenates text (UTF-8) and byte parts into one file. */
export function fileOf(...parts: (string | Uint8Array)[]): Uint8Array {
  const chunks = parts.map((p) => (typeof p === 'string' ? new TextEncoder().encode(p) : p));
  const out = new Uint8Array(chunks.reduce((s, c) => s + c.length, 0));
  let o = 0;
  for (const c of chunks) { out.set(c, o); o += c.length; }
  return out;
}

/** UTF-8 bytes of a text file. */
export const text = (s: string): Uint8Array => new TextEncoder().encode(s);
