/** A minimal PNG reader for checking exported pictures in tests: 8-bit RGB/RGBA, non-interlaced. */
import { unzlibSync } from 'fflate';

export interface Picture { width: number; height: number; rgba: Uint8Array }

/** Decodes a PNG (colour types 2 and 6, bit depth 8, no interlace); throws on anything else. */
export function readPng(bytes: Uint8Array): Picture {
  const sig = [137, 80, 78, 71, 13, 10, 26, 10];
  if (!sig.every((b, i) => bytes[i] === b)) throw new Error('not a PNG file (bad signature)');
  const dv = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  let p = 8, width = 0, height = 0, type = 0;
  const idat: Uint8Array[] = [];
  while (p < bytes.length) {
    const len = dv.getUint32(p), kind = String.fromCharCode(...bytes.subarray(p + 4, p + 8)), data = bytes.subarray(p + 8, p + 8 + len);
    if (kind === 'IHDR') {
      width = dv.getUint32(p + 8); height = dv.getUint32(p + 12); type = data[9]!;
      if (data[8] !== 8 || (type !== 2 && type !== 6) || data[12] !== 0) throw new Error(`PNG: unsupported depth ${data[8]} / type ${type} / interlace ${data[12]}`);
    } else if (kind === 'IDAT') idat.push(data);
    p += 12 + len;
  }
  const z = new Uint8Array(idat.reduce((n, d) => n + d.length, 0));
  idat.reduce((o, d) => { z.set(d, o); return o + d.length; }, 0);
  const raw = unzlibSync(z), bpp = type === 6 ? 4 : 3, stride = width * bpp;
  const out = new Uint8Array(width * height * 4), prev = new Uint8Array(stride), cur = new Uint8Array(stride);
  for (let y = 0; y < height; y++) {
    const f = raw[y * (stride + 1)]!, line = raw.subarray(y * (stride + 1) + 1, (y + 1) * (stride + 1));
    for (let i = 0; i < stride; i++) {
      const a = i >= bpp ? cur[i - bpp]! : 0, b = prev[i]!, c = i >= bpp ? prev[i - bpp]! : 0;
      let pred = 0;
      if (f === 1) pred = a; else if (f === 2) pred = b; else if (f === 3) pred = (a + b) >> 1;
      else if (f === 4) { const q = a + b - c, pa = Math.abs(q - a), pb = Math.abs(q - b), pc = Math.abs(q - c); pred = pa <= pb && pa <= pc ? a : pb <= pc ? b : c; }
      cur[i] = (line[i]! + pred) & 255;
    }
    for (let x = 0; x < width; x++) {
      out.set(cur.subarray(x * bpp, x * bpp + 3), 4 * (y * width + x));
      out[4 * (y * width + x) + 3] = bpp === 4 ? cur[x * bpp + 3]! : 255;
    }
    prev.set(cur);
  }
  return { width, height, rgba: out };
}

/** Pixels within `tol` (per channel) of an RGB colour, optionally inside a box [x0, y0, x1, y1). */
export function countColor(pic: Picture, rgb: [number, number, number], tol = 12, box?: [number, number, number, number]): number {
  const [x0, y0, x1, y1] = box ?? [0, 0, pic.width, pic.height];
  let n = 0;
  for (let y = Math.max(0, y0); y < Math.min(pic.height, y1); y++) {
    for (let x = Math.max(0, x0); x < Math.min(pic.width, x1); x++) {
      const i = 4 * (y * pic.width + x);
      if (Math.abs(pic.rgba[i]! - rgb[0]) <= tol && Math.abs(pic.rgba[i + 1]! - rgb[1]) <= tol && Math.abs(pic.rgba[i + 2]! - rgb[2]) <= tol) n++;
    }
  }
  return n;
}
