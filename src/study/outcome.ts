/**
 * What one probe's evaluation produces (its numbers with units, notes, pin anchor, shapes) and what the
 * kind evaluators share (the SI dataset, reference values, unit lookup, cached surfaces).
 */
import type { TriangleSet } from '../cut/triangleSet.ts';
import type { Dataset } from '../model/dataset.ts';
import type { BoundaryFaces } from '../surface/boundaryFaces.ts';
import type { SurfaceGroups } from '../surface/surfaceGroups.ts';
import type { ProbeKind, ReferenceDoc, SurfaceGrouping, Vec3 } from './probeSet.ts';
import { fluidPreset } from './units.ts';

/** One number of a probe: finite value in `unit` (SI; `1` for dimensionless). */
export interface Quantity {
  /** Stable key within the probe, e.g. `massFlowRate`, `force.drag`, `CD`. */
  key: string;
  /** Short label with symbol, e.g. `ṁ`. */
  label: string;
  value: number;
  unit: string;
}

/** Something drawn for a probe in a picture (file length unit). */
export type ProbeShape =
  | { kind: 'triangles'; set: TriangleSet }
  | { kind: 'segment'; from: Vec3; to: Vec3 }
  | { kind: 'point'; at: Vec3 };

/** The outcome of one probe. */
export interface ProbeOutcome {
  id: string;
  kind: ProbeKind;
  label: string;
  /** False when the probe could not give (all) its numbers; `error` says why. */
  ok: boolean;
  error: string | null;
  /** The numbers it did give (a failed probe may still carry some). */
  quantities: Quantity[];
  notes: string[];
  /** Where its pin points (file length unit), or null. */
  anchor: Vec3 | null;
  /** The probe in words: geometry, fields used, reference values. */
  definition: string;
  /** Only with `keepShapes`. */
  shapes?: ProbeShape[];
  /**
   * Sizes some quantities are made of, by quantity key (same unit as the quantity; `label` names it): a value
   * at most 10⁻⁹ of its size is rounding noise (the app marks it "≈ 0"). A force total's components and
   * coefficients carry Σ|dF|, so a force made only of cancelling parts is marked as such.
   */
  scales?: Record<string, { value: number; label: string }>;
}

/** Reference values with the preset applied (SI). */
export type ResolvedReference = Omit<ReferenceDoc, 'preset'> & { preset?: string };

/** The set's reference values with the preset's density and viscosity filled in where not given. */
export function resolveReference(r: ReferenceDoc | undefined, override?: ReferenceDoc): ResolvedReference {
  const merged: ReferenceDoc = { ...r, ...override };
  const preset = merged.preset ? fluidPreset(merged.preset) : undefined;
  if (merged.preset && !preset) throw new Error(`reference.preset: unknown preset "${merged.preset}"`);
  return {
    ...merged,
    ...(preset && merged.density === undefined ? { density: preset.density } : {}),
    ...(preset && merged.viscosity === undefined ? { viscosity: preset.viscosity } : {}),
  };
}

/** What the kind evaluators share. */
export interface EvalContext {
  /** The dataset in SI. */
  readonly dataset: Dataset;
  /** Metres per file length unit. */
  readonly lengthFactor: number;
  readonly reference: ResolvedReference;
  readonly keepShapes: boolean;
  /** SI unit of a field's values (declared, by name, or `undeclared`). */
  fieldUnit(name: string): string;
  /** Boundary faces and their groups, computed once per grouping. */
  surfaces(grouping: SurfaceGrouping | undefined): { faces: BoundaryFaces; groups: SurfaceGroups };
  /** File-unit point → SI. */
  si(v: Vec3): Vec3;
  /** SI point → file unit. */
  file(v: readonly number[]): Vec3;
}

/** Adds a quantity when the value is a finite number (null/NaN values are left out, never zeroed). */
export function addQuantity(out: ProbeOutcome, key: string, label: string, value: number | null | undefined, unit: string): void {
  if (value !== null && value !== undefined && Number.isFinite(value)) out.quantities.push({ key, label, value, unit });
}

/** Marks a probe failed with a message. */
export function fail(out: ProbeOutcome, message: string): void {
  out.ok = false;
  out.error ??= message;
}

/** Number text for definitions: 6 significant figures. */
export function fmt6(v: number): string {
  return Number.isFinite(v) ? String(Number(v.toPrecision(6))) : '—';
}

/** `(x, y, z)` with 6 significant figures. */
export function vecText(v: readonly number[]): string {
  return `(${v.map(fmt6).join(', ')})`;
}
