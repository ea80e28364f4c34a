/**
 * Decoding one `<DataArray>` of a VTK XML file into the model's typed array, whatever its format:
 * `ascii` text, inline `binary` (base64, optionally zlib-compressed) or `appended` (raw or base64,
 * found by its `offset` into the `<AppendedData>` section).
 *
 * Every size is checked before allocation and every error names the file, the piece and the array.
 */
import type { NumericArray } from '../model/fieldArray.ts';
import { parseNumbers, skipSpace } from './asciiNumbers.ts';
import { parseTextInWindows, type FetchText } from './asciiWindows.ts';
import { readInto, type ByteSource } from './byteSource.ts';
import { SCRATCH_BYTES, type ArrayPlan } from './elementConvert.ts';
import { ELEMENT_SIZE, allocateFor, freshArray, isElementType, type ElementType } from './elementTypes.ts';
import { claimMemory } from './memoryBudget.ts';
import type { Base64Batch, Checkpoint, InflateBlock, ParseTextBatch, ReadParts } from './loadOptions.ts';
import { readAppendedArray } from './xmlAppended.ts';
import { memoryBase64, readBase64Array, sourceBase64, type Base64Input } from './xmlBase64Arrays.ts';
import type { BlockFormat } from './xmlBlocks.ts';
import type { AppendedSection, XmlElement } from './xmlScan.ts';

/** What every array of one file shares: its bytes, encoding settings and appended section. */
export interface XmlFileContext {
  /** File name for messages. */
  readonly name: string;
  /**
   * The whole file, or (when its data are all appended) its bytes up to the appended data, or nothing (a
   * file with inline data read by ranges from `source`).
   */
  readonly bytes: Uint8Array;
  /** Whether `bytes` is the whole file; otherwise inline text is read from `source` by its range. */
  readonly wholeFile: boolean;
  /** Offsets of the file's appended arrays, sorted (see `appendedOffsets`). */
  readonly appendedOffsets: readonly number[];
  /** The file, for raw appended arrays (read by ranges at their offsets). */
  readonly source: ByteSource;
  readonly inflate: InflateBlock;
  readonly littleEndian: boolean;
  readonly headerType: 'UInt32' | 'UInt64';
  /** The root's `compressor` attribute, if any. */
  readonly compressor: string | undefined;
  readonly appended: AppendedSection | undefined;
  readonly cp: Checkpoint;
  readonly warnings: string[];
  /** Parses ASCII arrays on several threads (`LoadOptions.parseText`); absent: on this thread. */
  readonly parseText?: ParseTextBatch | undefined;
  /** Decodes uncompressed base64 arrays on several threads (`LoadOptions.decodeBase64`); absent: on this thread. */
  readonly decodeBase64?: Base64Batch | undefined;
  /** Reads large raw appended arrays in parts on several threads (`LoadOptions.readParts`); absent: on this thread. */
  readonly readParts?: ReadParts | undefined;
  /** Decode into SharedArrayBuffers (`LoadOptions.sharedArrays`). */
  readonly sharedArrays?: boolean | undefined;
}

/** A decoded array: values (model type), its file type and components. */
export interface DecodedArray {
  readonly values: NumericArray;
  readonly type: ElementType;
  readonly components: number;
}

const ZLIB = 'vtkZLibDataCompressor';

/** How an array is named in messages: `DataArray "p"`, or its role when it has no name. */
export function arrayLabel(el: XmlElement, role: string): string {
  const n = el.attrs.get('Name');
  return n !== undefined && n !== '' ? `DataArray "${n}"` : `DataArray (${role})`;
}

/** Parses a non-negative integer attribute; undefined when absent. */
export function intAttr(el: XmlElement, attr: string, where: string): number | undefined {
  const s = el.attrs.get(attr);
  if (s === undefined) return undefined;
  const v = Number(s.trim());
  if (!Number.isInteger(v) || v < 0 || v > Number.MAX_SAFE_INTEGER) {
    throw new Error(`${where}: attribute ${attr}="${s}" of <${el.name}> is not a non-negative integer`);
  }
  return v;
}

/** Component count of a DataArray (default 1). */
export function componentsOf(el: XmlElement, where: string): number {
  const nc = intAttr(el, 'NumberOfComponents', where) ?? 1;
  if (nc < 1 || nc > 4096) throw new Error(`${where}: NumberOfComponents="${el.attrs.get('NumberOfComponents')}" is outside 1..4096`);
  return nc;
}

/** The element type named by `type=`, or undefined when it is not numeric (String, Bit, …). */
export function numericType(el: XmlElement): ElementType | undefined {
  const t = el.attrs.get('type') ?? '';
  return isElementType(t) ? t : undefined;
}

/** Counts whitespace-separated tokens in `bytes[start, end)` (for ASCII arrays of unknown length). */
function countTokens(bytes: Uint8Array, start: number, end: number): number {
  let n = 0, inTok = false;
  for (let i = start; i < end; i++) {
    const c = bytes[i]!;
    const sp = c === 32 || c === 10 || c === 13 || c === 9;
    if (!sp && !inTok) n++;
    inTok = !sp;
  }
  return n;
}

const INT_RANGE: Partial<Record<ElementType, readonly [number, number]>> = {
  Int8: [-128, 127], UInt8: [0, 255], Int16: [-32768, 32767], UInt16: [0, 65535],
  Int32: [-2147483648, 2147483647], UInt32: [0, 4294967295],
  Int64: [-(2 ** 53), 2 ** 53], UInt64: [0, 2 ** 53],
};

/** Module scratch for ASCII integers: parsed as doubles in chunks, then range-checked into the target. */
let asciiScratch = new Float64Array(0);
const ASCII_CHUNK = 65536;

/** The array an ASCII array is parsed into (`lead` zero slots first for ids), and whether straight in or through the scratch. */
interface AsciiTarget {
  readonly out: NumericArray;
  readonly lead: number;
  readonly range: readonly [number, number] | undefined;
  readonly inPlace: boolean;
}

function asciiTarget(type: ElementType, count: number, want: Want, where: string, shared: boolean): AsciiTarget {
  const lead = want.target === 'ids' ? want.lead : 0;
  claimMemory((lead + count) * (want.target === 'ids' ? 4 : want.target === 'float64' ? 8 : ELEMENT_SIZE[type]), where);
  const out = want.target === 'ids' ? freshArray(Int32Array, lead + count, shared)
    : want.target === 'float64' ? freshArray(Float64Array, count, shared) : allocateFor(type, count, shared);
  const range = INT_RANGE[type];
  // Straight into the target when it holds doubles (or the file's own floats); through the scratch otherwise.
  const inPlace = want.target !== 'ids' && (!range || out instanceof Float64Array);
  if (!inPlace && asciiScratch.length < ASCII_CHUNK) asciiScratch = new Float64Array(ASCII_CHUNK);
  return { out, lead, range, inPlace };
}

/**
 * Parses values `i … i + k − 1` (k ≤ ASCII_CHUNK) of an ASCII array from `bytes[pos, end)` into the target,
 * checking integers and ids; returns the position after them. `textStart` and `count` are for messages.
 */
function parseAsciiValues(t: AsciiTarget, bytes: Uint8Array, pos: number, end: number, i: number, k: number,
  type: ElementType, want: Want, where: string, textStart: number, count: number): number {
  const { out, range } = t;
  if (t.inPlace) {
    const chunk = out.subarray(i, i + k);
    pos = parseAsciiChunk(bytes, pos, end, chunk, where, textStart, count, i);
    if (range) checkIntegers(chunk, 0, k, range, type, where, i);
    else if (type === 'Float32' && chunk instanceof Float64Array) for (let j = 0; j < k; j++) chunk[j] = Math.fround(chunk[j]!);
  } else {
    const chunk = asciiScratch.subarray(0, k);
    pos = parseAsciiChunk(bytes, pos, end, chunk, where, textStart, count, i);
    if (range) checkIntegers(chunk, 0, k, range, type, where, i);
    if (want.target === 'ids') checkIds(chunk, k, want.min, where, i);
    out.set(chunk, t.lead + i);
  }
  return pos;
}

/**
 * Parses an ASCII array straight into the array `want` asks for: integers go through the scratch (parsed
 * as doubles, checked against their type's range and, for ids, the id range); Float32 values are rounded
 * to single precision even when held as doubles (points).
 */
async function readAscii(ctx: XmlFileContext, el: XmlElement, type: ElementType, expected: number | undefined, where: string, want: Want): Promise<NumericArray> {
  if (!ctx.wholeFile) return readAsciiFromSource(ctx, el, type, expected, where, want);
  const { bytes } = ctx;
  const start = el.textStart, end = el.textEnd;
  let count = expected;
  if (count === undefined) count = countTokens(bytes, start, end);
  else if (count > Math.ceil((end - start) / 2)) {
    throw new Error(`${where}: declares ${count} values, the text holds ${countTokens(bytes, start, end)}`);
  }
  const t = asciiTarget(type, count, want, where, ctx.sharedArrays === true);
  if (ctx.parseText && await asciiInParallel(ctx.parseText, ctx.cp, t, type, want, where, start, end, count,
    (at, w) => { w.set(bytes.subarray(at, at + w.length)); })) return t.out;
  let pos = start;
  for (let i = 0; i < count; i += ASCII_CHUNK) {
    pos = parseAsciiValues(t, bytes, pos, end, i, Math.min(ASCII_CHUNK, count - i), type, want, where, start, count);
    await ctx.cp.at('reading text', pos);
  }
  if (skipSpace(bytes, pos, end) < end) {
    throw new Error(`${where}: declares ${count} values, the text holds ${countTokens(bytes, start, end)}`);
  }
  return t.out;
}

/**
 * The text `[start, end)` of a source in windows of about `src.chunkBytes` that end on whitespace, so no
 * number is split; `visit` gets each window's bytes and the file offset of its first byte.
 */
async function textWindows(src: ByteSource, start: number, end: number, where: string, visit: (w: Uint8Array, at: number) => void | Promise<void>): Promise<void> {
  const size = src.chunkBytes ?? SCRATCH_BYTES, buffer = new Uint8Array(Math.min(size, end - start));
  for (let p = start; p < end;) {
    const w = buffer.subarray(0, Math.min(size, end - p));
    await readInto(src, p, w);
    let cut = w.length;
    if (p + cut < end) {
      while (cut > 0 && !isSpaceByte(w[cut - 1]!)) cut--;
      if (cut === 0) throw new Error(`${where}: a value at byte ${p} runs on for more than ${size} characters (expected whitespace-separated numbers)`);
    }
    await visit(w.subarray(0, cut), p);
    p += cut;
  }
}

/** The separators `countTokens` knows. */
const isSpaceByte = (c: number) => c === 32 || c === 10 || c === 13 || c === 9;

/** Whitespace-separated tokens in a source's text `[start, end)`. */
async function countSourceTokens(src: ByteSource, start: number, end: number, where: string): Promise<number> {
  let n = 0;
  await textWindows(src, start, end, where, (w) => { n += countTokens(w, 0, w.length); });
  return n;
}

/**
 * `readAscii` for a file read by ranges: the array's text is read window by window (never whole), each
 * window's numbers parsed into the target as in `readAscii`, so memory holds the target and one window.
 */
async function readAsciiFromSource(ctx: XmlFileContext, el: XmlElement, type: ElementType, expected: number | undefined, where: string, want: Want): Promise<NumericArray> {
  const src = ctx.source, start = el.textStart, end = el.textEnd;
  const holds = () => countSourceTokens(src, start, end, where);
  let count = expected;
  if (count === undefined) count = await holds();
  else if (count > Math.ceil((end - start) / 2)) throw new Error(`${where}: declares ${count} values, the text holds ${await holds()}`);
  const t = asciiTarget(type, count, want, where, ctx.sharedArrays === true), n = count;
  if (ctx.parseText && await asciiInParallel(ctx.parseText, ctx.cp, t, type, want, where, start, end, n, (at, w) => readInto(src, at, w))) return t.out;
  let i = 0, tooMany = false;
  await textWindows(src, start, end, where, async (w, at) => {
    if (tooMany) return;
    // parse what the array may hold before saying it holds too much, so a bad value is named as the bytes path names it
    const inWindow = countTokens(w, 0, w.length), take = Math.min(inWindow, n - i);
    let pos = 0;
    for (let left = take; left > 0;) {
      const k = Math.min(ASCII_CHUNK, left);
      pos = parseAsciiValues(t, w, pos, w.length, i, k, type, want, where, 0, n);
      i += k; left -= k;
    }
    if (take < inWindow) { tooMany = true; return; }
    // every token of the window was a number: anything left means the two counts disagree (odd separators)
    if (skipSpace(w, pos, w.length) < w.length) throw new Error(`${where}: unexpected text at byte ${at + skipSpace(w, pos, w.length)} (expected whitespace-separated numbers)`);
    await ctx.cp.at('reading text', at + w.length);
  });
  if (tooMany || i < n) throw new Error(`${where}: declares ${n} values, the text holds ${await holds()}`);
  return t.out;
}

/**
 * An ASCII array parsed on several threads (`asciiWindows.ts`) into the target `t`, each window's doubles
 * checked and stored as `parseAsciiValues` does. False when anything is off (a window that does not parse, a
 * value that fails its check, fewer or more numbers than `count`): the caller then parses the array on this
 * thread, into the same target, and says what is wrong exactly as it does without threads.
 */
async function asciiInParallel(parse: ParseTextBatch, cp: Checkpoint, t: AsciiTarget, type: ElementType, want: Want, where: string,
  start: number, end: number, count: number, fetch: FetchText): Promise<boolean> {
  const got = await parseTextInWindows(parse, fetch, start, end, (values, first) => {
    if (first + values.length > count) return false;
    try {
      if (t.range) checkIntegers(values, 0, values.length, t.range, type, where, first);
      if (want.target === 'ids') checkIds(values, values.length, want.min, where, first);
    } catch {
      return false;
    }
    if (t.inPlace && type === 'Float32' && t.out instanceof Float64Array) {
      for (let j = 0; j < values.length; j++) t.out[first + j] = Math.fround(values[j]!);
    } else t.out.set(values, t.lead + first);
    return true;
  }, cp);
  return got === count;
}

/** Checks parsed values are ids in `[min, 2^31 − 1]`; `base` is the chunk's index in the array, for messages. */
function checkIds(a: Float64Array, n: number, min: number, where: string, base: number): void {
  for (let i = 0; i < n; i++) {
    const v = a[i]!;
    if (!(v >= min && v <= 0x7fffffff) || !Number.isInteger(v)) throw new Error(`${where}: value ${v} at index ${base + i} is not an id in ${min}..${0x7fffffff}`);
  }
}

/** Parses one chunk of an ASCII array; `first` is the chunk's index in the array, for messages. */
function parseAsciiChunk(bytes: Uint8Array, pos: number, end: number, out: NumericArray, where: string, textStart: number, count: number, first: number): number {
  try {
    return parseNumbers(bytes, pos, end, out, where);
  } catch (e) {
    if (!(e instanceof Error)) throw e;
    if (/expected \d+ numbers, found only/.test(e.message)) {
      throw new Error(`${where}: declares ${count} values, the text holds ${countTokens(bytes, textStart, end)}`);
    }
    throw new Error(e.message.replace(/: value (\d+) is /, (_, i: string) => `: value ${first + Number(i)} is `));
  }
}

function checkIntegers(a: NumericArray, at: number, n: number, range: readonly [number, number], type: ElementType, where: string, base = 0): void {
  const [lo, hi] = range;
  for (let i = at; i < at + n; i++) {
    const v = a[i]!;
    if (!(v >= lo && v <= hi) || Math.floor(v) !== v) {
      throw new Error(`${where}: value ${v} at index ${base + i} is not a valid ${type}`);
    }
  }
}

/** What the model makes of an array: its own type, doubles (points), or Int32 ids in `[min, 2^31 − 1]` after `lead` zero slots. */
type Want = { readonly target: 'values' | 'float64'; readonly countBytes?: boolean } | { readonly target: 'ids'; readonly min: number; readonly lead: number };

/** The appended offset of a DataArray, checked against the appended section. */
function appendedOffset(ctx: XmlFileContext, el: XmlElement, where: string): { app: AppendedSection; off: number } {
  const app = ctx.appended;
  if (!app) throw new Error(`${where}: format="appended" but the file has no <AppendedData> section`);
  const off = intAttr(el, 'offset', where);
  if (off === undefined) throw new Error(`${where}: format="appended" needs an offset attribute`);
  if (app.start + off > app.end) {
    throw new Error(`${where}: offset ${off} lies beyond the appended data (${app.end - app.start} ${app.encoding === 'raw' ? 'bytes' : 'characters'})`);
  }
  return { app, off };
}

/** The base64 text of a binary array: inline in the element, or at its offset in base64 appended data. */
function base64Input(ctx: XmlFileContext, el: XmlElement, format: string, where: string): Base64Input {
  if (format === 'binary') {
    return ctx.wholeFile ? memoryBase64(ctx.bytes, el.textStart, el.textEnd, where) : sourceBase64(ctx.source, el.textStart, el.textEnd, where);
  }
  const { app, off } = appendedOffset(ctx, el, where);
  if (ctx.wholeFile) return memoryBase64(ctx.bytes, app.start + off, app.end, where);
  const next = firstAbove(ctx.appendedOffsets, off);
  return sourceBase64(ctx.source, app.start + off, app.end, where, next === undefined ? app.end : Math.min(app.end, app.start + next));
}

/** The first value of sorted `a` above `v` (binary search), or undefined. */
function firstAbove(a: readonly number[], v: number): number | undefined {
  let lo = 0, hi = a.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (a[mid]! <= v) lo = mid + 1; else hi = mid;
  }
  return a[lo];
}

/** The appended offsets of every DataArray under `el`, sorted (where each array's data ends, at the latest). */
export function appendedOffsets(el: XmlElement, out: number[] = []): number[] {
  for (const c of el.children) {
    const o = (c.name === 'DataArray' || c.name === 'Array') && c.attrs.get('format') === 'appended' ? Number(c.attrs.get('offset')) : NaN;
    if (Number.isSafeInteger(o) && o >= 0) out.push(o);
    appendedOffsets(c, out);
  }
  return out;
}

/** How a binary array of `type` becomes the form `want` asks for. */
function planOf(type: ElementType, ctx: XmlFileContext, want: Want, where: string): ArrayPlan {
  const shared = ctx.sharedArrays ? { shared: true } : {};
  return want.target === 'ids'
    ? { type, littleEndian: ctx.littleEndian, target: 'ids', min: want.min, lead: want.lead, where, ...shared }
    : { type, littleEndian: ctx.littleEndian, target: want.target, where, ...shared, ...(want.countBytes ? { countBytes: true } : {}) };
}

/** Decodes the numbers of a DataArray into the form `want` asks for. */
async function decode(ctx: XmlFileContext, el: XmlElement, where: string, expectedValues: number | undefined, want: Want): Promise<DecodedArray> {
  const type = numericType(el);
  if (!type) throw new Error(`${where}: type="${el.attrs.get('type') ?? ''}" is not a numeric type (expected Int8 … UInt64, Float32 or Float64)`);
  const components = componentsOf(el, where);
  const format = el.attrs.get('format') ?? 'ascii';
  let values: NumericArray;
  let reached = el.textEnd;
  if (format === 'ascii') {
    values = await readAscii(ctx, el, type, expectedValues, where, want);
  } else if (format === 'binary' || format === 'appended') {
    const compressor = ctx.compressor;
    if (compressor && compressor !== ZLIB) {
      throw new Error(`${where}: compressor "${compressor}" is not supported; fieldtally reads only zlib-compressed (vtkZLibDataCompressor) or uncompressed binary data`);
    }
    const fmt: BlockFormat = { headerType: ctx.headerType, littleEndian: ctx.littleEndian, compressed: compressor === ZLIB };
    if (format === 'appended' && ctx.appended?.encoding === 'raw') {
      const { app, off } = appendedOffset(ctx, el, where);
      const plan = planOf(type, ctx, want, where);
      const r = await readAppendedArray({ source: ctx.source, start: app.start + off, end: app.end, fmt, inflate: ctx.inflate, cp: ctx.cp, parts: ctx.readParts }, plan, expectedValues);
      values = r.values;
      reached = r.reached;
    } else {
      const input = base64Input(ctx, el, format, where);
      try {
        values = await readBase64Array(input, fmt, planOf(type, ctx, want, where), expectedValues, ctx.inflate, ctx.cp, ctx.decodeBase64);
        reached = input.position();
      } finally {
        input.release();
      }
    }
  } else {
    throw new Error(`${where}: format="${format}" is not supported (expected ascii, binary or appended)`);
  }
  const n = want.target === 'ids' ? values.length - want.lead : values.length;
  if (n % components !== 0) {
    throw new Error(`${where}: holds ${n} values, not a whole number of ${components}-component tuples`);
  }
  await ctx.cp.at('arrays', reached);
  return { values, type, components };
}

/**
 * Decodes a DataArray. `expectedValues` (tuples × components) is checked when known; otherwise the
 * count comes from the data (block header or number of ASCII tokens). `where` names the array. With
 * `float64`, the values come as a Float64Array whatever the file's type (points).
 */
export function readDataArray(ctx: XmlFileContext, el: XmlElement, where: string, expectedValues?: number, float64 = false): Promise<DecodedArray> {
  return decode(ctx, el, where, expectedValues, { target: float64 ? 'float64' : 'values' });
}

/** `readDataArray` for the cell types: a UInt8 array's bytes are also counted by value as they are read (`ArrayPlan.countBytes`). */
export function readCellTypesArray(ctx: XmlFileContext, el: XmlElement, where: string, expectedValues: number): Promise<DecodedArray> {
  return decode(ctx, el, where, expectedValues, { target: 'values', countBytes: true });
}

/**
 * Decodes an integer DataArray as Int32 ids in `[min, 2^31 − 1]` (connectivity, offsets, face streams).
 * With `lead`, the ids start after that many zero slots (cell offsets with their leading 0).
 */
export async function readIdDataArray(ctx: XmlFileContext, el: XmlElement, where: string, expectedValues: number | undefined, min = 0, lead = 0): Promise<Int32Array> {
  return (await decode(ctx, el, where, expectedValues, { target: 'ids', min, lead })).values as Int32Array;
}
