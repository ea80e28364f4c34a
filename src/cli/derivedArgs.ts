/**
 * Derived fields on the command line: the names a verb was given (`--fields`, field options) that are
 * derived fields (src/derive/derivedFields.ts) are computed and attached before the verb runs, with the
 * reference values for cp from spelled-out options. Not a verb (it lives outside `verbs/`).
 */
import { DERIVED_FIELDS, withDerivedFields, type DeriveOptions } from '../derive/derivedFields.ts';
import { withFormulaFields, type FormulaDoc } from '../derive/formulaFields.ts';
import { fieldSiUnit } from '../study/units.ts';
import type { Dataset } from '../model/dataset.ts';
import { parseNumber, str, type OptionKind, type ParsedArgs } from './args.ts';

/** Options every verb that takes field names accepts for derived fields. */
export const DERIVED_OPTIONS: Record<string, OptionKind> = {
  'reference-density': 'string', 'reference-speed': 'string', 'reference-pressure': 'string', formula: 'string',
};

export const DERIVED_HELP = [
  `  derived fields, usable wherever a field name is: ${Object.keys(DERIVED_FIELDS).join(', ')}`,
  '    (second-order velocity gradient by a quadratic least-squares fit; a field of the same name in the file wins)',
  '  --reference-density ρ --reference-speed U [--reference-pressure p_ref]   for cp = (p − p_ref)/(½ρU²)',
  '  --formula "name = expression; …"   new fields from formulas (README: formula language), usable by name',
].join('\n');

/** Formulas written `name = expression; name2 = expression2`. */
export function parseFormulaOption(text: string): FormulaDoc[] {
  return text.split(';').map((s) => s.trim()).filter((s) => s !== '').map((s) => {
    const i = s.indexOf('=');
    if (i <= 0) throw new Error(`--formula: expected name = expression, got "${s}"`);
    return { name: s.slice(0, i).trim(), expression: s.slice(i + 1).trim() };
  });
}

/**
 * The dataset with the derived fields among `names` attached. `inputs` names the velocity, pressure and
 * density (constant or field) when the verb has options for them.
 */
export function withDerivedArgs(d: Dataset, names: readonly string[], args: ParsedArgs,
  inputs: Partial<Pick<DeriveOptions, 'velocity' | 'pressure' | 'density' | 'kinematicPressure'>> = {}): Dataset {
  const num = (k: string): number | undefined => { const v = str(args, k); return v === undefined ? undefined : parseNumber(v, k); };
  const density = num('reference-density'), speed = num('reference-speed'), pressure = num('reference-pressure');
  const options: Partial<DeriveOptions> = {
    ...inputs,
    ...(inputs.density === undefined && density !== undefined ? { density } : {}),
    reference: { ...(density !== undefined ? { density } : {}), ...(speed !== undefined ? { speed } : {}), ...(pressure !== undefined ? { pressure } : {}) },
  };
  const formulaText = str(args, 'formula');
  const withFormulas = formulaText === undefined ? d : withFormulaFields(d, parseFormulaOption(formulaText), {
    reference: { density, speed, pressure }, unitOf: (n) => fieldSiUnit(n, {}), derive: options,
  }).dataset;
  return withDerivedFields(withFormulas, names, options);
}
