/**
 * Unit labels. Result files carry no units; the viewer assumes SI and labels a field by its name when
 * the name is a common one (p → Pa, velocity → m/s …). Unknown names get no unit rather than a guess.
 */

const BY_NAME: readonly (readonly [RegExp, string])[] = [
  [/^(p|pressure|p_rgh|static[ _]?pressure|total[ _]?pressure|p0|pt)$/i, 'Pa'],
  [/^(u|v|velocity|vel|speed|u_?mean|umean)$/i, 'm/s'],
  [/wall[ _]?shear|^tau_?w$/i, 'Pa'],
  [/^(rho|density)$/i, 'kg/m³'],
  [/^(t|temperature)$/i, 'K'],
  [/^(mu|viscosity|dynamic[ _]?viscosity)$/i, 'Pa·s'],
  [/^(nu|kinematic[ _]?viscosity)$/i, 'm²/s'],
];

/** The SI unit of a field by its name, or '' when the name says nothing certain. */
export function fieldUnit(name: string): string {
  for (const [re, unit] of BY_NAME) if (re.test(name)) return unit;
  return '';
}

/** Units of the quantities the probes compute (SI, file lengths in metres). */
export const UNITS = {
  length: 'm',
  area: 'm²',
  volumeFlow: 'm³/s',
  massFlow: 'kg/s',
  pressure: 'Pa',
  force: 'N',
  moment: 'N·m',
  velocity: 'm/s',
  density: 'kg/m³',
  viscosity: 'Pa·s',
} as const;
