/**
 * Output side of the writers: a list of byte chunks joined once at the end, plus the byte-order
 * helpers the binary encodings need. Raw array data is pushed as views (no copy) when the host byte
 * order already matches the file's.
 */
import type { NumericArray } from '../model/fieldArray.ts';

const HOST_LITTLE = new Uint8Array(new Uint16Array([1]).buffer)[0] === 1;
const encoder = new TextEncoder();

/** Collects output chunks; `finish` joins them into one array. */
export class ByteSink {
  private readonly chunks: Uint8Array[] = [];
  private total = 0;

  /** Bytes written so far. */
  get size(): number { return this.total; }

  /** Appends bytes (kept by reference: do not modify them afterwards). */
  bytes(b: Uint8Array): void {
    if (b.length === 0) return;
    this.chunks.push(b);
    this.total += b.length;
  }

  /** Appends text as UTF-8 (the writers only emit ASCII, except in names, which XML carries as UTF-8). */
  text(s: string): void {
    if (s.length > 0) this.bytes(encoder.encode(s));
  }

  /** Moves the chunks of `other` to the end of this sink (no copy); `other` is left empty. */
  drain(other: ByteSink): void {
    for (const c of other.chunks) this.chunks.push(c);
    this.total += other.total;
    other.chunks.length = 0;
    other.total = 0;
  }

  /** All chunks joined into one array. */
  finish(): Uint8Array {
    if (this.chunks.length === 1) return this.chunks[0]!;
    const out = new Uint8Array(this.total);
    let o = 0;
    for (const c of this.chunks) { out.set(c, o); o += c.length; }
    return out;
  }
}

/** The bytes of a typed array in little-endian order: a view on little-endian hosts, a swapped copy otherwise. */
export function littleEndianBytes(a: NumericArray | BigInt64Array): Uint8Array {
  const view = new Uint8Array(a.buffer, a.byteOffset, a.byteLength);
  return HOST_LITTLE ? view : swapped(view, a.BYTES_PER_ELEMENT);
}

/** The bytes of a typed array in big-endian order (always a copy on little-endian hosts). */
export function bigEndianBytes(a: NumericArray | BigInt64Array): Uint8Array {
  const view = new Uint8Array(a.buffer, a.byteOffset, a.byteLength);
  return HOST_LITTLE ? swapped(view, a.BYTES_PER_ELEMENT) : view;
}

/** A copy with each `size`-byte element reversed. */
function swapped(src: Uint8Array, size: number): Uint8Array {
  const n = src.length, out = new Uint8Array(n);
  if (size === 1) { out.set(src); return out; }
  if (size === 4) {
    for (let i = 0; i < n; i += 4) { out[i] = src[i + 3]!; out[i + 1] = src[i + 2]!; out[i + 2] = src[i + 1]!; out[i + 3] = src[i]!; }
  } else if (size === 8) {
    for (let i = 0; i < n; i += 8) {
      out[i] = src[i + 7]!; out[i + 1] = src[i + 6]!; out[i + 2] = src[i + 5]!; out[i + 3] = src[i + 4]!;
      out[i + 4] = src[i + 3]!; out[i + 5] = src[i + 2]!; out[i + 6] = src[i + 1]!; out[i + 7] = src[i]!;
    }
  } else {
    for (let i = 0; i < n; i += size) for (let k = 0; k < size; k++) out[i + k] = src[i + size - 1 - k]!;
  }
  return out;
}

/**
 * 32-bit ids widened to 64-bit two's complement (for Int64 id arrays in files), built as (low, high)
 * 32-bit word pairs in host order — no BigInt per element — and returned as a 64-bit view for the
 * byte-order helpers.
 */
export function widenIds(ids: Int32Array): BigInt64Array {
  const out = new Int32Array(2 * ids.length);
  const lo = HOST_LITTLE ? 0 : 1, hi = 1 - lo;
  for (let i = 0; i < ids.length; i++) {
    const v = ids[i]!;
    out[2 * i + lo] = v;
    out[2 * i + hi] = v < 0 ? -1 : 0;
  }
  return new BigInt64Array(out.buffer);
}
