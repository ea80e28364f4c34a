/**
 * The structure of a VTK XML file with inline data, read without holding the file: the file is streamed
 * once in chunks and copied into a "skeleton" that keeps every tag, comment, instruction and blank run but
 * replaces each run of text between tags by one placeholder byte (`0`). The skeleton of a 180 MB ASCII
 * file is a few kilobytes; `scanXml` reads it, and the element positions are then mapped back to the file,
 * so each array's text is read by its own byte range afterwards (`xmlArrays.ts`).
 *
 * A file that also holds `<AppendedData>` is not sketched (its raw bytes may contain anything): the caller
 * reads such a file whole, as before.
 */
import { readInto, type ByteSource } from './byteSource.ts';
import { SCRATCH_BYTES } from './elementConvert.ts';
import type { Checkpoint } from './loadOptions.ts';
import { isSpace, scanXml, type XmlDocument, type XmlElement } from './xmlScan.ts';

/** Progress stage of the structure pass (the load's first pass over a file with inline data). */
export const STRUCTURE_STAGE = 'finding the structure';

const LT = 60, GT = 62, QMARK = 63, BANG = 33, DASH = 45, PLACEHOLDER = 48;
const APPENDED_TAG = Uint8Array.from('<AppendedData', (c) => c.charCodeAt(0));

/** Where a skeleton byte lies in the file: text placeholders shift everything after them. */
export interface SkeletonMap {
  /** Skeleton positions of the `<` after each replaced text run, ascending. */
  readonly at: readonly number[];
  /** File offset minus skeleton offset from `at[k]` on (up to the next one). */
  readonly shift: readonly number[];
}

/** File offset of skeleton offset `s`. */
export function fileOffset(map: SkeletonMap, s: number): number {
  let lo = 0, hi = map.at.length;
  // last k with at[k] <= s
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (map.at[mid]! <= s) lo = mid + 1; else hi = mid;
  }
  return lo === 0 ? s : s + map.shift[lo - 1]!;
}

/** Growable byte buffer for the skeleton. */
class Bytes {
  buf = new Uint8Array(1 << 16);
  n = 0;
  push(c: number): void {
    if (this.n === this.buf.length) { const b = new Uint8Array(2 * this.buf.length); b.set(this.buf); this.buf = b; }
    this.buf[this.n++] = c;
  }
}

/** What the streaming copy is inside of. */
const enum In { Text, Open, Tag, Quote, Comment, Instruction, Declaration }

/**
 * Streams `src` into its skeleton. Returns undefined when the file holds `<AppendedData>` (read it whole
 * instead). Structure errors are left to `scanXml` on the skeleton. `cp` reports progress and honours a cancel.
 */
export async function buildSkeleton(src: ByteSource, cp?: Checkpoint): Promise<{ bytes: Uint8Array; map: SkeletonMap } | undefined> {
  const out = new Bytes(), at: number[] = [], shift: number[] = [];
  let state: In = In.Text, quote = 0, tagStart = 0;
  // whether the current text run holds a non-blank byte yet
  let runText = false;
  // last two bytes seen in a comment or instruction (for "-->" and "?>")
  let prev1 = 0, prev2 = 0;
  const chunk = src.chunkBytes ?? SCRATCH_BYTES;
  // the blank bytes of the current run so far, copied as they are when the run stays blank
  const blank = new Bytes();
  const endRun = (lt: number) => {
    if (!runText) {
      for (let j = 0; j < blank.n; j++) out.push(blank.buf[j]!);
    } else {
      // the run up to lt becomes one placeholder byte; the "<" that follows (skeleton offset out.n) is at file offset lt
      out.push(PLACEHOLDER);
      at.push(out.n);
      shift.push(lt - out.n);
    }
    blank.n = 0;
  };
  const buffer = new Uint8Array(Math.min(chunk, src.size));
  for (let base = 0; base < src.size; base += chunk) {
    const bytes = buffer.subarray(0, Math.min(chunk, src.size - base));
    await cp?.at(STRUCTURE_STAGE, base);
    await readInto(src, base, bytes);
    let i = 0;
    const n = bytes.length;
    while (i < n) {
      if (state === In.Text) {
        const lt = bytes.indexOf(LT, i);
        const stop = lt < 0 ? n : lt;
        if (!runText) {
          for (let j = i; j < stop; j++) {
            const b = bytes[j]!;
            if (!isSpace(b)) { runText = true; break; }
            blank.push(b);
          }
        }
        if (lt < 0) { i = n; break; }
        endRun(base + lt);
        out.push(LT);
        tagStart = out.n - 1;
        state = In.Open;
        prev1 = prev2 = 0;
        i = lt + 1;
        continue;
      }
      const c = bytes[i++]!;
      out.push(c);
      if (state === In.Open) {
        // the byte after "<" tells an instruction, a declaration or comment, or an element tag
        state = c === QMARK ? In.Instruction : c === BANG ? In.Declaration : In.Tag;
        if (state === In.Tag && c === GT) { state = In.Text; runText = false; }
      } else if (state === In.Tag) {
        if (c === 34 || c === 39) { state = In.Quote; quote = c; } else if (c === GT) {
          if (isAppendedTag(out.buf, tagStart, out.n)) return undefined;
          state = In.Text; runText = false;
        }
      } else if (state === In.Quote) {
        if (c === quote) state = In.Tag;
      } else if (state === In.Declaration) {
        // "<!--" turns a declaration into a comment
        if (c === DASH && out.n - tagStart === 4 && out.buf[tagStart + 2] === DASH) state = In.Comment;
        else if (c === GT) { state = In.Text; runText = false; }
      } else if (state === In.Comment) {
        if (c === GT && prev1 === DASH && prev2 === DASH && out.n - tagStart > 6) { state = In.Text; runText = false; }
      } else if (c === GT && prev1 === QMARK) { // instruction
        state = In.Text; runText = false;
      }
      prev2 = prev1; prev1 = c;
    }
  }
  if (state === In.Text) endRun(src.size);
  return { bytes: out.buf.subarray(0, out.n), map: { at, shift } };
}

function isAppendedTag(buf: Uint8Array, start: number, end: number): boolean {
  if (end - start < APPENDED_TAG.length + 1) return false;
  for (let k = 0; k < APPENDED_TAG.length; k++) if (buf[start + k] !== APPENDED_TAG[k]) return false;
  const c = buf[start + APPENDED_TAG.length]!;
  return isSpace(c) || c === GT || c === 47;
}

/** Maps every element's positions from the skeleton to the file. */
function mapElement(el: XmlElement, map: SkeletonMap): void {
  (el as { at: number }).at = fileOffset(map, el.at);
  el.textStart = fileOffset(map, el.textStart);
  el.textEnd = fileOffset(map, el.textEnd);
  for (const c of el.children) mapElement(c, map);
}

/**
 * Scans the structure of an XML file with inline data from its skeleton; positions in the tree and in
 * error messages are the file's. Undefined when the file holds appended data.
 */
export async function scanSkeleton(src: ByteSource, where: string, cp?: Checkpoint): Promise<XmlDocument | undefined> {
  const sk = await buildSkeleton(src, cp);
  if (!sk) return undefined;
  let doc: XmlDocument;
  try {
    doc = scanXml(sk.bytes, where);
  } catch (e) {
    if (!(e instanceof Error)) throw e;
    throw new Error(e.message.replace(/\bbyte (\d+)/g, (_, s: string) => `byte ${fileOffset(sk.map, Number(s))}`));
  }
  mapElement(doc.root, sk.map);
  return doc;
}
