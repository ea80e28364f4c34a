/**
 * Unit labels. Result files carry no units; the viewer assumes SI and labels a field by its name when
 * the name is a common one (p → Pa, velocity → m/s …). Unknown names get no unit rather than a guess.
 */
import { unitByName } from '../study/units.ts';

/** The SI unit of a field by its name, or '' when the name says nothing certain (table in src/study/units.ts). */
export const fieldUnit = unitByName;

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
