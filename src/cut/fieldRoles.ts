/**
 * Which field is the velocity, the pressure and the density, when the user does not say.
 *
 * Rule (stated in the CLI help and reports): among the fields, a role's candidates are those whose name
 * matches the role's pattern (case-insensitive) and whose component count fits (velocity 3, the others 1):
 *  - velocity: `u`, `vel`, `velocity`, `velocities`, or a name starting with `velocity`;
 *  - pressure: `p`, `pres`, `press`, `pressure`, `static pressure` / `static_pressure`;
 *  - density:  `rho`, `dens`, `density`.
 * If exactly one name qualifies it is used — the point field when a point and a cell field share it (point
 * data is interpolated, so it carries more detail). Otherwise the role is left unset and the caller must
 * name the field.
 */

/** What a role resolver needs to know about a field. */
export interface FieldInfo {
  readonly name: string;
  readonly association: 'point' | 'cell';
  readonly components: number;
}

export type Role = 'velocity' | 'pressure' | 'density';

const PATTERNS: Record<Role, { re: RegExp; components: number }> = {
  velocity: { re: /^(u|vel|velocity.*|velocities)$/i, components: 3 },
  pressure: { re: /^(p|pres|press|pressure|static[ _]?pressure)$/i, components: 1 },
  density: { re: /^(rho|dens|density)$/i, components: 1 },
};

/** Outcome of resolving one role. */
export interface RoleMatch {
  /** The chosen field, or null. */
  field: FieldInfo | null;
  /** Distinct names that qualified (more than one means ambiguous). */
  candidates: string[];
}

/** Resolves a role by the rule in the file comment. */
export function guessRole(fields: readonly FieldInfo[], role: Role): RoleMatch {
  const { re, components } = PATTERNS[role];
  const ok = fields.filter((f) => f.components === components && re.test(f.name));
  const names = [...new Set(ok.map((f) => f.name))];
  if (names.length !== 1) return { field: null, candidates: names };
  const same = ok.filter((f) => f.name === names[0]);
  return { field: same.find((f) => f.association === 'point') ?? same[0]!, candidates: names };
}

/**
 * Finds a field the user named: `name` alone (point field preferred over a cell field of the same name),
 * or `point:name` / `cell:name` to choose. Throws listing the fields when there is no such field.
 */
export function pickField(fields: readonly FieldInfo[], spec: string, what: string): FieldInfo {
  const m = /^(point|cell):(.*)$/.exec(spec);
  const name = m ? m[2]! : spec;
  const assoc = m ? (m[1] as 'point' | 'cell') : undefined;
  const hit = fields.filter((f) => f.name === name && (!assoc || f.association === assoc));
  const f = hit.find((x) => x.association === 'point') ?? hit[0];
  if (!f) {
    const list = fields.map((x) => `${x.name} (${x.association}, ${x.components})`).join(', ') || 'none';
    throw new Error(`${what}: no field "${spec}" (fields: ${list})`);
  }
  return f;
}
