/**
 * The structure of a VTK XML file read from a `ByteSource` without reading its data: for a file whose
 * arrays all lie in `<AppendedData>` (raw or base64), only the XML before the data (read in growing
 * chunks) and the last few kilobytes (where `</AppendedData>` is) are read; the arrays are then read one
 * by one at their offsets. A file with inline data (ascii, base64 in the elements) is streamed once to
 * find its structure (`xmlSkeleton.ts`), and each array's text is then read by its range; one with both
 * inline and appended data, or a small one, is read whole, once.
 */
import { inMemoryBytes, readExactly, type ByteSource } from './byteSource.ts';
import type { Checkpoint } from './loadOptions.ts';
import { readWhole } from './sourceArrays.ts';
import { scanSkeleton } from './xmlSkeleton.ts';
import { APPENDED_TAIL_BYTES, appendedEnd, scanXml, scanXmlHead, type XmlDocument } from './xmlScan.ts';

/** First chunk read; the XML before appended data is usually a few kilobytes. */
const HEAD_BYTES = 64 << 10;
/** Each further chunk is this many times the last. */
const GROWTH = 4;

/** A scanned XML file: its structure and the bytes the scan read. */
export interface XmlInput {
  /** Structure; `appended.start`/`end` are offsets in the file. */
  readonly doc: XmlDocument;
  /**
   * The whole file (`whole`), or its first bytes up to the appended data, which hold every element, or
   * nothing (a file with inline data read by ranges: the element positions are the file's).
   */
  readonly bytes: Uint8Array;
  readonly whole: boolean;
  readonly source: ByteSource;
}

/**
 * Scans the XML structure of `src`; `where` (the file name) prefixes every error, which are the errors
 * `scanXml` gives for the whole file. `cp` reports progress and honours a cancel while a file is streamed.
 */
export async function scanXmlSource(src: ByteSource, where: string, cp?: Checkpoint): Promise<XmlInput> {
  const mem = inMemoryBytes(src);
  if (mem) return { doc: scanXml(mem, where), bytes: mem, whole: true, source: src };
  let n = Math.min(src.size, HEAD_BYTES);
  for (;;) {
    if (n >= src.size) {
      const all = await readWhole(src);
      return { doc: scanXml(all, where), bytes: all, whole: true, source: src };
    }
    const head = await readExactly(src, 0, n);
    const r = scanXmlHead(head, where);
    if (r.kind === 'appended') {
      const tailAt = Math.max(r.start, src.size - APPENDED_TAIL_BYTES);
      const tail = await readExactly(src, tailAt, src.size - tailAt);
      const end = appendedEnd(tail, tailAt, r.start, r.encoding, where);
      return { doc: { root: r.root, appended: { encoding: r.encoding, start: r.start, end } }, bytes: head.subarray(0, r.start), whole: false, source: src };
    }
    if (r.kind === 'whole') {
      const doc = await scanSkeleton(src, where, cp);
      if (doc) return { doc, bytes: new Uint8Array(0), whole: false, source: src };
      n = src.size;
    } else {
      n = Math.min(src.size, n * GROWTH);
    }
  }
}
