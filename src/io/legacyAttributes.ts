/**
 * Arrays of legacy `.vtk` files: the items of the attribute sections `POINT_DATA n` / `CELL_DATA n`
 * (SCALARS, COLOR_SCALARS, VECTORS, NORMALS, TENSORS, TENSORS6, TEXTURE_COORDINATES, GLOBAL_IDS,
 * PEDIGREE_IDS, EDGE_FLAGS, inline LOOKUP_TABLE tables, which are skipped, and FIELD blocks) and the
 * dataset-level `FIELD name n` block. Names are %-decoded. String arrays of the dataset-level block are kept
 * (`FieldStrings`, e.g. the name table of a group array); those of POINT_DATA / CELL_DATA are skipped with a
 * warning.
 */
import type { FieldStrings } from '../model/dataset.ts';
import type { FieldArray, FieldRole, NumericArray } from '../model/fieldArray.ts';
import type { ElementType } from './elementTypes.ts';
import type { Checkpoint } from './loadOptions.ts';
import { decodeName, quoted, type LegacyCursor } from './legacyCursor.ts';
import { legacyType, numericType } from './legacyTypes.ts';
import { readStrings } from './legacyStrings.ts';
import { readColors, readValues, skipStrings, skipValues } from './legacyValues.ts';
import { MAX_FIELD_STRINGS } from './xmlStrings.ts';

/** An attribute section being read: its association, declared tuple count and arrays so far. */
export interface AttributeSection {
  readonly keyword: 'POINT_DATA' | 'CELL_DATA';
  readonly association: 'point' | 'cell';
  readonly tuples: number;
  readonly arrays: FieldArray[];
}

/** Keywords `readAttribute` handles, for messages. */
export const ATTRIBUTE_KEYWORDS = ['SCALARS', 'COLOR_SCALARS', 'LOOKUP_TABLE', 'VECTORS', 'NORMALS', 'TENSORS', 'TENSORS6', 'TEXTURE_COORDINATES', 'GLOBAL_IDS', 'PEDIGREE_IDS', 'EDGE_FLAGS', 'FIELD'];

/** Shared state of one file's read. */
export interface ArrayContext {
  readonly cur: LegacyCursor;
  readonly cp: Checkpoint;
  readonly warnings: string[];
}

/** Adds an array, replacing an earlier one of the same name as VTK's reader does (with a warning). */
function addArray(list: FieldArray[], a: FieldArray, ctx: ArrayContext, where: string): void {
  const k = list.findIndex((f) => f.name === a.name);
  if (k < 0) { list.push(a); return; }
  list[k] = a;
  ctx.warnings.push(`${where}: a second ${a.association} array named "${a.name}" replaces the first, as VTK's reader does`);
}

const fieldOf = (name: string, association: FieldArray['association'], components: number, values: NumericArray, sourceType: string, role?: FieldRole): FieldArray =>
  (role ? { name, association, components, values, sourceType, role } : { name, association, components, values, sourceType });

/** A component count word, checked in `lo..hi`. */
function components(ctx: ArrayContext, what: string, where: string, lo: number, hi: number): number {
  const n = ctx.cur.count(what, where);
  if (n < lo || n > hi) throw new Error(`${where}: ${what} is ${n}, expected ${lo}..${hi}`);
  return n;
}

/** Reads one array of `tuples × comps` values of `type`, then skips a METADATA block after it. */
async function numeric(ctx: ArrayContext, tuples: number, comps: number, type: ElementType, where: string): Promise<NumericArray> {
  const values = await readValues(ctx.cur, tuples * comps, type, where, ctx.cp);
  ctx.cur.skipMetadata();
  return values;
}

/**
 * Reads the attribute item whose keyword (upper case) was just read into `section`. Returns false, reading
 * nothing, when the keyword is not an attribute keyword.
 */
export async function readAttribute(keyword: string, section: AttributeSection, ctx: ArrayContext): Promise<boolean> {
  const cur = ctx.cur, n = section.tuples, assoc = section.association;
  const kwPos = cur.wordStart;
  if (!ATTRIBUTE_KEYWORDS.includes(keyword)) return false;
  if (keyword === 'FIELD') {
    for (const a of await readFieldBlock(ctx, `${section.keyword} FIELD`, assoc, n)) addArray(section.arrays, a, ctx, cur.where(section.keyword, kwPos));
    return true;
  }
  const head = cur.where(`${section.keyword} ${keyword}`, kwPos);
  const name = decodeName(cur.need('an array name', head));
  const where = cur.where(`${section.keyword} ${keyword} ${quoted(name)}`, kwPos);
  const add = (comps: number, values: NumericArray, sourceType: string, role?: FieldRole) =>
    addArray(section.arrays, fieldOf(name, assoc, comps, values, sourceType, role), ctx, where);

  switch (keyword) {
    case 'SCALARS': {
      const type = numericType(cur.need('the data type', where), where);
      let next = cur.need('LOOKUP_TABLE', where), comps = 1;
      if (next.toUpperCase() !== 'LOOKUP_TABLE') {
        cur.pos = cur.wordStart;
        comps = components(ctx, 'the number of components', where, 1, 4096);
        next = cur.need('LOOKUP_TABLE', where);
      }
      if (next.toUpperCase() !== 'LOOKUP_TABLE') {
        throw new Error(`${where}: expected LOOKUP_TABLE <name> after the data type and component count, found ${quoted(next)} (VTK requires "LOOKUP_TABLE default")`);
      }
      cur.need('the lookup table name', where);
      add(comps, await numeric(ctx, n, comps, type, where), type, 'scalars');
      return true;
    }
    case 'COLOR_SCALARS': {
      const comps = components(ctx, 'the number of colour components', where, 1, 4096);
      const values = await readColors(cur, n * comps, where, ctx.cp);
      cur.skipMetadata();
      add(comps, values, 'UInt8', 'scalars');
      return true;
    }
    case 'LOOKUP_TABLE': {
      const size = cur.count('the table size', where);
      await skipValues(cur, size * 4, 'UInt8', where, ctx.cp);
      return true;
    }
    case 'VECTORS': case 'NORMALS': case 'TENSORS': case 'TENSORS6': {
      const type = numericType(cur.need('the data type', where), where);
      const comps = keyword === 'TENSORS' ? 9 : keyword === 'TENSORS6' ? 6 : 3;
      const role: FieldRole = keyword === 'VECTORS' ? 'vectors' : keyword === 'NORMALS' ? 'normals' : 'tensors';
      add(comps, await numeric(ctx, n, comps, type, where), type, role);
      return true;
    }
    case 'TEXTURE_COORDINATES': {
      const comps = components(ctx, 'the texture dimension', where, 1, 3);
      const type = numericType(cur.need('the data type', where), where);
      add(comps, await numeric(ctx, n, comps, type, where), type, 'tcoords');
      return true;
    }
    default: { // GLOBAL_IDS, PEDIGREE_IDS, EDGE_FLAGS
      const type = legacyType(cur.need('the data type', where), where);
      if (type === 'string') {
        await skipStrings(cur, n, where);
        cur.skipMetadata();
        ctx.warnings.push(`${where}: string array skipped (fieldtally reads numeric arrays only)`);
        return true;
      }
      const role: FieldRole | undefined = keyword === 'GLOBAL_IDS' ? 'globalIds' : keyword === 'PEDIGREE_IDS' ? 'pedigreeIds' : undefined;
      add(1, await numeric(ctx, n, 1, type, where), type, role);
      return true;
    }
  }
}

/**
 * Reads a `FIELD name n` block after its keyword: n arrays, each `name components tuples type` and its
 * data, or `NULL_ARRAY`. With `tuples` given (inside POINT_DATA / CELL_DATA) every array must have that
 * many tuples; dataset-level field data (`tuples` undefined) may have any. With `strings` given, one-component
 * string arrays of up to `MAX_FIELD_STRINGS` strings are added to it (a later one of the same name replaces
 * an earlier one); other string arrays are skipped with a warning.
 */
export async function readFieldBlock(ctx: ArrayContext, label: string, association: FieldArray['association'], tuples?: number, strings?: FieldStrings[]): Promise<FieldArray[]> {
  const cur = ctx.cur;
  const blockWhere = cur.where(label);
  cur.need('the field name', blockWhere);
  const nArrays = cur.count('the number of arrays', blockWhere);
  const out: FieldArray[] = [];
  for (let i = 0; i < nArrays; i++) {
    const word = cur.need(`array ${i + 1} of ${nArrays}`, blockWhere);
    if (word === 'NULL_ARRAY') continue;
    const name = decodeName(word);
    const where = cur.where(`${label} array ${quoted(name)}`);
    const comps = cur.count('the number of components', where);
    const n = cur.count('the number of tuples', where);
    const type = legacyType(cur.need('the data type', where), where);
    if (comps < 1) throw new Error(`${where}: declares ${comps} components, expected at least 1`);
    if (tuples !== undefined && n !== tuples) {
      throw new Error(`${where}: declares ${n} tuples, expected ${tuples} (the ${association === 'point' ? 'POINT_DATA' : 'CELL_DATA'} count)`);
    }
    if (type === 'string') {
      if (strings && comps === 1 && n <= MAX_FIELD_STRINGS) {
        const t: FieldStrings = { name, values: await readStrings(cur, n, where) };
        const k = strings.findIndex((f) => f.name === name);
        if (k >= 0) strings[k] = t; else strings.push(t);
      } else {
        await skipStrings(cur, comps * n, where);
        const why = !strings ? 'fieldtally reads numeric arrays only' : comps !== 1 ? `a name table has 1 component, this one ${comps}` : `at most ${MAX_FIELD_STRINGS} strings are read`;
        ctx.warnings.push(`${where}: string array skipped (${why})`);
      }
      cur.skipMetadata();
      continue;
    }
    const values = await numeric(ctx, n, comps, type, where);
    const a = fieldOf(name, association, comps, values, type);
    const k = out.findIndex((f) => f.name === name);
    if (k >= 0) { out[k] = a; ctx.warnings.push(`${where}: a second array named "${name}" replaces the first, as VTK's reader does`); } else out.push(a);
  }
  return out;
}
