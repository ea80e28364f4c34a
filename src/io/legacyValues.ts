/**
 * Data blocks of legacy `.vtk` files: `count` values of one type at the cursor, either whitespace-
 * separated text (parsed in chunks of `ASCII_CHUNK` values with a checkpoint between chunks) or
 * big-endian binary starting right after the header line. Sizes are checked against the bytes left
 * before anything is allocated: a binary value takes its element size, a text value at least 2 bytes
 * (a digit and a separator).
 */
import { parseNumbers, parseSomeNumbers, parsedCount, type NumberSink } from './asciiNumbers.ts';
import type { ArrayPlan } from './elementConvert.ts';
import { ELEMENT_SIZE, allocateFor, freshArray, type ElementType } from './elementTypes.ts';
import { claimMemory } from './memoryBudget.ts';
import type { Checkpoint } from './loadOptions.ts';
import { quoted, type LegacyCursor } from './legacyCursor.ts';
import { integerRange } from './legacyTypes.ts';
import type { NumericArray } from '../model/fieldArray.ts';

/** Text values parsed between two checkpoints. */
export const ASCII_CHUNK = 1 << 20;

const STAGE = 'reading legacy .vtk';

// Integer and colour values are parsed into doubles first, then checked and narrowed.
let scratch = new Float64Array(0);
function scratchOf(n: number): Float64Array {
  if (scratch.length < n) scratch = new Float64Array(Math.max(n, Math.min(ASCII_CHUNK, 2 * scratch.length)));
  return scratch.subarray(0, n);
}

/** Throws unless `count` values of `size` bytes (binary) or 2 bytes (text) fit in what is left of the file. */
export function checkRoom(cur: LegacyCursor, count: number, size: number, where: string): void {
  if (count === 0) return;
  const need = cur.binary ? count * size : 2 * count - 1;
  if (need > cur.remaining) {
    throw new Error(`${where}: declares ${count} values, which need at least ${need} bytes${cur.binary ? '' : ' as text'}, but only ${cur.remaining} bytes are left (file truncated, or a wrong count)`);
  }
}

const isSpace = (c: number) => c === 32 || (c >= 9 && c <= 13);

/** Start and end of the `index`-th whitespace-separated token from `from`, or undefined if the file ends first. */
function tokenAt(bytes: Uint8Array, from: number, index: number): [number, number] | undefined {
  const n = bytes.length;
  let p = from;
  for (let k = 0; ; k++) {
    while (p < n && isSpace(bytes[p]!)) p++;
    if (p >= n) return undefined;
    const s = p;
    while (p < n && !isSpace(bytes[p]!)) p++;
    if (k === index) return [s, p];
  }
}

const text = (bytes: Uint8Array, s: number, e: number) => new TextDecoder('latin1').decode(bytes.subarray(s, Math.min(e, s + 64)));

function isNumberToken(t: string): boolean {
  return !Number.isNaN(Number(t)) || /^[+-]?(nan|inf(inity)?)$/i.test(t);
}

/** Rebuilds a parse failure inside a chunk into a message with the value's number and line. */
function parseFailureFrom(cur: LegacyCursor, from: number, index: number, left: number, total: number, where: string): Error {
  let p = from;
  for (let j = 0; j < left; j++) {
    const t = tokenAt(cur.bytes, p, 0);
    if (!t) return new Error(`${where}: expected ${total} values, but the file ends after ${index + j}`);
    const s = text(cur.bytes, t[0], t[1]);
    if (!isNumberToken(s)) {
      return new Error(`${where}: value ${index + j} (${cur.at(t[0])}) is ${quoted(s)}, expected a number (the section declares ${total} values)`);
    }
    p = t[1];
  }
  return new Error(`${where}: cannot parse the values (the section declares ${total})`);
}

/**
 * Parses `total` text values at the cursor, in pieces of at most `ASCII_CHUNK`: each piece is parsed into
 * `sink(i, k)` (room for values i … i + k − 1), then `take(i, n, start)` gets the n values parsed, with
 * the window still holding their text from `start`. A file read whole is parsed in place; one read by
 * windows piece by piece up to each window's last whole word. Failures name the value and its line.
 */
async function eachTextPiece(cur: LegacyCursor, total: number, where: string, cp: Checkpoint,
  sink: (i: number, k: number) => NumberSink, take: (i: number, n: number, start: number) => void): Promise<void> {
  const streamed = !cur.whole;
  for (let i = 0; i < total;) {
    const end = streamed ? await cur.textWindow() : cur.bytes.length;
    const k = Math.min(ASCII_CHUNK, total - i), start = cur.pos;
    let n = k;
    try {
      if (streamed) { cur.pos = parseSomeNumbers(cur.bytes, start, end, sink(i, k), where); n = parsedCount(); }
      else cur.pos = parseNumbers(cur.bytes, start, end, sink(i, k), where);
    } catch {
      throw parseFailureFrom(cur, start, i, k, total, where);
    }
    if (n === 0) {
      // nothing whole in the window: the end of the file, or a word longer than the window
      if (cur.whole) throw parseFailureFrom(cur, start, i, k, total, where);
      // A long run of blanks is valid text: step over it and read on.
      let p = start;
      const b = cur.bytes;
      while (p < b.length && isSpace(b[p]!)) p++;
      if (p > start) { cur.pos = p; continue; }
      throw new Error(`${where}: value ${i} (${cur.at(start)}) runs on for more than ${cur.bytes.length - start} bytes, expected a number`);
    }
    take(i, n, start);
    i += n;
    await cp.at(STAGE, cur.base + cur.pos);
  }
  if (streamed) await cur.keepTextAhead();
}

/**
 * Reads `out.length` text values into `out` (room already checked), checking integer targets against
 * `range`. Values go straight into float targets and through the scratch buffer into integer ones.
 */
async function readAscii(cur: LegacyCursor, out: NumericArray | Int32Array, range: [number, number] | undefined, what: string, where: string, cp: Checkpoint): Promise<void> {
  if (!range) {
    await eachTextPiece(cur, out.length, where, cp, (i, k) => out.subarray(i, i + k), () => undefined);
    return;
  }
  const lo = range[0], hi = range[1];
  await eachTextPiece(cur, out.length, where, cp, (_, k) => scratchOf(k), (i, n, start) => {
    const s = scratchOf(n);
    for (let j = 0; j < n; j++) {
      const v = s[j]!;
      if (!(v >= lo && v <= hi) || Math.floor(v) !== v) {
        const t = tokenAt(cur.bytes, start, j)!;
        throw new Error(`${where}: value ${i + j} (${cur.at(t[0])}) is ${quoted(text(cur.bytes, t[0], t[1]))}, expected ${what} in ${lo}..${hi}`);
      }
      out[i + j] = v;
    }
  });
}

/**
 * Reads `count` big-endian binary values starting on the line after the header, straight from the file
 * into the array `plan` asks for (a copy, never a view of the file: the file's buffer can go).
 */
async function readBinary(cur: LegacyCursor, count: number, plan: ArrayPlan, cp: Checkpoint): Promise<NumericArray> {
  cur.toNextLine(plan.where);
  checkRoom(cur, count, ELEMENT_SIZE[plan.type], plan.where);
  return cur.binaryArray(count, plan, cp, STAGE);
}

/** Reads `count` values of `type` into the model's array for that type (64-bit integers as Float64Array, exact to 2^53). */
export async function readValues(cur: LegacyCursor, count: number, type: ElementType, where: string, cp: Checkpoint, float64 = false): Promise<NumericArray> {
  if (cur.binary) {
    const a = await readBinary(cur, count, { type, littleEndian: false, target: float64 ? 'float64' : 'values', where }, cp);
    await cp.at(STAGE, cur.base + cur.pos);
    return a;
  }
  checkRoom(cur, count, 1, where);
  claimMemory(count * ELEMENT_SIZE[type], where);
  const out = allocateFor(type, count, cur.shared);
  const range = integerRange(type);
  await readAscii(cur, out, range, `an integer (${type})`, where, cp);
  if (!float64 || out instanceof Float64Array) return out;
  const doubles = freshArray(Float64Array, count, cur.shared);
  doubles.set(out);
  return doubles;
}

/**
 * Reads a binary file's `CELL_TYPES` (`count` values of `type`) as cell-type bytes; a value outside 0..255
 * is refused with `badCellType`'s error. Text files keep `readValues`.
 */
export async function readCellTypeBytes(cur: LegacyCursor, count: number, type: ElementType, where: string, cp: Checkpoint, badCellType: (index: number, value: number) => Error): Promise<Uint8Array> {
  const a = await readBinary(cur, count, { type, littleEndian: false, target: 'cellTypes', where, badCellType }, cp);
  await cp.at(STAGE, cur.base + cur.pos);
  return a as Uint8Array;
}

/** Reads `count` integer values of `type` as ids, each checked in `min..max`. */
export async function readIds(cur: LegacyCursor, count: number, type: ElementType, where: string, cp: Checkpoint, min = 0, max = 0x7fffffff): Promise<Int32Array> {
  if (cur.binary) {
    const ids = await readBinary(cur, count, { type, littleEndian: false, target: 'ids', min, max, where }, cp);
    await cp.at(STAGE, cur.base + cur.pos);
    return ids as Int32Array;
  }
  checkRoom(cur, count, 1, where);
  const out = freshArray(Int32Array, count, cur.shared);
  await readAscii(cur, out, [min, max], 'an integer id', where, cp);
  return out;
}

/**
 * Reads colour scalars (`COLOR_SCALARS`): binary files hold unsigned bytes, text files floats in 0..1,
 * which become bytes as VTK's reader makes them (×255, rounded). Returns `count` bytes.
 */
export async function readColors(cur: LegacyCursor, count: number, where: string, cp: Checkpoint): Promise<Uint8Array> {
  if (cur.binary) return (await readValues(cur, count, 'UInt8', where, cp)) as Uint8Array;
  checkRoom(cur, count, 1, where);
  const out = freshArray(Uint8Array, count, cur.shared);
  await eachTextPiece(cur, count, where, cp, (_, k) => scratchOf(k), (i, n) => {
    const s = scratchOf(n);
    for (let j = 0; j < n; j++) {
      const v = Math.floor(s[j]! * 255 + 0.5);
      out[i + j] = v < 0 ? 0 : v > 255 ? 255 : v;
    }
  });
  return out;
}

/** Skips `count` values whose binary form has `binaryType` (an inline lookup table: floats as text, bytes in binary). */
export async function skipValues(cur: LegacyCursor, count: number, binaryType: ElementType, where: string, cp: Checkpoint): Promise<void> {
  if (cur.binary) {
    cur.toNextLine(where);
    checkRoom(cur, count, ELEMENT_SIZE[binaryType], where);
    await cur.advance(count * ELEMENT_SIZE[binaryType]);
    return;
  }
  checkRoom(cur, count, 1, where);
  await eachTextPiece(cur, count, where, cp, (_, k) => scratchOf(k), () => undefined);
}

/**
 * Skips `count` strings of a string array. Text files hold one (%-escaped) string per line; binary files
 * a big-endian length whose first two bits give its size (11: 6-bit length in 1 byte, 10: 14 bits in 2,
 * 01: 30 bits in 4, 00: 62 bits in 8), then the bytes.
 */
export async function skipStrings(cur: LegacyCursor, count: number, where: string): Promise<void> {
  cur.toNextLine(where);
  if (count > cur.remaining + 1) {
    throw new Error(`${where}: declares ${count} strings, but only ${cur.remaining} bytes are left (file truncated, or a wrong count)`);
  }
  for (let i = 0; i < count; i++) {
    if (!cur.binary) {
      if (cur.line() === undefined) throw new Error(`${where}: expected ${count} strings, but the file ends after ${i}`);
      continue;
    }
    await cur.ensure(8);
    if (cur.remaining < 1) throw new Error(`${where}: expected ${count} strings, but the file ends after ${i}`);
    const b = cur.bytes;
    const first = b[cur.pos]!, kind = first >> 6, head = kind === 3 ? 1 : kind === 2 ? 2 : kind === 1 ? 4 : 8;
    if (cur.remaining < head) throw new Error(`${where}: string ${i} has a ${head}-byte length, but the file ends`);
    let len = first & 0x3f;
    for (let k = 1; k < head; k++) len = len * 256 + b[cur.pos + k]!;
    if (head + len > cur.remaining) {
      throw new Error(`${where}: string ${i} declares ${len} bytes, but only ${cur.remaining - head} are left`);
    }
    await cur.advance(head + len);
  }
}
