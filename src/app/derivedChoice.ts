/**
 * Which derived fields (src/derive/derivedFields.ts) the colour chooser offers for a file: only those
 * whose inputs the file has, found by the same role rule the core uses (src/cut/fieldRoles.ts), that the
 * view can colour (1 or 3 components), and that are not already arrays of the dataset. Pure: no DOM.
 */
import { guessRole, type FieldInfo } from '../cut/fieldRoles.ts';
import { DERIVED_FIELDS, DERIVED_UNITS, type DerivedName } from '../derive/derivedFields.ts';

/** Prefix of the chooser keys of derived fields not made yet. */
export const DERIVED_KEY = 'derive:';

/** Derived fields that need the pressure and the velocity both (p₀ = p + ½ρ|u|²). */
const NEEDS_BOTH: readonly DerivedName[] = ['total-pressure'];

/** Derived fields the file can give, in the registry's order, leaving out names the dataset holds already. */
export function offeredDerived(fields: readonly FieldInfo[]): DerivedName[] {
  const velocity = guessRole(fields, 'velocity').field !== null, pressure = guessRole(fields, 'pressure').field !== null;
  const own = new Set(fields.map((f) => f.name));
  return (Object.keys(DERIVED_FIELDS) as DerivedName[]).filter((n) => {
    const spec = DERIVED_FIELDS[n];
    if (own.has(n) || spec.components > 3) return false;
    if (NEEDS_BOTH.includes(n)) return velocity && pressure;
    return spec.needs === 'velocity' ? velocity : pressure;
  });
}

/** The chooser's label of a derived field not made yet, with its SI unit. */
export function derivedLabel(name: DerivedName): string {
  const unit = DERIVED_UNITS[name];
  return `${name}${unit === '1' ? '' : ` [${unit}]`} (derived, made when chosen)`;
}
