/**
 * PNG encoding of an RGBA picture (PNG specification, ISO/IEC 15948): signature, IHDR, one IDAT holding
 * the zlib stream of the filtered rows (fflate's zlib), IEND; each chunk with its CRC-32. Colour type 2
 * (RGB, 8 bits) when every pixel is opaque, else 6 (RGBA). Each row gets the filter (None, Sub, Up,
 * Average or Paeth) with the least sum of absolute values, the usual heuristic.
 */
import { zlibSync } from 'fflate';

let crcTable: Uint32Array | undefined;

/** CRC-32 (polynomial 0xEDB88320) of `bytes`, as PNG chunks use it. */
export function crc32(bytes: Uint8Array, start = 0, end = bytes.length): number {
  if (!crcTable) {
    crcTable = new Uint32Array(256);
    for (let n = 0; n < 256; n++) {
      let c = n;
      for (let k = 0; k < 8; k++) c = c & 1 ? 0xedb88320 ^ (c >>> 1) : c >>> 1;
      crcTable[n] = c >>> 0;
    }
  }
  let c = 0xffffffff;
  for (let i = start; i < end; i++) c = crcTable[(c ^ bytes[i]!) & 0xff]! ^ (c >>> 8);
  return (c ^ 0xffffffff) >>> 0;
}

function chunk(type: string, data: Uint8Array): Uint8Array {
  const out = new Uint8Array(12 + data.length);
  const dv = new DataView(out.buffer);
  dv.setUint32(0, data.length);
  for (let i = 0; i < 4; i++) out[4 + i] = type.charCodeAt(i);
  out.set(data, 8);
  dv.setUint32(8 + data.length, crc32(out, 4, 8 + data.length));
  return out;
}

function paeth(a: number, b: number, c: number): number {
  const p = a + b - c, pa = Math.abs(p - a), pb = Math.abs(p - b), pc = Math.abs(p - c);
  return pa <= pb && pa <= pc ? a : pb <= pc ? b : c;
}

/** Encodes `rgba` (width × height × 4 bytes, top row first) as PNG bytes. */
export function encodePng(width: number, height: number, rgba: Uint8Array): Uint8Array {
  if (!(Number.isInteger(width) && Number.isInteger(height) && width > 0 && height > 0)) throw new Error(`png: bad size ${width} × ${height}`);
  if (rgba.length !== width * height * 4) throw new Error(`png: ${rgba.length} bytes for ${width} × ${height} RGBA pixels, expected ${width * height * 4}`);
  let opaque = true;
  for (let i = 3; i < rgba.length; i += 4) if (rgba[i] !== 255) { opaque = false; break; }
  const bpp = opaque ? 3 : 4, stride = width * bpp;
  const raw = new Uint8Array(height * (stride + 1));
  const prev = new Uint8Array(stride), cur = new Uint8Array(stride), cand = new Uint8Array(5 * stride);
  for (let y = 0; y < height; y++) {
    for (let x = 0; x < width; x++) {
      const s = 4 * (y * width + x), d = x * bpp;
      cur[d] = rgba[s]!; cur[d + 1] = rgba[s + 1]!; cur[d + 2] = rgba[s + 2]!;
      if (bpp === 4) cur[d + 3] = rgba[s + 3]!;
    }
    let best = 0, bestSum = Infinity;
    for (let f = 0; f < 5; f++) {
      let sum = 0;
      const o = f * stride;
      for (let i = 0; i < stride; i++) {
        const a = i >= bpp ? cur[i - bpp]! : 0, b = prev[i]!, c = i >= bpp ? prev[i - bpp]! : 0;
        const pred = f === 0 ? 0 : f === 1 ? a : f === 2 ? b : f === 3 ? (a + b) >> 1 : paeth(a, b, c);
        const v = (cur[i]! - pred) & 255;
        cand[o + i] = v;
        sum += v < 128 ? v : 256 - v;
      }
      if (sum < bestSum) { bestSum = sum; best = f; }
    }
    const at = y * (stride + 1);
    raw[at] = best;
    raw.set(cand.subarray(best * stride, (best + 1) * stride), at + 1);
    prev.set(cur);
  }
  const ihdr = new Uint8Array(13);
  const dv = new DataView(ihdr.buffer);
  dv.setUint32(0, width); dv.setUint32(4, height);
  ihdr[8] = 8; ihdr[9] = opaque ? 2 : 6; ihdr[10] = 0; ihdr[11] = 0; ihdr[12] = 0;
  const parts = [new Uint8Array([137, 80, 78, 71, 13, 10, 26, 10]), chunk('IHDR', ihdr), chunk('IDAT', zlibSync(raw, { level: 6 })), chunk('IEND', new Uint8Array(0))];
  const out = new Uint8Array(parts.reduce((n, p) => n + p.length, 0));
  let o = 0;
  for (const p of parts) { out.set(p, o); o += p.length; }
  return out;
}
