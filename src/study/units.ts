/**
 * Units of a probe set: a small catalogue of the units a result file's coordinates and fields are
 * commonly stored in, each with its SI unit and the factor to it; the SI units of the quantities the
 * probes compute; the unit a field has by its name when nothing is declared; and the reference-value
 * presets (water at 20 °C, air at the ISA sea level).
 *
 * Rule: everything is SI by default. A probe set may declare the file's length unit and any field's unit;
 * the evaluator then converts those values to SI before computing (`siDataset.ts`), so every output is
 * in SI and carries its SI unit. Offset units (°C, °F) are refused: they cannot be converted by a factor.
 * Dimensionless numbers carry the unit `1` in machine-readable outputs (shown blank on screen).
 */

/** One catalogue entry: `symbol` as written, its SI unit and the factor that converts a value to it. */
export interface UnitDef {
  readonly symbol: string;
  readonly si: string;
  readonly factor: number;
}

// Exact by definition: inch 0.0254 m, foot 0.3048 m, pound 0.45359237 kg, standard gravity 9.80665 m/s²
// (international yard and pound, 1959; CGPM 1901), so psi = 0.45359237·9.80665/0.0254² Pa.
const PSI = (0.45359237 * 9.80665) / (0.0254 * 0.0254);

/** The catalogue (symbols with `²`, `³`, `·`; `unitDef` also accepts `^2`, `^3`, `*`, `.` and `3` spellings). */
export const UNIT_CATALOGUE: readonly UnitDef[] = [
  { symbol: '1', si: '1', factor: 1 },
  { symbol: 'm', si: 'm', factor: 1 }, { symbol: 'mm', si: 'm', factor: 1e-3 }, { symbol: 'cm', si: 'm', factor: 1e-2 },
  { symbol: 'km', si: 'm', factor: 1e3 }, { symbol: 'in', si: 'm', factor: 0.0254 }, { symbol: 'ft', si: 'm', factor: 0.3048 },
  { symbol: 'm²', si: 'm²', factor: 1 }, { symbol: 'mm²', si: 'm²', factor: 1e-6 }, { symbol: 'cm²', si: 'm²', factor: 1e-4 },
  { symbol: 'm/s', si: 'm/s', factor: 1 }, { symbol: 'mm/s', si: 'm/s', factor: 1e-3 }, { symbol: 'cm/s', si: 'm/s', factor: 1e-2 },
  { symbol: 'km/h', si: 'm/s', factor: 1 / 3.6 }, { symbol: 'ft/s', si: 'm/s', factor: 0.3048 },
  { symbol: 'm/s²', si: 'm/s²', factor: 1 },
  { symbol: 'Pa', si: 'Pa', factor: 1 }, { symbol: 'hPa', si: 'Pa', factor: 100 }, { symbol: 'kPa', si: 'Pa', factor: 1e3 },
  { symbol: 'MPa', si: 'Pa', factor: 1e6 }, { symbol: 'mbar', si: 'Pa', factor: 100 }, { symbol: 'bar', si: 'Pa', factor: 1e5 },
  { symbol: 'atm', si: 'Pa', factor: 101325 }, { symbol: 'psi', si: 'Pa', factor: PSI },
  { symbol: 'kg/m³', si: 'kg/m³', factor: 1 }, { symbol: 'g/cm³', si: 'kg/m³', factor: 1e3 }, { symbol: 'g/L', si: 'kg/m³', factor: 1 },
  { symbol: 'Pa·s', si: 'Pa·s', factor: 1 }, { symbol: 'mPa·s', si: 'Pa·s', factor: 1e-3 }, { symbol: 'cP', si: 'Pa·s', factor: 1e-3 },
  { symbol: 'P', si: 'Pa·s', factor: 0.1 },
  { symbol: 'm²/s', si: 'm²/s', factor: 1 }, { symbol: 'mm²/s', si: 'm²/s', factor: 1e-6 }, { symbol: 'cSt', si: 'm²/s', factor: 1e-6 },
  { symbol: 'St', si: 'm²/s', factor: 1e-4 },
  { symbol: 'm²/s²', si: 'm²/s²', factor: 1 }, { symbol: 'm²/s³', si: 'm²/s³', factor: 1 }, { symbol: '1/s', si: '1/s', factor: 1 },
  { symbol: 'K', si: 'K', factor: 1 },
  { symbol: 'N', si: 'N', factor: 1 }, { symbol: 'kN', si: 'N', factor: 1e3 }, { symbol: 'N·m', si: 'N·m', factor: 1 },
  { symbol: 'kg/s', si: 'kg/s', factor: 1 }, { symbol: 'm³/s', si: 'm³/s', factor: 1 }, { symbol: 'L/s', si: 'm³/s', factor: 1e-3 },
  { symbol: 'm³/h', si: 'm³/s', factor: 1 / 3600 },
  { symbol: 'W', si: 'W', factor: 1 }, { symbol: 'W/m²', si: 'W/m²', factor: 1 }, { symbol: 'J/kg', si: 'J/kg', factor: 1 },
];

/** Length units a file's coordinates may be declared in. */
export const LENGTH_UNITS: readonly string[] = UNIT_CATALOGUE.filter((u) => u.si === 'm').map((u) => u.symbol);

/** Spelling variants → catalogue symbol form (`m^3` → `m³`, `Pa*s` or `Pa.s` → `Pa·s`, `kg/m3` → `kg/m³`). */
export function normaliseUnit(text: string): string {
  return text.trim().replace(/\^2|(?<=[a-z])2(?![\d])/g, '²').replace(/\^3|(?<=[a-z])3(?![\d])/g, '³')
    .replace(/(?<=[A-Za-z])[*.](?=[A-Za-z])/g, '·');
}

/** The catalogue entry of a unit, or undefined. */
export function unitDef(text: string): UnitDef | undefined {
  const s = normaliseUnit(text);
  return UNIT_CATALOGUE.find((u) => u.symbol === s);
}

/**
 * Why a unit text is refused, or null when the catalogue has it. Documents must use the catalogue's
 * spelling exactly; a variant spelling is refused with the spelling to use.
 */
export function unitProblem(text: string): string | null {
  if (UNIT_CATALOGUE.some((u) => u.symbol === text)) return null;
  const near = unitDef(text);
  if (near) return `"${text}" is written "${near.symbol}" here`;
  if (/°|deg\s*[CF]|^C$|^F$/i.test(text.trim())) {
    return `"${text}", an offset unit (a temperature scale with a shifted zero): convert the field to K or leave its unit undeclared`;
  }
  return `an unknown unit "${text}"`;
}

/** SI units of the quantities probes compute. Dimensionless numbers: `1`. */
export const SI = {
  length: 'm', area: 'm²', volumeFlow: 'm³/s', massFlow: 'kg/s', velocity: 'm/s', pressure: 'Pa',
  kinematicPressure: 'm²/s²', force: 'N', moment: 'N·m', density: 'kg/m³', viscosity: 'Pa·s', dimensionless: '1',
} as const;

/** Shown where a field's unit is neither declared nor known by its name. */
export const UNDECLARED = 'undeclared';

const BY_NAME: readonly (readonly [RegExp, string])[] = [
  [/^(p|pressure|p_rgh|static[ _]?pressure|total[ _]?pressure|p0|pt)$/i, 'Pa'],
  [/^(u|v|velocity|velocities|vel|speed|u_?mean|umean)$/i, 'm/s'],
  [/wall[ _]?shear|^skin[ _]?friction$|^tau_?w$|^wss$/i, 'Pa'],
  [/^(rho|density)$/i, 'kg/m³'],
  [/^(t|temperature)$/i, 'K'],
  [/^(mu|viscosity|dynamic[ _]?viscosity)$/i, 'Pa·s'],
  [/^(nu|kinematic[ _]?viscosity)$/i, 'm²/s'],
];

/** The SI unit a field has by its name in an SI file, or '' when the name says nothing certain. */
export function unitByName(name: string): string {
  for (const [re, unit] of BY_NAME) if (re.test(name)) return unit;
  return '';
}

/**
 * The SI unit of a field's values after conversion: its declared unit's SI unit, else the unit its name
 * implies, else `UNDECLARED`.
 */
export function fieldSiUnit(name: string, declared: Readonly<Record<string, string>>): string {
  const d = declared[name];
  if (d !== undefined) return unitDef(d)?.si ?? UNDECLARED;
  return unitByName(name) || UNDECLARED;
}

/** A unit for display: blank for dimensionless. */
export function unitLabel(unit: string): string {
  return unit === '1' ? '' : unit;
}

/** Fluid properties a reference-value preset supplies (SI). */
export interface FluidPreset {
  readonly id: string;
  readonly label: string;
  /** Density, kg/m³. */
  readonly density: number;
  /** Dynamic viscosity, Pa·s. */
  readonly viscosity: number;
  readonly source: string;
}

/**
 * Reference-value presets. Values from docs/references.md §10: water at 20 °C, 1 atm, from
 * IAPWS-95/IAPWS-2008 (C); ISA sea-level density from the Mechanical Engineers' Handbook vol. 4, Table 6
 * (V), air viscosity from Sutherland's law at 288.15 K (C).
 */
export const FLUID_PRESETS: readonly FluidPreset[] = [
  { id: 'water-20c', label: 'water at 20 °C, 1 atm', density: 998.207, viscosity: 1.00160e-3, source: 'docs/references.md §10 (IAPWS-95 / IAPWS-2008)' },
  { id: 'air-isa-sea-level', label: 'air, ISA sea level (288.15 K, 101325 Pa)', density: 1.2250, viscosity: 1.7894e-5, source: 'docs/references.md §10 (ISA table; Sutherland\'s law)' },
];

/** A preset by id, or undefined. */
export function fluidPreset(id: string): FluidPreset | undefined {
  return FLUID_PRESETS.find((p) => p.id === id);
}
