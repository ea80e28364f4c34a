/**
 * A forward cursor over the bytes of a legacy `.vtk` file: whitespace-separated words for keywords,
 * counts and names, whole lines for the header and metadata blocks, the start of binary data, and
 * positions named for messages (line numbers in ASCII files, byte offsets in binary ones).
 *
 * The cursor sees a window of the file: all of it (in-memory files), or, for a file read from a source,
 * a window that moves forward: for a binary file the text around the binary arrays (the window starts
 * after each array, which is read straight from the source into its final array, `binaryArray`); for a
 * text file about `DATA_WINDOW_BYTES` of text while its numbers are parsed (`textWindow`); line numbers
 * for messages are counted only when a message is shown (`resolve`). Keyword text that runs past the
 * window (sections longer than `WINDOW_BYTES`, which VTK never writes) stops the read with
 * `WINDOW_EXHAUSTED`, and the caller starts again on the whole file.
 */
import type { NumericArray } from '../model/fieldArray.ts';
import { readInto, type ByteSource } from './byteSource.ts';
import type { ArrayPlan } from './elementConvert.ts';
import { ELEMENT_SIZE } from './elementTypes.ts';
import type { Checkpoint } from './loadOptions.ts';
import { readArray } from './sourceArrays.ts';

/** Longest word accepted; legacy names and keywords are short, so a longer one means we are lost in data. */
const MAX_WORD = 4096;

const isSpace = (c: number) => c === 32 || c === 10 || c === 13 || c === 9 || c === 11 || c === 12;

const utf8 = new TextDecoder('utf-8');

/** Bytes of text the window holds after each binary array. */
export const WINDOW_BYTES = 64 << 10;

/** Bytes of text the window holds while the numbers of a text file read from a source are parsed. */
export const DATA_WINDOW_BYTES = 1 << 20;

/** Thrown (not an error) when the text runs past the window of a file read from a source. */
export const WINDOW_EXHAUSTED = Symbol('legacy text beyond the window');

/** Marks a byte position in a message, to be turned into a line number by `resolve`. */
const MARK = '\u0001';
const MARKED = /\u0001(\d+)\u0001/g;

/** A word quoted for a message: printable ASCII only, at most 40 characters. */
export function quoted(s: string): string {
  const t = s.length > 40 ? `${s.slice(0, 40)}…` : s;
  return `"${t.replace(/[^\x20-\x7e…]/g, '?')}"`;
}

/** Decodes VTK's `%XX` escapes in legacy names (a space is written as `%20`). */
export function decodeName(s: string): string {
  if (!s.includes('%')) return s;
  const src = new TextEncoder().encode(s), out = new Uint8Array(src.length);
  const hex = (c: number) => (c >= 48 && c <= 57 ? c - 48 : c >= 65 && c <= 70 ? c - 55 : c >= 97 && c <= 102 ? c - 87 : -1);
  let n = 0;
  for (let i = 0; i < src.length; i++) {
    const hi = i + 2 < src.length && src[i] === 37 ? hex(src[i + 1]!) : -1;
    const lo = hi >= 0 ? hex(src[i + 2]!) : -1;
    if (lo >= 0) { out[n++] = hi * 16 + lo; i += 2; } else out[n++] = src[i]!;
  }
  return utf8.decode(out.subarray(0, n));
}

export class LegacyCursor {
  /** Current byte position in the window (`bytes`); the file offset is `base + pos`. */
  pos = 0;
  /** Where the last word read started (messages point at keywords). */
  wordStart = 0;
  /** Whether data blocks are big-endian binary (set once the header is read). */
  binary = false;
  /** Whether arrays are decoded into SharedArrayBuffers (`LoadOptions.sharedArrays`). */
  shared = false;
  /** The window: bytes `[base, base + bytes.length)` of the file. */
  bytes: Uint8Array;
  /** File offset of `bytes[0]`. */
  base = 0;
  private memoPos = 0;
  private memoLine = 1;
  /** Reused for the windows of a file read from a source. */
  private windowBuffer = new Uint8Array(0);

  /**
   * A cursor over `source`, starting with `window` (the file's first bytes, or all of them).
   */
  constructor(readonly source: ByteSource, window: Uint8Array, readonly file: string) {
    this.bytes = window;
  }

  /** Whether the window reaches the end of the file. */
  get whole(): boolean {
    return this.base + this.bytes.length >= this.source.size;
  }

  /** Bytes left in the file from the current position. */
  get remaining(): number {
    return this.source.size - (this.base + this.pos);
  }

  /** The end of the window was reached at `p`: the end of the file, or text beyond the window. */
  private atEnd(p: number): boolean {
    if (p < this.bytes.length) return false;
    if (!this.whole) throw WINDOW_EXHAUSTED;
    return true;
  }

  /** Replaces the window by all of the file (its bytes from offset 0), keeping the position. */
  useWhole(all: Uint8Array): void {
    this.pos += this.base;
    this.wordStart += this.base;
    this.base = 0;
    this.bytes = all;
  }

  /** Moves the window to start at the current position (at least `n` bytes of it, up to the end of the file). */
  private async refill(n: number): Promise<void> {
    const at = this.base + this.pos, len = Math.min(Math.max(n, WINDOW_BYTES), this.source.size - at);
    if (this.binary) {
      this.bytes = await this.source.read(at, len);
    } else {
      // text: nothing keeps a view of the old window (words and values are copied out), so its buffer is reused
      if (this.windowBuffer.length < len) this.windowBuffer = new Uint8Array(Math.max(len, DATA_WINDOW_BYTES));
      this.bytes = this.windowBuffer.subarray(0, len);
      await readInto(this.source, at, this.bytes);
    }
    this.wordStart = this.wordStart + this.base - at;
    this.base = at;
    this.pos = 0;
  }

  /** Makes sure `n` bytes from the position are in the window (or the rest of the file, if shorter). */
  async ensure(n: number): Promise<void> {
    if (this.bytes.length - this.pos < n && !this.whole) await this.refill(n);
  }

  /**
   * For the numbers of a text file read from a source: moves the window on when less than a sixteenth of
   * `DATA_WINDOW_BYTES` is left ahead, and returns the end of the whole words in it (after its last
   * whitespace, or its end at the end of the file).
   */
  async textWindow(): Promise<number> {
    if (!this.whole && this.bytes.length - this.pos < DATA_WINDOW_BYTES / 16) await this.refill(DATA_WINDOW_BYTES);
    const b = this.bytes;
    if (this.whole) return b.length;
    let e = b.length;
    while (e > this.pos && !isSpace(b[e - 1]!)) e--;
    return e;
  }

  /** After data parsed from windows: keeps `WINDOW_BYTES / 2` of text ahead for the keywords that follow. */
  async keepTextAhead(): Promise<void> {
    if (!this.whole && this.bytes.length - this.pos < WINDOW_BYTES / 2) await this.refill(WINDOW_BYTES);
  }

  /** Moves the position `n` bytes on (past data the caller has checked fit in the file), keeping text ahead in the window. */
  async advance(n: number): Promise<void> {
    this.pos += n;
    if (!this.whole && this.bytes.length - this.pos < WINDOW_BYTES / 2) await this.refill(WINDOW_BYTES);
  }

  /**
   * Reads `count` binary elements at the position into the final array `plan` asks for, straight from
   * the source, and moves past them. The caller has checked that they fit in the file.
   */
  async binaryArray(count: number, plan: ArrayPlan, cp: Checkpoint, stage: string): Promise<NumericArray> {
    const values = await readArray(this.source, this.base + this.pos, count, this.shared ? { ...plan, shared: true } : plan, { progress: { cp, stage } });
    await this.advance(count * ELEMENT_SIZE[plan.type]);
    return values;
  }

  /** 1-based line number of byte `pos` of a file read whole; counts forward from the last query, so a pass over the file is linear. */
  lineOf(pos: number): number {
    const b = this.bytes;
    if (pos < this.memoPos) { this.memoPos = 0; this.memoLine = 1; }
    let line = this.memoLine;
    for (let i = b.indexOf(10, this.memoPos); i >= 0 && i < pos; i = b.indexOf(10, i + 1)) line++;
    this.memoPos = pos;
    this.memoLine = line;
    return line;
  }

  /**
   * `line N` in ASCII files, `byte N` in binary ones (line numbers mean little after binary data). Line
   * numbers are only counted if a message is shown: `at` leaves a mark that `resolve` replaces.
   */
  at(pos: number = this.wordStart): string {
    return this.binary ? `byte ${this.base + pos}` : `line ${MARK}${this.base + pos}${MARK}`;
  }

  /**
   * Replaces the position marks left by `at` in messages with line numbers: from the window when it holds
   * the whole file, else by one more pass over the file up to the last mark (only when a message has one).
   */
  async resolve(messages: readonly string[]): Promise<string[]> {
    const marks = [...new Set(messages.flatMap((m) => [...m.matchAll(MARKED)].map((x) => Number(x[1]))))].sort((a, b) => a - b);
    if (marks.length === 0) return [...messages];
    const line = new Map<number, number>();
    if (this.base === 0 && this.bytes.length >= this.source.size) {
      this.memoPos = 0; this.memoLine = 1;
      for (const p of marks) line.set(p, this.lineOf(p));
    } else {
      const buf = new Uint8Array(Math.min(DATA_WINDOW_BYTES, this.source.size));
      let n = 1, k = 0;
      for (let base = 0; k < marks.length && base < this.source.size; base += buf.length) {
        const len = Math.min(buf.length, this.source.size - base), chunk = buf.subarray(0, len);
        await readInto(this.source, base, chunk);
        let p = 0;
        for (; k < marks.length && marks[k]! < base + len; k++) {
          const to = marks[k]! - base;
          for (let i = chunk.indexOf(10, p); i >= 0 && i < to; i = chunk.indexOf(10, i + 1)) n++;
          p = to;
          line.set(marks[k]!, n);
        }
        for (let i = chunk.indexOf(10, p); i >= 0; i = chunk.indexOf(10, i + 1)) n++;
      }
      for (; k < marks.length; k++) line.set(marks[k]!, n);
    }
    return messages.map((m) => m.replace(MARKED, (_, p: string) => String(line.get(Number(p)))));
  }

  /** Message prefix naming the file, the section and its position: `f.vtk: POINTS (line 5)`. */
  where(section: string, pos: number = this.wordStart): string {
    return `${this.file}: ${section} (${this.at(pos)})`;
  }

  /** Skips whitespace; false at the end of the file. */
  skipSpace(): boolean {
    const b = this.bytes, n = b.length;
    let p = this.pos;
    while (p < n && isSpace(b[p]!)) p++;
    this.pos = p;
    return !this.atEnd(p);
  }

  /** The next whitespace-separated word (UTF-8), or undefined at the end of the file. */
  word(): string | undefined {
    if (!this.skipSpace()) return undefined;
    const b = this.bytes, n = b.length, start = this.pos;
    let p = start;
    while (p < n && !isSpace(b[p]!)) {
      p++;
      if (p - start > MAX_WORD) {
        throw new Error(`${this.file}: expected a keyword or name at ${this.at(start)}, found ${MAX_WORD}+ bytes without a space (is a data block longer than declared?)`);
      }
    }
    this.atEnd(p);
    this.wordStart = start;
    this.pos = p;
    return utf8.decode(b.subarray(start, p));
  }

  /** The next word without consuming it. */
  peekWord(): string | undefined {
    const pos = this.pos, ws = this.wordStart;
    try {
      return this.word();
    } catch (e) {
      if (e === WINDOW_EXHAUSTED) throw e;
      return undefined;
    } finally {
      this.pos = pos;
      this.wordStart = ws;
    }
  }

  /** The next word, or an error (prefixed by `where`) saying what was expected. */
  need(what: string, where: string): string {
    const w = this.word();
    if (w === undefined) throw new Error(`${where}: the file ends where ${what} was expected`);
    return w;
  }

  /** The next word as a non-negative integer (a count or size), or an error naming what was expected. */
  count(what: string, where: string): number {
    const w = this.need(what, where);
    if (!/^\+?\d+$/.test(w) || !Number.isSafeInteger(Number(w))) {
      throw new Error(`${where}: ${what} is ${quoted(w)}, expected a non-negative integer`);
    }
    return Number(w);
  }

  /** The rest of the current line (without `\r`), moving past its end; undefined at the end of the file. */
  line(): string | undefined {
    const b = this.bytes, n = b.length;
    if (this.atEnd(this.pos)) return undefined;
    const start = this.pos;
    let p = start;
    while (p < n && b[p] !== 10) p++;
    this.atEnd(p);
    this.pos = p < n ? p + 1 : p;
    let end = p;
    if (end > start && b[end - 1] === 13) end--;
    return utf8.decode(b.subarray(start, end));
  }

  /** Moves past the end of the current line: binary data start right after the newline of their header line. */
  toNextLine(where: string): void {
    const b = this.bytes, n = b.length;
    let p = this.pos;
    while (p < n && b[p] !== 10) p++;
    if (this.atEnd(p)) throw new Error(`${where}: the file ends before the binary data of this section`);
    this.pos = p + 1;
  }

  /**
   * Skips a `METADATA` block if one comes next (VTK writes them after arrays: component names and
   * information keys). The block ends at a blank line, or just before a line that starts a new section.
   */
  skipMetadata(): void {
    const w = this.peekWord();
    if (w === undefined || w.toUpperCase() !== 'METADATA') return;
    this.word();
    const where = this.where('METADATA');
    this.line();
    for (;;) {
      const start = this.pos;
      const l = this.line();
      if (l === undefined) throw new Error(`${where}: the file ends inside the METADATA block; expected a blank line closing it (is the file truncated?)`);
      if (l.trim() === '') return;
      if (SECTION_START.test(l)) { this.pos = start; return; }
    }
  }
}

/** Lines that cannot belong to a metadata block (guards against a block missing its blank line). */
const SECTION_START = /^\s*(POINTS|CELLS|CELL_TYPES|VERTICES|LINES|POLYGONS|TRIANGLE_STRIPS|POINT_DATA|CELL_DATA|SCALARS|COLOR_SCALARS|VECTORS|NORMALS|TENSORS6?|TEXTURE_COORDINATES|FIELD|GLOBAL_IDS|PEDIGREE_IDS|EDGE_FLAGS|LOOKUP_TABLE|OFFSETS|CONNECTIVITY)\s/i;
