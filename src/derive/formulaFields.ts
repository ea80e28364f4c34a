/**
 * User formulas as fields: each formula (name = expression, formulaParse.ts) is evaluated on every piece
 * and attached under its name, after the derived fields it names, so later formulas, probes and colours
 * use it like a file array. A formula runs on point data when its fields are point data, on cell data
 * when they are cell data; mixing the two is refused (interpolate first by choosing the fields).
 */
import type { Dataset } from '../model/dataset.ts';
import { cellCount, findField, pointCount, type Piece } from '../model/piece.ts';
import { DERIVED_UNITS, isDerivedName, withDerivedFields, type DeriveOptions } from './derivedFields.ts';
import { evaluateFormula } from './formulaEval.ts';
import { FormulaError, formulaFields, parseFormula } from './formulaParse.ts';
import { dimsOf, FORMULA_UNIT_LABELS, sameDims, unitOfDims, type Dims } from './formulaUnits.ts';

/** A formula as a probe set stores it. */
export interface FormulaDoc {
  /** Name of the new field: letters, digits, `_`, `-`, `.`, starting with a letter. */
  name: string;
  expression: string;
  /** Optional SI unit label of the result (a label of formulaUnits.ts): checked against the expression's unit, or taken when that is unknown. */
  unit?: string;
}

export const FORMULA_NAME = /^[A-Za-z][A-Za-z0-9_.-]{0,63}$/;

/** What formulas need besides the dataset. */
export interface FormulaContext {
  /** Reference values (SI) for `ref.<name>`. */
  reference: Readonly<Record<string, number | undefined>>;
  /** SI unit label of a file field by name, or undefined / 'undeclared' when unknown. */
  unitOf(name: string): string | undefined;
  /** Options for the derived fields a formula names. */
  derive?: Partial<DeriveOptions>;
}

/** Checks a formula's name and syntax; throws `formula "name": column …` on an error. */
export function checkFormula(f: FormulaDoc): void {
  if (!FORMULA_NAME.test(f.name)) throw new FormulaError(`formula "${f.name}": a name of letters, digits, "_", "-" or "." starting with a letter (at most 64) is expected`);
  try { parseFormula(f.expression); } catch (e) { throw new FormulaError(`formula "${f.name}": ${(e as Error).message}`); }
}

const bare = (n: string): string => n.replace(/^(point|cell):/, '');

/**
 * The dataset with the formulas' fields attached, in order, and each formula's SI unit
 * (`undeclared` when an input's unit is unknown). Throws `formula "name": …` on the first error.
 */
export function withFormulaFields(d: Dataset, formulas: readonly FormulaDoc[], ctx: FormulaContext): { dataset: Dataset; units: Record<string, string> } {
  const units: Record<string, string> = {};
  let cur = d;
  for (const f of formulas) {
    checkFormula(f);
    const tree = parseFormula(f.expression);
    const used = [...formulaFields(tree)];
    const first = cur.pieces[0];
    if (!first) throw new FormulaError(`formula "${f.name}": the dataset has no pieces`);
    if (findField(first, f.name, 'point') || findField(first, f.name, 'cell')) throw new FormulaError(`formula "${f.name}": a field of that name exists already; choose another name`);
    try {
      cur = withDerivedFields(cur, used, ctx.derive ?? {});
    } catch (e) { throw new FormulaError(`formula "${f.name}": ${(e as Error).message}`); }
    const assocOf = (name: string): 'point' | 'cell' | undefined => {
      const m = /^(point|cell):/.exec(name);
      if (m) return m[1] as 'point' | 'cell';
      return findField(cur.pieces[0]!, name, 'point') ? 'point' : findField(cur.pieces[0]!, name, 'cell') ? 'cell' : undefined;
    };
    const assocs = new Set(used.map(assocOf).filter((a) => a !== undefined));
    if (assocs.size > 1) throw new FormulaError(`formula "${f.name}": mixes point and cell fields (${used.map((u) => `${u}: ${assocOf(u) ?? 'missing'}`).join(', ')}); use fields of one association`);
    const association = assocs.has('cell') ? 'cell' : 'point';
    const unitOf = (name: string): string | undefined => {
      const b = bare(name);
      if (units[b] !== undefined) return units[b];
      if (isDerivedName(b) && !d.pieces[0]!.pointData.some((x) => x.name === b) && !d.pieces[0]!.cellData.some((x) => x.name === b)) return DERIVED_UNITS[b];
      const u = ctx.unitOf(b);
      return u === 'undeclared' ? undefined : u;
    };
    let dims: ReturnType<typeof evaluateFormula>['dims'] = null;
    const pieces: Piece[] = cur.pieces.map((p, k) => {
      const count = association === 'point' ? pointCount(p) : cellCount(p);
      try {
        const r = evaluateFormula(tree, {
          count, reference: ctx.reference,
          field: (name) => {
            const x = findField(p, bare(name), association);
            return x ? { values: x.values, components: x.components, unit: unitOf(name) } : undefined;
          },
        });
        if (k === 0) dims = r.dims;
        const fa = { name: f.name, association, components: r.components, values: r.values, sourceType: 'Float64 (formula)' } as const;
        return association === 'point' ? { ...p, pointData: [...p.pointData, fa] } : { ...p, cellData: [...p.cellData, fa] };
      } catch (e) {
        throw new FormulaError(`formula "${f.name}"${cur.pieces.length > 1 ? ` (piece ${k})` : ''}: ${(e as Error).message}`);
      }
    });
    units[f.name] = declaredUnit(f, dims);
    cur = { ...cur, pieces };
  }
  return { dataset: cur, units };
}

/** The formula's unit: the expression's, checked against a declared `unit`; the declared one when the expression's is unknown. */
function declaredUnit(f: FormulaDoc, dims: Dims): string {
  if (f.unit === undefined) return unitOfDims(dims);
  const want = dimsOf(f.unit);
  if (!want) throw new FormulaError(`formula "${f.name}": unit "${f.unit}" is not an SI unit label; expected one of ${FORMULA_UNIT_LABELS.join(', ')}`);
  if (dims && !sameDims(dims, want)) throw new FormulaError(`formula "${f.name}": the expression gives ${unitOfDims(dims)}, but the declared unit is ${f.unit}`);
  return f.unit;
}
