/**
 * The named arrays of a VTK XML file as model fields: `<PointData>` and `<CellData>` of a piece, and
 * `<FieldData>` of the dataset. Attribute markers on the section (`Scalars="p"`, `Vectors="U"`,
 * `GlobalIds="…"` …) become each field's `role`. Arrays that are not numeric (String, Bit) are skipped
 * with a warning, since no computation can use them.
 */
import type { Association, FieldArray, FieldRole } from '../model/fieldArray.ts';
import { arrayLabel, intAttr, numericType, readDataArray, type XmlFileContext } from './xmlArrays.ts';
import type { XmlElement } from './xmlScan.ts';

/** Section attribute → model role. */
const ROLE_ATTRS: readonly (readonly [string, FieldRole])[] = [
  ['Scalars', 'scalars'], ['Vectors', 'vectors'], ['Normals', 'normals'], ['Tensors', 'tensors'],
  ['TCoords', 'tcoords'], ['GlobalIds', 'globalIds'], ['PedigreeIds', 'pedigreeIds'],
];

/** Name of the k-th array of a section when the file gives none. */
const unnamed = (association: Association, k: number) => `${association} array ${k}`;

/**
 * Reads every DataArray of a `<PointData>`/`<CellData>` section. `tuples` is the number of points or
 * cells; `where` is `file: piece k`.
 */
export async function readSectionFields(ctx: XmlFileContext, section: XmlElement | undefined, association: 'point' | 'cell', tuples: number, where: string): Promise<FieldArray[]> {
  if (!section) return [];
  const roles = new Map<string, FieldRole>();
  for (const [attr, role] of ROLE_ATTRS) {
    const n = section.attrs.get(attr);
    if (n !== undefined && !roles.has(n)) roles.set(n, role);
  }
  const out: FieldArray[] = [];
  let k = 0;
  for (const el of section.children) {
    if (el.name !== 'DataArray') continue;
    const label = `${where}: ${association} ${arrayLabel(el, `${association} array ${k}`)}`;
    const name = el.attrs.get('Name') || unnamed(association, k);
    k++;
    const type = numericType(el);
    if (!type) {
      ctx.warnings.push(`${where}: ${association} array "${name}" of type ${el.attrs.get('type') ?? '(none)'} skipped (only numeric arrays are read)`);
      continue;
    }
    const nc = Number(el.attrs.get('NumberOfComponents') ?? '1');
    const { values, components } = await readDataArray(ctx, el, label, Number.isInteger(nc) && nc > 0 ? tuples * nc : undefined);
    const role = roles.get(name);
    out.push({ name, association, components, values, sourceType: type, ...(role ? { role } : {}) });
  }
  return out;
}

/** Reads the dataset-level `<FieldData>` arrays (tuple count from `NumberOfTuples`, else from the data). */
export async function readFieldData(ctx: XmlFileContext, section: XmlElement | undefined, where: string): Promise<FieldArray[]> {
  if (!section) return [];
  const out: FieldArray[] = [];
  let k = 0;
  for (const el of section.children) {
    if (el.name !== 'DataArray') continue;
    const name = el.attrs.get('Name') || unnamed('dataset', k);
    const label = `${where}: FieldData ${arrayLabel(el, `field array ${k}`)}`;
    k++;
    const type = numericType(el);
    if (!type && el.attrs.get('type') === 'String') continue; // read by xmlStrings.ts
    if (!type) {
      ctx.warnings.push(`${where}: FieldData array "${name}" of type ${el.attrs.get('type') ?? '(none)'} skipped (only numeric arrays are read)`);
      continue;
    }
    const tuples = intAttr(el, 'NumberOfTuples', label);
    const nc = Number(el.attrs.get('NumberOfComponents') ?? '1');
    const expected = tuples !== undefined && Number.isInteger(nc) && nc > 0 ? tuples * nc : undefined;
    const { values, components } = await readDataArray(ctx, el, label, expected);
    out.push({ name, association: 'dataset', components, values, sourceType: type });
  }
  return out;
}
