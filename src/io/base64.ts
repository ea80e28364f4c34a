/**
 * Base64 decoding straight from the file's bytes into typed-array buffers (no strings), table-driven.
 *
 * VTK writes the header of a binary array and its data as two separately padded base64 runs; other
 * writers encode them together. The reader handles both the same way: it decodes one 4-character
 * group at a time, a group may end in `=` padding, and the next group simply starts a new run.
 * Whitespace (space, tab, CR, LF) is skipped anywhere.
 */

const INVALID = 255, SPACE = 64, PAD = 65;

/** Sextet value of each byte: 0–63 for the alphabet, SPACE, PAD, or INVALID. */
const DECODE = (() => {
  const t = new Uint8Array(256).fill(INVALID);
  const alphabet = 'ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789+/';
  for (let i = 0; i < 64; i++) t[alphabet.charCodeAt(i)] = i;
  for (const c of [32, 9, 10, 13]) t[c] = SPACE;
  t[61] = PAD;
  return t;
})();

/** Sextet pair of each two-character combination (`c0 << 8 | c1` → `s0 << 6 | s1`), or 0xffff: one lookup per 12 bits. */
const PAIRS = (() => {
  const t = new Uint16Array(65536).fill(0xffff);
  const alphabet = 'ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789+/';
  for (let a = 0; a < 64; a++) for (let b = 0; b < 64; b++) t[(alphabet.charCodeAt(a) << 8) | alphabet.charCodeAt(b)] = (a << 6) | b;
  return t;
})();

/** Positions reached by `fastGroups` (module scratch, so the hot loop returns nothing). */
let fastP = 0, fastO = 0;

/**
 * Decodes whole 4-character groups of plain alphabet characters from `text[p…end)` into `out[o…oEnd)`,
 * stopping before a group holding whitespace, padding or an invalid character. Leaves the positions in
 * `fastP` / `fastO`.
 */
function fastGroups(text: Uint8Array, p: number, end: number, out: Uint8Array, o: number, oEnd: number): void {
  const T = PAIRS;
  const groups = Math.min((end - p) >> 2, Math.floor((oEnd - o) / 3));
  for (let g = 0; g < groups; g++) {
    const x = T[(text[p]! << 8) | text[p + 1]!]!, y = T[(text[p + 2]! << 8) | text[p + 3]!]!;
    if ((x | y) > 4095) break;
    const v = (x << 12) | y;
    out[o] = v >>> 16; out[o + 1] = (v >>> 8) & 255; out[o + 2] = v & 255;
    o += 3; p += 4;
  }
  fastP = p; fastO = o;
}

/**
 * Sequential reader of the bytes encoded in `text[start, end)`. Every error names `where`
 * (e.g. `box.vtu: piece 0: DataArray "p"`).
 */
export class Base64Reader {
  private pos: number;
  /** File offset of `text[0]` (non-zero when the text is a window of the file), for positions and messages. */
  private base = 0;
  /** Bytes of the last decoded group not handed out yet. */
  private readonly carry = new Uint8Array(3);
  private carryAt = 0;
  private carryEnd = 0;

  constructor(private text: Uint8Array, start: number, private end: number, private readonly where: string) {
    this.pos = start;
  }

  /**
   * Continues on a new window of the text: `text[start, end)`, with `text[0]` at file offset `base`. The
   * previous window must have ended at a group boundary (undecoded bytes of the last group carry over).
   */
  setWindow(text: Uint8Array, start: number, end: number, base: number): void {
    this.text = text;
    this.pos = start;
    this.end = end;
    this.base = base;
  }

  /** Decoded bytes held back from the last group. */
  carried(): number {
    return this.carryEnd - this.carryAt;
  }

  /** An upper bound on the bytes still to come (exact when the rest holds no whitespace or padding). */
  available(): number {
    return this.carried() + Math.floor((this.end - this.pos) / 4) * 3;
  }

  /** File offset where the next group starts. */
  position(): number {
    return this.base + this.pos;
  }

  /** Decodes the next `n` bytes into a fresh array. */
  read(n: number): Uint8Array {
    const out = new Uint8Array(n);
    this.readInto(out, 0, n);
    return out;
  }

  /** Decodes the next `n` bytes into `out[at, at + n)`. Throws if the text runs out or holds an invalid character. */
  readInto(out: Uint8Array, at: number, n: number): void {
    const got = this.readSome(out, at, n);
    if (got < n) throw new Error(`${this.where}: base64 data end after ${got} of ${n} bytes`);
  }

  /**
   * Decodes up to `n` bytes into `out[at, at + n)`; returns how many, fewer only when the text ends (at a
   * group boundary). Throws on an invalid character or a text that ends inside a group.
   */
  readSome(out: Uint8Array, at: number, n: number): number {
    const stop = at + n;
    let o = at;
    while (o < stop && this.carryAt < this.carryEnd) out[o++] = this.carry[this.carryAt++]!;
    while (o < stop) {
      fastGroups(this.text, this.pos, this.end, out, o, stop);
      this.pos = fastP; o = fastO;
      if (o >= stop) break;
      if (!this.group()) break;
      while (o < stop && this.carryAt < this.carryEnd) out[o++] = this.carry[this.carryAt++]!;
    }
    return o - at;
  }

  /** Decodes everything that is left into a fresh array. */
  readToEnd(): Uint8Array {
    const out = new Uint8Array(this.available());
    let o = 0;
    while (this.carryAt < this.carryEnd) out[o++] = this.carry[this.carryAt++]!;
    for (;;) {
      fastGroups(this.text, this.pos, this.end, out, o, out.length);
      this.pos = fastP; o = fastO;
      if (!this.group()) break;
      while (this.carryAt < this.carryEnd) out[o++] = this.carry[this.carryAt++]!;
    }
    return out.subarray(0, o);
  }

  /** Decodes one group (skipping whitespace) into `carry`; false at the end of the text. */
  private group(): boolean {
    const text = this.text, end = this.end;
    let p = this.pos, k = 0, v = 0, pads = 0;
    while (k < 4) {
      if (p >= end) {
        if (k === 0) { this.pos = p; return false; }
        throw new Error(`${this.where}: base64 data end inside a 4-character group at byte ${this.base + p} (${k} of 4 characters)`);
      }
      const ch = text[p]!, s = DECODE[ch]!;
      p++;
      if (s === SPACE) continue;
      if (s === INVALID) {
        const shown = ch >= 33 && ch < 127 ? `"${String.fromCharCode(ch)}"` : `byte 0x${ch.toString(16).padStart(2, '0')}`;
        throw new Error(`${this.where}: invalid base64 character ${shown} at byte ${this.base + p - 1}`);
      }
      if (s === PAD) {
        if (k < 2) throw new Error(`${this.where}: misplaced base64 padding "=" at byte ${this.base + p - 1}`);
        pads++;
        v <<= 6;
      } else {
        if (pads > 0) throw new Error(`${this.where}: base64 character after "=" padding at byte ${this.base + p - 1}`);
        v = (v << 6) | s;
      }
      k++;
    }
    this.pos = p;
    this.carry[0] = v >>> 16; this.carry[1] = (v >>> 8) & 255; this.carry[2] = v & 255;
    this.carryAt = 0;
    this.carryEnd = 3 - pads;
    return true;
  }
}

/** Decodes all of `text[start, end)` (one or more padded runs, whitespace allowed) into bytes. */
export function decodeBase64(text: Uint8Array, start: number, end: number, where: string): Uint8Array {
  return new Base64Reader(text, start, end, where).readToEnd();
}
