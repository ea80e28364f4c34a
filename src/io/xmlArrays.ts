/**
 * Decoding one `<DataArray>` of a VTK XML file into the model's typed array, whatever its format:
 * `ascii` text, inline `binary` (base64, optionally zlib-compressed) or `appended` (raw or base64,
 * found by its `offset` into the `<AppendedData>` section).
 *
 * Every size is checked before allocation and every error names the file, the piece and the array.
 */
import type { NumericArray } from '../model/fieldArray.ts';
import { parseNumbers, skipSpace } from './asciiNumbers.ts';
import { ELEMENT_SIZE, allocateFor, decodeElements, isElementType, toIds, type ElementType } from './elementTypes.ts';
import { decodeIds } from './idDecode.ts';
import type { Checkpoint } from './loadOptions.ts';
import { base64Source, rawSource, readBlocks, type BlockFormat, type ByteSource } from './xmlBlocks.ts';
import type { AppendedSection, XmlElement } from './xmlScan.ts';

/** What every array of one file shares: its bytes, encoding settings and appended section. */
export interface XmlFileContext {
  /** File name for messages. */
  readonly name: string;
  readonly bytes: Uint8Array;
  readonly littleEndian: boolean;
  readonly headerType: 'UInt32' | 'UInt64';
  /** The root's `compressor` attribute, if any. */
  readonly compressor: string | undefined;
  readonly appended: AppendedSection | undefined;
  readonly cp: Checkpoint;
  readonly warnings: string[];
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

async function readAscii(ctx: XmlFileContext, el: XmlElement, type: ElementType, expected: number | undefined, where: string): Promise<NumericArray> {
  const { bytes } = ctx;
  const start = el.textStart, end = el.textEnd;
  let count = expected;
  if (count === undefined) count = countTokens(bytes, start, end);
  else if (count > Math.ceil((end - start) / 2)) {
    throw new Error(`${where}: declares ${count} values, the text holds ${countTokens(bytes, start, end)}`);
  }
  const out = allocateFor(type, count);
  const range = INT_RANGE[type];
  let pos = start;
  if (!range || type === 'Int64' || type === 'UInt64') {
    for (let i = 0; i < count; i += ASCII_CHUNK) {
      const k = Math.min(ASCII_CHUNK, count - i);
      pos = parseAsciiChunk(bytes, pos, end, out.subarray(i, i + k), where, start, count, i);
      if (range) checkIntegers(out, i, k, range, type, where);
      await ctx.cp.at('reading text', pos);
    }
  } else {
    if (asciiScratch.length < ASCII_CHUNK) asciiScratch = new Float64Array(ASCII_CHUNK);
    for (let i = 0; i < count; i += ASCII_CHUNK) {
      const k = Math.min(ASCII_CHUNK, count - i);
      const chunk = asciiScratch.subarray(0, k);
      pos = parseAsciiChunk(bytes, pos, end, chunk, where, start, count, i);
      checkIntegers(chunk, 0, k, range, type, where, i);
      out.set(chunk, i);
      await ctx.cp.at('reading text', pos);
    }
  }
  if (skipSpace(bytes, pos, end) < end) {
    throw new Error(`${where}: declares ${count} values, the text holds ${countTokens(bytes, start, end)}`);
  }
  return out;
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

function binarySource(ctx: XmlFileContext, el: XmlElement, format: string, where: string): ByteSource {
  if (format === 'binary') return base64Source(ctx.bytes, el.textStart, el.textEnd, where);
  const app = ctx.appended;
  if (!app) throw new Error(`${where}: format="appended" but the file has no <AppendedData> section`);
  const off = intAttr(el, 'offset', where);
  if (off === undefined) throw new Error(`${where}: format="appended" needs an offset attribute`);
  if (app.start + off > app.end) {
    throw new Error(`${where}: offset ${off} lies beyond the appended data (${app.end - app.start} ${app.encoding === 'raw' ? 'bytes' : 'characters'})`);
  }
  return app.encoding === 'raw'
    ? rawSource(ctx.bytes, app.start + off, app.end)
    : base64Source(ctx.bytes, app.start + off, app.end, where);
}

/** Decodes the numbers of a DataArray as model values, or as range-checked ids when `ids` is given. */
async function decode(ctx: XmlFileContext, el: XmlElement, where: string, expectedValues: number | undefined, ids: { min: number } | undefined): Promise<DecodedArray> {
  const type = numericType(el);
  if (!type) throw new Error(`${where}: type="${el.attrs.get('type') ?? ''}" is not a numeric type (expected Int8 … UInt64, Float32 or Float64)`);
  const components = componentsOf(el, where);
  const format = el.attrs.get('format') ?? 'ascii';
  let values: NumericArray;
  let reached = el.textEnd;
  if (format === 'ascii') {
    values = await readAscii(ctx, el, type, expectedValues, where);
    if (ids) values = toIds(values, where, ids.min);
  } else if (format === 'binary' || format === 'appended') {
    const compressor = ctx.compressor;
    if (compressor && compressor !== ZLIB) {
      throw new Error(`${where}: compressor "${compressor}" is not supported; fieldtally reads only zlib-compressed (vtkZLibDataCompressor) or uncompressed binary data`);
    }
    const fmt: BlockFormat = { headerType: ctx.headerType, littleEndian: ctx.littleEndian, compressed: compressor === ZLIB };
    const src = binarySource(ctx, el, format, where);
    const size = ELEMENT_SIZE[type];
    const data = await readBlocks(src, fmt, { where, elementSize: size, ...(expectedValues !== undefined ? { expectedValues } : {}) }, ctx.cp);
    reached = src.position();
    const count = data.length / size;
    values = ids
      ? decodeIds(data, 0, count, type, ctx.littleEndian, where, ids.min)
      : decodeElements(data, 0, count, type, ctx.littleEndian, where);
  } else {
    throw new Error(`${where}: format="${format}" is not supported (expected ascii, binary or appended)`);
  }
  if (values.length % components !== 0) {
    throw new Error(`${where}: holds ${values.length} values, not a whole number of ${components}-component tuples`);
  }
  await ctx.cp.at('arrays', reached);
  return { values, type, components };
}

/**
 * Decodes a DataArray. `expectedValues` (tuples × components) is checked when known; otherwise the
 * count comes from the data (block header or number of ASCII tokens). `where` names the array.
 */
export function readDataArray(ctx: XmlFileContext, el: XmlElement, where: string, expectedValues?: number): Promise<DecodedArray> {
  return decode(ctx, el, where, expectedValues, undefined);
}

/** Decodes an integer DataArray as Int32 ids in `[min, 2^31 − 1]` (connectivity, offsets, face streams). */
export async function readIdDataArray(ctx: XmlFileContext, el: XmlElement, where: string, expectedValues: number | undefined, min = 0): Promise<Int32Array> {
  return (await decode(ctx, el, where, expectedValues, { min })).values as Int32Array;
}
