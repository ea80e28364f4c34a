/**
 * Labels of surface groups taken from the file's own names. What the readers can find:
 *
 *  - **A name table of a group array**: a field-data String array (XML `<FieldData>`, read by
 *    `src/io/xmlStrings.ts`; a legacy `.vtk` file's dataset-level `FIELD` block, read by
 *    `src/io/legacyStrings.ts`) named after the group array plus "names" — for an array `zone`: `zone names`,
 *    `zoneNames`, `zone_names`, `ZONE-NAMES` (case, spaces, `_` and `-` ignored); failing that, one named
 *    `group names`, `zone names`, `patch names`, `region names`, `boundary names`, `marker names` or
 *    `tag names` (same spelling freedom). Which value each string names: a numeric field-data array named
 *    like the table with "ids" or "values" instead of "names" (`zone ids`), one value per string, when the
 *    file has one; otherwise string i names value i when every value used lies in 0 … n−1 (0-based), or
 *    value i+1 when every value used lies in 1 … n (1-based). A table that fits neither is not used, and
 *    the note says why.
 *  - **Block names of a set**: the `name` of `<Block>`, `<Partitions>` and `<DataSet>` elements of a
 *    `.vtm`/`.vtpd`/`.vtpc` (`Dataset.pieceNames`, the innermost name unless two leaves share it). Surface
 *    cells (2D cells) of a named block that carries no group array form one group per name.
 *
 * String arrays inside a legacy file's POINT_DATA / CELL_DATA are skipped by the reader. Everything else keeps its default label (`<array> <value>`, `part <id>`), which the user can
 * rename in the app or with a probe set's labels.
 */
import { cellDimension } from '../model/cellTypes.ts';
import type { Dataset, FieldStrings } from '../model/dataset.ts';
import type { FieldArray } from '../model/fieldArray.ts';

/** Spelling-free form of a name: lower case without spaces, `_` and `-`. */
export const plainName = (s: string): string => s.toLowerCase().replace(/[\s_-]+/g, '');

/** Generic table names tried when none is named after the group array (plain form). */
const GENERIC_TABLES = ['group', 'zone', 'patch', 'region', 'boundary', 'marker', 'tag'].map((w) => `${w}names`);

/** The value → name map of a group array, or `undefined` with a note saying why there is none. */
export interface NameTable {
  readonly names: ReadonlyMap<number, string>;
  /** The field-data array the names came from. */
  readonly table: string;
  /** How strings were matched to values ("ids from array …", "0-based", "1-based"). */
  readonly matched: string;
}

function findTable(tables: readonly FieldStrings[], array: string): FieldStrings | undefined {
  const own = `${plainName(array)}names`;
  return tables.find((t) => plainName(t.name) === own) ?? GENERIC_TABLES.map((g) => tables.find((t) => plainName(t.name) === g)).find((t) => t);
}

function findIds(fieldData: readonly FieldArray[], table: string): FieldArray | undefined {
  const stem = plainName(table).replace(/names$/, '');
  return fieldData.find((f) => f.components === 1 && (plainName(f.name) === `${stem}ids` || plainName(f.name) === `${stem}values`));
}

/**
 * The name table of group array `array` in `d`'s field data, given the group values in use (ascending).
 * Returns `{ note }` when a table exists but cannot be matched to the values, `undefined` when there is none.
 */
export function groupNameTable(d: Dataset, array: string, used: readonly number[]): NameTable | { note: string } | undefined {
  const t = findTable(d.fieldStrings ?? [], array);
  if (!t) return undefined;
  const n = t.values.length, where = `${d.source}: name table "${t.name}" of group array "${array}"`;
  const ids = findIds(d.fieldData, t.name);
  if (ids) {
    if (ids.values.length !== n) return { note: `${where} not used: its id array "${ids.name}" holds ${ids.values.length} values for ${n} names` };
    const names = new Map<number, string>();
    for (let i = 0; i < n; i++) names.set(ids.values[i]!, t.values[i]!);
    return { names, table: t.name, matched: `ids from "${ids.name}"` };
  }
  const lo = used.length ? used[0]! : 0, hi = used.length ? used[used.length - 1]! : -1;
  const base = lo >= 0 && hi < n ? 0 : lo >= 1 && hi <= n ? 1 : undefined;
  if (base === undefined) return { note: `${where} not used: its ${n} names cannot name values ${lo} … ${hi} (0- or 1-based) and no id array ("… ids") says which` };
  const names = new Map<number, string>();
  for (let i = 0; i < n; i++) names.set(i + base, t.values[i]!);
  return { names, table: t.name, matched: `${base}-based` };
}

/**
 * Distinct names of the pieces holding surface (2D) cells, in order of first appearance, and each piece's
 * index into them (−1 when unnamed or without surface cells).
 */
export function pieceNameIndex(d: Dataset): { names: string[]; ofPiece: Int32Array } | undefined {
  const pn = d.pieceNames;
  if (!pn || pn.length !== d.pieces.length || pn.every((n) => n === '')) return undefined;
  const names: string[] = [], ofPiece = new Int32Array(pn.length).fill(-1);
  pn.forEach((n, k) => {
    if (n === '' || !d.pieces[k]!.cellTypes.some((t) => cellDimension(t) === 2)) return;
    let i = names.indexOf(n);
    if (i < 0) { i = names.length; names.push(n); }
    ofPiece[k] = i;
  });
  return { names, ofPiece };
}
