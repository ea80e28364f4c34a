/**
 * The study's reference conditions as one plain record — the fluid (a preset of src/study/units.ts or
 * custom values), the reference speed, area, length and pressure, the drag and lift directions and the
 * moment point — and its translation to and from the probe set's `reference` member. Every probe of the
 * app reads these unless it overrides a value. Pure: no DOM.
 *
 * Units: SI (kg/m³, Pa·s, m/s, m², m, Pa); the moment point in the file's length unit.
 */
import type { Bounds } from '../model/bounds.ts';
import { deriveLift } from '../study/liftRule.ts';
import type { ReferenceDoc, Vec3 } from '../study/probeSet.ts';
import { FLUID_PRESETS, fluidPreset } from '../study/units.ts';

/** `custom`: density and viscosity typed by the user. */
export const CUSTOM_FLUID = 'custom';

export interface ReferenceConditions {
  /** A preset id of `FLUID_PRESETS`, or `custom`. */
  fluid: string;
  /** ρ, kg/m³. */
  density: number;
  /** μ, Pa·s. */
  viscosity: number;
  /** U, m/s. */
  speed: number;
  /** A, m². */
  area: number;
  /** L, m. */
  length: number;
  /** p_ref, Pa. */
  pressure: number;
  drag: Vec3;
  /** `rule`: lift derived by src/study/liftRule.ts from drag and the mesh's extents; `set`: `lift` as typed. */
  liftFrom: 'rule' | 'set';
  lift: Vec3;
  momentPoint: Vec3;
}

/** Conditions at start: the first preset's fluid, unit speed, area and length, zero reference pressure, drag +x, lift by the rule. */
export function defaultConditions(): ReferenceConditions {
  const f = FLUID_PRESETS[0]!;
  return {
    fluid: f.id, density: f.density, viscosity: f.viscosity, speed: 1, area: 1, length: 1, pressure: 0,
    drag: [1, 0, 0], liftFrom: 'rule', lift: [0, 0, 1], momentPoint: [0, 0, 0],
  };
}

/** Takes a preset's density and viscosity; `custom` keeps the values. Throws on an unknown id. */
export function choosePreset(c: ReferenceConditions, id: string): ReferenceConditions {
  if (id === CUSTOM_FLUID) return { ...c, fluid: id };
  const p = fluidPreset(id);
  if (!p) throw new Error(`reference conditions: unknown fluid preset "${id}" (expected ${FLUID_PRESETS.map((x) => x.id).join(', ')} or ${CUSTOM_FLUID})`);
  return { ...c, fluid: id, density: p.density, viscosity: p.viscosity };
}

/** After a hand edit of ρ or μ: still the preset when both equal its values, else custom. */
export function fluidAfterEdit(c: ReferenceConditions): string {
  const p = FLUID_PRESETS.find((x) => x.density === c.density && x.viscosity === c.viscosity);
  return p?.id ?? CUSTOM_FLUID;
}

/** The lift direction in use and, when derived, the rule's sentence (null when set by hand). */
export function liftOf(c: ReferenceConditions, bounds: Bounds): { direction: Vec3; rule: string | null } {
  if (c.liftFrom === 'set') return { direction: [...c.lift], rule: null };
  const d = deriveLift(c.drag, bounds);
  return { direction: d.direction, rule: d.text };
}

/**
 * The probe set's `reference` member: every value explicit (the preset named too), the lift direction as
 * used and how it was chosen (`liftFrom`: the command line re-derives a ruled lift on each file, as the app does).
 */
export function referenceDoc(c: ReferenceConditions, bounds: Bounds): ReferenceDoc {
  return {
    ...(c.fluid !== CUSTOM_FLUID ? { preset: c.fluid } : {}),
    density: c.density, viscosity: c.viscosity, speed: c.speed, area: c.area, length: c.length, pressure: c.pressure,
    dragDirection: [...c.drag], liftDirection: liftOf(c, bounds).direction, liftFrom: c.liftFrom, momentPoint: [...c.momentPoint],
  };
}

/**
 * Conditions from a probe set's `reference` (preset applied; members it leaves out keep `base`'s). A
 * lift direction without `liftFrom` is taken as set by hand.
 */
export function conditionsFromDoc(doc: ReferenceDoc | undefined, base: ReferenceConditions = defaultConditions()): ReferenceConditions {
  if (!doc) return { ...base };
  let c: ReferenceConditions = { ...base };
  if (doc.preset !== undefined) c = choosePreset(c, doc.preset);
  if (doc.density !== undefined) c.density = doc.density;
  if (doc.viscosity !== undefined) c.viscosity = doc.viscosity;
  if (doc.density !== undefined || doc.viscosity !== undefined) c.fluid = doc.preset !== undefined && fluidAfterEdit(c) === doc.preset ? doc.preset : fluidAfterEdit(c);
  if (doc.speed !== undefined) c.speed = doc.speed;
  if (doc.area !== undefined) c.area = doc.area;
  if (doc.length !== undefined) c.length = doc.length;
  if (doc.pressure !== undefined) c.pressure = doc.pressure;
  if (doc.dragDirection) c.drag = [...doc.dragDirection];
  if (doc.liftDirection) { c.lift = [...doc.liftDirection]; c.liftFrom = 'set'; }
  if (doc.liftFrom) c.liftFrom = doc.liftFrom;
  if (doc.momentPoint) c.momentPoint = [...doc.momentPoint];
  return c;
}
