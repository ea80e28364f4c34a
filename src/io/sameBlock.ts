/**
 * Whether a raw appended `<DataArray>` holds exactly the bytes of an array decoded before — so a reader
 * given the previous step of a series (`LoadOptions.geometryBefore`) can take that step's points and cell
 * arrays instead of decoding and checking the same bytes again. Only arrays whose file bytes are the
 * model's bytes qualify: uncompressed raw appended data, host byte order, and the model's own element type
 * (Float64 points, Int32 ids, UInt8 cell types). The block is read through a scratch buffer in chunks and
 * compared word by word, stopping at the first difference; nothing is allocated for it. Any other
 * encoding answers false and the array is decoded as usual.
 */
import { inMemoryBytes, readExactly, readInto } from './byteSource.ts';
import { SCRATCH_BYTES } from './elementConvert.ts';
import type { ElementType } from './elementTypes.ts';
import { intAttr, numericType, type XmlFileContext } from './xmlArrays.ts';
import type { XmlElement } from './xmlScan.ts';

const HOST_LITTLE = new Uint8Array(Uint16Array.of(1).buffer)[0] === 1;

/** Module scratch, lent to one comparison at a time (a second one running meanwhile gets its own buffer). */
let scratch = new Uint8Array(0);
let lent = false;

/** The file element type whose bytes are exactly those of `known`'s elements. */
function fileTypeOf(known: ArrayBufferView): ElementType | undefined {
  if (known instanceof Float64Array) return 'Float64';
  if (known instanceof Int32Array) return 'Int32';
  if (known instanceof Uint8Array) return 'UInt8';
  return undefined;
}

function sameWords(a: Uint8Array, b: Uint8Array): boolean {
  const n = a.length;
  if (a.byteOffset % 4 === 0 && b.byteOffset % 4 === 0) {
    const x = new Uint32Array(a.buffer, a.byteOffset, n >> 2), y = new Uint32Array(b.buffer, b.byteOffset, n >> 2);
    for (let i = 0; i < x.length; i++) if (x[i] !== y[i]) return false;
    for (let i = n & ~3; i < n; i++) if (a[i] !== b[i]) return false;
    return true;
  }
  for (let i = 0; i < n; i++) if (a[i] !== b[i]) return false;
  return true;
}

/**
 * True when DataArray `el` of the file is raw appended data holding exactly the elements of `known` after
 * its first `lead` (cell offsets carry a leading zero the file does not). False for any other encoding,
 * type, length or content.
 */
export async function appendedMatches(ctx: XmlFileContext, el: XmlElement, known: ArrayBufferView & { length: number }, lead = 0): Promise<boolean> {
  const type = fileTypeOf(known);
  const app = ctx.appended;
  if (!type || numericType(el) !== type || !app || app.encoding !== 'raw' || ctx.compressor || ctx.littleEndian !== HOST_LITTLE) return false;
  if (el.attrs.get('format') !== 'appended') return false;
  const off = intAttr(el, 'offset', ctx.name);
  if (off === undefined) return false;
  const hs = ctx.headerType === 'UInt64' ? 8 : 4, start = app.start + off;
  const size = known.byteLength / known.length, want = (known.length - lead) * size;
  if (start + hs + want > app.end) return false;
  const h = await readExactly(ctx.source, start, hs);
  const header = new DataView(h.buffer, h.byteOffset, hs);
  const n = hs === 4 ? header.getUint32(0, true) : header.getUint32(0, true) + 2 ** 32 * header.getUint32(4, true);
  if (n !== want) return false;
  const mine = new Uint8Array(known.buffer, known.byteOffset + lead * size, want);
  const mem = inMemoryBytes(ctx.source);
  if (mem) return sameWords(mem.subarray(start + hs, start + hs + want), mine);
  const chunk = Math.min(ctx.source.chunkBytes ?? SCRATCH_BYTES, Math.max(want, 4096));
  const own = lent;
  let buffer = own ? new Uint8Array(chunk) : scratch;
  if (!own) {
    if (buffer.length < chunk) scratch = buffer = new Uint8Array(chunk);
    lent = true;
  }
  try {
    for (let done = 0; done < want;) {
      const k = Math.min(buffer.length, want - done), buf = buffer.subarray(0, k);
      await readInto(ctx.source, start + hs + done, buf);
      if (!sameWords(buf, mine.subarray(done, done + k))) return false;
      done += k;
      await ctx.cp.at('arrays', start + hs + done);
    }
    return true;
  } finally {
    if (!own) lent = false;
  }
}
