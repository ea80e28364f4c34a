/**
 * Point probe: field values at one point or at many (sensor positions, see sensorCsv.ts).
 *
 * Each point is located (locatePoint.ts: tolerance and tie rule) and every requested field sampled
 * (probeFields.ts). A point outside the mesh has `valid` 0 and NaN in every column — never a zero.
 * Positions in the file's length unit, values in the file's units.
 */
import type { Dataset } from '../model/dataset.ts';
import { getCellTree } from './cellTree.ts';
import { assertLocatable, checkTolerance, createLocation, DEFAULT_TOLERANCE, locatePoint } from './locatePoint.ts';
import { allocateColumns, resolveProbeFields, writeSample, type SampledField } from './probeFields.ts';

export interface PointProbeOptions {
  /** Fields to sample (probeFields.ts syntax). Default: all point fields, then cell fields with other names. */
  fields?: readonly string[];
  /** Parametric locate tolerance, relative to the cell size (0 … 1e-4). Default 1e-6. */
  tolerance: number;
  /** Labels of the points (same count), carried into the result. */
  labels?: readonly string[] | null;
}

export const POINT_PROBE_DEFAULTS: Readonly<PointProbeOptions> = { tolerance: DEFAULT_TOLERANCE };

export interface PointProbeResult {
  count: number;
  validCount: number;
  labels: readonly string[] | null;
  x: Float64Array;
  y: Float64Array;
  z: Float64Array;
  /** 1 inside the mesh, 0 outside. */
  valid: Uint8Array;
  /** Global cell id, −1 outside. */
  cell: Int32Array;
  fields: SampledField[];
}

const loc = createLocation();

/** Probes the points `points` (xyz interleaved). */
export function probePoints(dataset: Dataset, points: ArrayLike<number>, options: Partial<PointProbeOptions> = {}): PointProbeResult {
  const o: PointProbeOptions = { ...POINT_PROBE_DEFAULTS, ...options };
  if (points.length % 3 !== 0) throw new Error(`point probe: ${points.length} coordinates is not a multiple of 3`);
  const n = points.length / 3;
  if (o.labels && o.labels.length !== n) throw new Error(`point probe: ${o.labels.length} labels for ${n} points`);
  for (let i = 0; i < points.length; i++) {
    if (!Number.isFinite(points[i]!)) throw new Error(`point probe: point ${Math.floor(i / 3)} has a non-finite coordinate (${points[i]})`);
  }
  checkTolerance(o.tolerance, 'point probe');
  const tree = getCellTree(dataset);
  assertLocatable(tree);
  const fields = resolveProbeFields(dataset, o.fields);
  const x = new Float64Array(n), y = new Float64Array(n), z = new Float64Array(n);
  const valid = new Uint8Array(n), cell = new Int32Array(n);
  const columns = allocateColumns(fields, n);
  let validCount = 0, hint = -1;
  for (let i = 0; i < n; i++) {
    const px = points[3 * i]!, py = points[3 * i + 1]!, pz = points[3 * i + 2]!;
    x[i] = px; y[i] = py; z[i] = pz;
    const ok = locatePoint(tree, px, py, pz, loc, o.tolerance, hint);
    valid[i] = ok ? 1 : 0;
    cell[i] = loc.cell;
    writeSample(fields, columns, i, loc);
    if (ok) { validCount++; hint = loc.cell; }
  }
  return { count: n, validCount, labels: o.labels ?? null, x, y, z, valid, cell, fields: columns };
}

/** Probes one point. */
export function probePoint(dataset: Dataset, x: number, y: number, z: number, options: Partial<PointProbeOptions> = {}): PointProbeResult {
  return probePoints(dataset, [x, y, z], options);
}
