/**
 * The probe-set document (format `fieldtally-probe-set`, version 2): every probe of a study — cut-planes,
 * line and point probes, force totals, pressure losses between two planes and mass balances — with its
 * geometry, fields, options, label and id, the reference values coefficients use, and the units of the
 * file. It is plain JSON; `probeSet.schema.json` beside this file describes it, `probeSetCheck.ts` checks
 * it (mirroring the schema), `probeSetFile.ts` reads and writes it and upgrades version 1 documents.
 *
 * Units: probe geometry is in the file's length unit (`units.length`, default m), reference values are
 * SI (kg/m³, m/s, m², m, Pa, Pa·s), field units are declared per field (`units.fields`, default SI).
 * Optional members may be left out; `probeDefaults.ts` says what a missing member means.
 */
import type { GroupSelector } from '../surface/groupSelect.ts';

export type Vec3 = [number, number, number];

/** The document's `format` member. */
export const PROBE_SET_FORMAT = 'fieldtally-probe-set';
/** The version this code writes; older versions are upgraded on reading. */
export const PROBE_SET_VERSION = 2;

export const PROBE_KINDS = ['cut-plane', 'line', 'point', 'force', 'pressure-loss', 'mass-balance', 'wall', 'iso'] as const;
export type ProbeKind = (typeof PROBE_KINDS)[number];

/** Filters that keep part of a cut (all optional; see src/cut/region.ts for the order they apply in). */
export interface RegionDoc {
  /** Keep the connected part that holds this point (projected onto the plane). */
  seed?: Vec3;
  /** Keep the part inside this circle in the plane. */
  disk?: { centre: Vec3; radius: number };
  /** Keep the part inside this rectangle: side along `axis` (projected into the plane), half-sizes along it and across. */
  rectangle?: { centre: Vec3; axis: Vec3; halfSizes: [number, number] };
  /** Keep triangles whose integer cell field `field` is one of `ids`. */
  cellGroups?: { field: string; ids: number[] };
}

/** A plane: a point of it, its normal (fluxes positive along it) and an optional region. */
export interface PlaneDoc {
  origin: Vec3;
  normal: Vec3;
  region?: RegionDoc;
}

/** Field roles of the flow probes: a field name (`point:`/`cell:` prefix allowed), or null for none. */
export interface FlowFields {
  velocity?: string | null;
  pressure?: string | null;
  /** A field name, a constant (kg/m³), or null for none. */
  density?: string | number | null;
}

export interface FlowOptions {
  /** The pressure field holds p/ρ; total pressure is then p/ρ + ½|u|². */
  kinematicPressure?: boolean;
}

/** Reference values (SI). `preset` fills density and viscosity unless they are given. */
export interface ReferenceDoc {
  preset?: string;
  /** ρ, kg/m³. */
  density?: number;
  /** μ, Pa·s. */
  viscosity?: number;
  /** U, m/s. */
  speed?: number;
  /** A, m². */
  area?: number;
  /** L, m. */
  length?: number;
  /** p_ref, Pa, subtracted from the pressure in force totals. */
  pressure?: number;
  dragDirection?: Vec3;
  liftDirection?: Vec3;
  /**
   * How the lift direction is chosen: `set` (default) uses `liftDirection`; `rule` derives it on each file
   * from the drag direction and the mesh's extents (`liftRule.ts`), `liftDirection` then only records the last one.
   */
  liftFrom?: 'set' | 'rule';
  /** Point moments are taken about, in the file's length unit. */
  momentPoint?: Vec3;
}

export interface UnitsDoc {
  /** Length unit of the file's coordinates and of probe geometry. Default `m`. */
  length?: string;
  /** Unit of each field by name (`p`: `kPa` …). Undeclared fields are taken as SI. */
  fields?: Record<string, string>;
}

interface ProbeBase {
  /** Unique within the set: letters, digits, `.`, `_`, `-`, starting with a letter or digit. */
  id: string;
  /** Shown in tables and on pins; default: the id. */
  label?: string;
  /** Where the app shows the pin: the box's top-left corner relative to the anchor (CSS pixels); default: placed automatically. */
  pin?: { offset: [number, number] };
}

export interface CutPlaneProbe extends ProbeBase {
  kind: 'cut-plane';
  geometry: PlaneDoc;
  fields?: FlowFields;
  options?: FlowOptions;
}

export interface BoundaryLayerDoc {
  /** Velocity field; default `velocity`. */
  velocity?: string;
  edge?: 'max' | 'gradient';
  edgeFraction?: number;
  /** Use the velocity component along this direction. */
  direction?: Vec3;
}

export interface LineProbe extends ProbeBase {
  kind: 'line';
  geometry: { from: Vec3; to: Vec3 };
  fields?: { sample?: string[] };
  options?: {
    /** `even`: `samples` evenly spaced samples; `cell-crossings`: at both ends and every cell-face crossing. */
    spacing?: 'even' | 'cell-crossings';
    samples?: number;
    tolerance?: number;
    /** The line starts on a wall: report edge velocity, δ99, δ*, θ and H. */
    boundaryLayer?: BoundaryLayerDoc;
  };
}

export interface PointProbe extends ProbeBase {
  kind: 'point';
  geometry: { at: Vec3 };
  fields?: { sample?: string[] };
  options?: { tolerance?: number };
}

/**
 * Surface groups by name or by id (as `fieldtally surfaces` lists them), or chosen by what they are: a
 * selector `{ name?, within?, nearest?, areaFrom?, areaTo? }` (src/surface/groupSelect.ts; lengths in the
 * set's length unit, areas in its square).
 */
export type SurfaceRef = string | number | GroupSelector;

export interface SurfaceGrouping {
  featureAngle?: number;
  /** Integer cell array naming groups, or false to ignore group arrays. */
  groupArray?: string | false;
}

export interface ForceProbe extends ProbeBase {
  kind: 'force';
  geometry: { surfaces: SurfaceRef[] };
  fields?: { pressure?: string; wallShear?: string; velocity?: string; viscosity?: string };
  options?: SurfaceGrouping & {
    viscous?: 'auto' | 'wall-shear' | 'gradient' | 'none';
    kinematicPressure?: boolean;
    wallShearSign?: 1 | -1;
    /** Wall velocity gradient for the viscous part from the velocity: 'second-order' (default) or 'first-order'. */
    wallGradient?: 'second-order' | 'first-order';
    /** Values that replace the set's reference values for this probe. */
    reference?: ReferenceDoc;
  };
}

export interface PressureLossProbe extends ProbeBase {
  kind: 'pressure-loss';
  geometry: { upstream: PlaneDoc; downstream: PlaneDoc };
  fields?: FlowFields;
  options?: FlowOptions & { dynamicPressureFrom?: 'upstream' | 'downstream' };
}

export interface MassBalanceProbe extends ProbeBase {
  kind: 'mass-balance';
  /** Plane normals point out of the control volume; surfaces are oriented out of the fluid. */
  geometry: { planes: PlaneDoc[]; surfaces?: SurfaceRef[] };
  fields?: FlowFields;
  options?: SurfaceGrouping;
}

/** Wall quantities (τ_w, c_f, y⁺ statistics) on each of the named surface groups together. */
export interface WallProbe extends ProbeBase {
  kind: 'wall';
  geometry: { surfaces: SurfaceRef[] };
  fields?: { wallShear?: string; velocity?: string; viscosity?: string; pressure?: string };
  options?: SurfaceGrouping & {
    /** y of y⁺: the wall cell's centroid (default) or its first off-wall node. */
    wallDistance?: 'cell-centroid' | 'first-node';
    /** y⁺ thresholds for area shares (default [1, 5, 30]). */
    thresholds?: number[];
    /** y⁺ histogram bins (default 10). */
    bins?: number;
    /** τ_w from the file's wall-shear array, the velocity gradient, or auto (array when present). */
    shearFrom?: 'auto' | 'wall-shear' | 'gradient';
    wallGradient?: 'second-order' | 'first-order';
    wallShearSign?: 1 | -1;
  };
}

/**
 * An iso-surface: where `geometry.field` (a file array, derived field or formula; a vector by magnitude,
 * `NAME_x`/`_y`/`_z` for a component) equals `geometry.value` (in the field's SI unit: the set is evaluated
 * in SI). Reports area, enclosed volume when closed, pieces, and statistics of `fields.colourBy` on it.
 */
export interface IsoProbe extends ProbeBase {
  kind: 'iso';
  geometry: { field: string; value: number };
  fields?: { colourBy?: string };
}

export type Probe = CutPlaneProbe | LineProbe | PointProbe | ForceProbe | PressureLossProbe | MassBalanceProbe | WallProbe | IsoProbe;

/** A probe-set document of the current version. */
export interface ProbeSet {
  format: typeof PROBE_SET_FORMAT;
  version: typeof PROBE_SET_VERSION;
  title?: string;
  description?: string;
  units?: UnitsDoc;
  reference?: ReferenceDoc;
  /** User formulas defining new fields (name = expression; see src/derive/formulaParse.ts), evaluated in order; `unit` (optional, an SI label) is checked against the expression's unit, or names it when the inputs' units are unknown. */
  formulas?: { name: string; expression: string; unit?: string }[];
  /** The user's labels of surface groups, keyed by the group's name as the file gives it (its default label, e.g. `inlet`, `zone 3`, `part 2`), never by an id; shown in the group list, pins, tables and exports. */
  groupLabels?: Record<string, string>;
  probes: Probe[];
}

/** An empty set of the current version. */
export function emptyProbeSet(title?: string): ProbeSet {
  return { format: PROBE_SET_FORMAT, version: PROBE_SET_VERSION, ...(title ? { title } : {}), probes: [] };
}

/** The label a probe is shown with. */
export function probeLabel(p: Probe): string {
  return p.label ?? p.id;
}
