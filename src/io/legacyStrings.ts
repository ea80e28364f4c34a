/**
 * String arrays of legacy `.vtk` files, as VTK's legacy writer stores them: in a text file one string per
 * line with `%XX` escapes (a space, `%` and non-ASCII bytes escaped, an empty string as an empty line); in
 * a binary file each string as a big-endian length whose first two bits give its size (11: a 6-bit length
 * in 1 byte, 10: 14 bits in 2, 01: 30 bits in 4, 00: 62 bits in 8), then its UTF-8 bytes. Dataset-level
 * string arrays are kept as `FieldStrings` (the name tables of group arrays, see src/surface/groupNames.ts).
 */
import { decodeName, type LegacyCursor } from './legacyCursor.ts';

const utf8 = new TextDecoder('utf-8');

/**
 * Reads `count` strings of a string array whose header line (`where`) was just read. Errors name `where`
 * and say how many strings were expected and how many the file holds.
 */
export async function readStrings(cur: LegacyCursor, count: number, where: string): Promise<string[]> {
  cur.toNextLine(where);
  // a text string takes at least its newline, a binary one its length byte
  if (count > cur.remaining + 1) {
    throw new Error(`${where}: declares ${count} strings, but only ${cur.remaining} bytes are left (file truncated, or a wrong count)`);
  }
  const out: string[] = [];
  for (let i = 0; i < count; i++) {
    if (!cur.binary) {
      const l = cur.line();
      if (l === undefined) throw new Error(`${where}: expected ${count} strings, but the file ends after ${i}`);
      out.push(decodeName(l));
      continue;
    }
    await cur.ensure(8);
    if (cur.remaining < 1) throw new Error(`${where}: expected ${count} strings, but the file ends after ${i}`);
    const first = cur.bytes[cur.pos]!, kind = first >> 6, head = kind === 3 ? 1 : kind === 2 ? 2 : kind === 1 ? 4 : 8;
    if (cur.remaining < head) throw new Error(`${where}: string ${i} has a ${head}-byte length, but the file ends`);
    let len = first & 0x3f;
    for (let k = 1; k < head; k++) len = len * 256 + cur.bytes[cur.pos + k]!;
    if (head + len > cur.remaining) {
      throw new Error(`${where}: string ${i} declares ${len} bytes, but only ${cur.remaining - head} are left (file truncated, or a wrong count)`);
    }
    await cur.ensure(head + len);
    out.push(utf8.decode(cur.bytes.subarray(cur.pos + head, cur.pos + head + len)));
    await cur.advance(head + len);
  }
  return out;
}
