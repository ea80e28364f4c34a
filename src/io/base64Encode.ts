/**
 * Base64 encoding of bytes into bytes (ASCII codes), table-driven, no strings — for the writers'
 * `binary` and appended-`base64` encodings. Standard alphabet with `=` padding.
 */

const ALPHABET = (() => {
  const s = 'ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789+/';
  const t = new Uint8Array(64);
  for (let i = 0; i < 64; i++) t[i] = s.charCodeAt(i);
  return t;
})();

/** Length in characters of the base64 text of `n` bytes. */
export const base64Length = (n: number): number => 4 * Math.ceil(n / 3);

/** Base64 text of `src` as ASCII bytes, padded with `=` to a multiple of 4 characters. */
export function base64Encode(src: Uint8Array): Uint8Array {
  const n = src.length, out = new Uint8Array(base64Length(n)), A = ALPHABET;
  const whole = n - (n % 3);
  let o = 0;
  for (let i = 0; i < whole; i += 3) {
    const v = (src[i]! << 16) | (src[i + 1]! << 8) | src[i + 2]!;
    out[o] = A[v >>> 18]!; out[o + 1] = A[(v >>> 12) & 63]!; out[o + 2] = A[(v >>> 6) & 63]!; out[o + 3] = A[v & 63]!;
    o += 4;
  }
  if (n - whole === 1) {
    const v = src[whole]! << 16;
    out[o] = A[v >>> 18]!; out[o + 1] = A[(v >>> 12) & 63]!; out[o + 2] = 61; out[o + 3] = 61;
  } else if (n - whole === 2) {
    const v = (src[whole]! << 16) | (src[whole + 1]! << 8);
    out[o] = A[v >>> 18]!; out[o + 1] = A[(v >>> 12) & 63]!; out[o + 2] = A[(v >>> 6) & 63]!; out[o + 3] = 61;
  }
  return out;
}
