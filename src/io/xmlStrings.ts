/**
 * String arrays of a VTK XML file's `<FieldData>` (VTK writes them as `<Array type="String">`): each string's
 * bytes followed by a 0 byte, stored like a UInt8 array (ASCII: one number per byte; binary or appended: a
 * block, zlib-compressed when the file is). Only field data is read: the names of groups and blocks live
 * there (`src/surface/groupNames.ts` reads them as the name table of a group array).
 */
import type { FieldStrings } from '../model/dataset.ts';
import { intAttr, readDataArray, type XmlFileContext } from './xmlArrays.ts';
import type { XmlElement } from './xmlScan.ts';

/** Longest name table kept (strings); a longer one is skipped with a warning. */
export const MAX_FIELD_STRINGS = 100_000;

/** Splits zero-terminated UTF-8 strings (a missing final 0 ends the last string). */
export function splitZeroTerminated(bytes: Uint8Array): string[] {
  const out: string[] = [], dec = new TextDecoder();
  let start = 0;
  for (let i = 0; i < bytes.length; i++) {
    if (bytes[i] !== 0) continue;
    out.push(dec.decode(bytes.subarray(start, i)));
    start = i + 1;
  }
  if (start < bytes.length) out.push(dec.decode(bytes.subarray(start)));
  return out;
}

/**
 * Reads the String arrays of a `<FieldData>` section (either element name, `Array` or `DataArray`).
 * `where` is the file name. A table whose string count differs from `NumberOfTuples` is refused with an
 * error naming the array; one longer than `MAX_FIELD_STRINGS` is skipped with a warning.
 */
export async function readFieldStrings(ctx: XmlFileContext, section: XmlElement | undefined, where: string): Promise<FieldStrings[]> {
  if (!section) return [];
  const out: FieldStrings[] = [];
  for (const el of section.children) {
    if ((el.name !== 'Array' && el.name !== 'DataArray') || el.attrs.get('type') !== 'String') continue;
    const name = el.attrs.get('Name') ?? '';
    const label = `${where}: FieldData string array "${name}"`;
    const tuples = intAttr(el, 'NumberOfTuples', label);
    if (tuples !== undefined && tuples > MAX_FIELD_STRINGS) {
      ctx.warnings.push(`${label} of ${tuples} strings skipped (at most ${MAX_FIELD_STRINGS} are read)`);
      continue;
    }
    // the bytes decode like a one-component UInt8 array; the string count is checked after splitting
    const attrs = new Map(el.attrs);
    attrs.set('type', 'UInt8');
    attrs.set('NumberOfComponents', '1');
    attrs.delete('NumberOfTuples');
    const { values } = await readDataArray(ctx, { ...el, attrs }, label);
    const strings = splitZeroTerminated(values as Uint8Array);
    if (tuples !== undefined && strings.length !== tuples) {
      throw new Error(`${label} declares ${tuples} strings (NumberOfTuples), its data hold ${strings.length}`);
    }
    out.push({ name, values: strings });
  }
  return out;
}
