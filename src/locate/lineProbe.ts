/**
 * Line probe: field values along a segment A→B, either at N evenly spaced samples or at every crossing
 * of the segment with a cell face (so a profile shows the mesh's own resolution).
 *
 * Each sample carries its arc length s from A, its position, a `valid` flag (1 when a volume cell holds
 * it, see locatePoint.ts for the tolerance and tie rule) and every requested field (probeFields.ts).
 * Invalid samples hold NaN in every field column and are left out of every statistic; nothing is filled
 * with zeros. `intervalInside[i]` says whether the stretch between samples i and i+1 lies in the mesh:
 *  - at crossings, the stretch lies within one cell or wholly outside, so its midpoint decides;
 *  - at even spacing, a stretch counts as inside when both its ends are valid (a hole narrower than the
 *    spacing is not seen; use crossings to be sure).
 * A line with no valid sample gives an empty result (count 0) with `outside` set.
 * Lengths and positions are in the file's length unit; values in the file's units.
 */
import type { Dataset } from '../model/dataset.ts';
import { getCellTree } from './cellTree.ts';
import { lineLocator, locateLineSamples } from './lineSamples.ts';
import { assertLocatable, checkTolerance, createLocation, DEFAULT_TOLERANCE, locatePoint } from './locatePoint.ts';
import { allocateColumns, resolveProbeFields, writeSample, type ProbeField, type SampledField } from './probeFields.ts';
import { segmentCrossings } from './segmentCrossings.ts';

export type Vec3 = readonly [number, number, number];

export interface LineProbeOptions {
  /** `samples`: `samples` evenly spaced points, both ends included; `crossings`: both ends and every face crossing. Default `samples`. */
  mode: 'samples' | 'crossings';
  /** Number of samples for mode `samples` (2 … 10 000 000). Default 101. */
  samples: number;
  /** Fields to sample (probeFields.ts syntax). Default: all point fields, then cell fields with other names. */
  fields?: readonly string[];
  /** Parametric locate tolerance, relative to the cell size (0 … 1e-4). Default 1e-6. */
  tolerance: number;
}

export const LINE_PROBE_DEFAULTS: Readonly<LineProbeOptions> = { mode: 'samples', samples: 101, tolerance: DEFAULT_TOLERANCE };

export interface LineProbeResult {
  readonly from: Vec3;
  readonly to: Vec3;
  /** |B − A|, file length unit. */
  readonly length: number;
  readonly mode: 'samples' | 'crossings';
  /** Number of samples (0 when the line misses the mesh). */
  readonly count: number;
  readonly validCount: number;
  /** True when no sample lies inside the mesh (the result is then empty). */
  readonly outside: boolean;
  /** Arc length from A, per sample. */
  readonly s: Float64Array;
  readonly x: Float64Array;
  readonly y: Float64Array;
  readonly z: Float64Array;
  /** 1 inside the mesh, 0 outside. */
  readonly valid: Uint8Array;
  /** Global cell id holding the sample, −1 outside. */
  readonly cell: Int32Array;
  /** count − 1 entries: 1 when the stretch between samples i and i+1 lies in the mesh. */
  readonly intervalInside: Uint8Array;
  readonly fields: SampledField[];
}

const loc = createLocation();

/** Samples the dataset along A→B; validates the options and throws with a one-line message on misuse. */
export function probeLine(dataset: Dataset, from: Vec3, to: Vec3, options: Partial<LineProbeOptions> = {}): LineProbeResult {
  const o: LineProbeOptions = { ...LINE_PROBE_DEFAULTS, ...options };
  if (![...from, ...to].every(Number.isFinite)) throw new Error(`line probe: end points must be finite, got ${from.join(',')} → ${to.join(',')}`);
  const dx = to[0] - from[0], dy = to[1] - from[1], dz = to[2] - from[2];
  const length = Math.hypot(dx, dy, dz);
  if (!(length > 0)) throw new Error(`line probe: the two end points coincide (${from.join(',')})`);
  if (o.mode !== 'samples' && o.mode !== 'crossings') throw new Error(`line probe: mode must be "samples" or "crossings", got "${String(o.mode)}"`);
  if (o.mode === 'samples' && !(Number.isInteger(o.samples) && o.samples >= 2 && o.samples <= 1e7)) {
    throw new Error(`line probe: samples must be an integer from 2 to 10000000, got ${o.samples}`);
  }
  checkTolerance(o.tolerance, 'line probe');
  assertLocatable(lineLocator(dataset));
  const fields = resolveProbeFields(dataset, o.fields);
  if (o.mode === 'samples') return evenSamples(dataset, from, to, length, o.samples, o.tolerance, fields);

  const tree = getCellTree(dataset);
  const taus = segmentCrossings(tree, from[0], from[1], from[2], to[0], to[1], to[2]).slice();
  const n = taus.length;
  const s = new Float64Array(n), x = new Float64Array(n), y = new Float64Array(n), z = new Float64Array(n);
  const valid = new Uint8Array(n), cell = new Int32Array(n);
  const columns = allocateColumns(fields, n);
  let hint = -1, validCount = 0;
  for (let i = 0; i < n; i++) {
    const t = taus[i]!;
    // The end point exactly, not A + 1·(B − A) with its rounding.
    const px = t === 1 ? to[0] : from[0] + t * dx, py = t === 1 ? to[1] : from[1] + t * dy, pz = t === 1 ? to[2] : from[2] + t * dz;
    s[i] = t * length; x[i] = px; y[i] = py; z[i] = pz;
    const ok = locatePoint(tree, px, py, pz, loc, o.tolerance, hint);
    valid[i] = ok ? 1 : 0;
    cell[i] = loc.cell;
    writeSample(fields, columns, i, loc);
    if (ok) { validCount++; hint = loc.cell; }
  }
  if (validCount === 0) return emptyResult(from, to, length, o.mode, fields.length ? allocateColumns(fields, 0) : []);
  const intervalInside = new Uint8Array(n - 1);
  for (let i = 0; i + 1 < n; i++) {
    const t = 0.5 * (taus[i]! + taus[i + 1]!);
    intervalInside[i] = locatePoint(tree, from[0] + t * dx, from[1] + t * dy, from[2] + t * dz, loc, o.tolerance, cell[i]!) ? 1 : 0;
  }
  return { from, to, length, mode: o.mode, count: n, validCount, outside: false, s, x, y, z, valid, cell, intervalInside, fields: columns };
}

/** Evenly spaced samples (lineSamples.ts locates them: by the tree when built, else by a scan of the blocks the line meets). */
function evenSamples(dataset: Dataset, from: Vec3, to: Vec3, length: number, n: number, tolerance: number, fields: ProbeField[]): LineProbeResult {
  const dx = to[0] - from[0], dy = to[1] - from[1], dz = to[2] - from[2];
  const columns = allocateColumns(fields, n);
  const { cell } = locateLineSamples(dataset, from, to, n, tolerance, fields, columns);
  const s = new Float64Array(n), x = new Float64Array(n), y = new Float64Array(n), z = new Float64Array(n), valid = new Uint8Array(n);
  let validCount = 0;
  for (let i = 0; i < n; i++) {
    const t = i / (n - 1);
    s[i] = t * length;
    x[i] = t === 1 ? to[0] : from[0] + t * dx; y[i] = t === 1 ? to[1] : from[1] + t * dy; z[i] = t === 1 ? to[2] : from[2] + t * dz;
    if (cell[i]! >= 0) { valid[i] = 1; validCount++; }
  }
  if (validCount === 0) return emptyResult(from, to, length, 'samples', fields.length ? allocateColumns(fields, 0) : []);
  const intervalInside = new Uint8Array(n - 1);
  for (let i = 0; i + 1 < n; i++) intervalInside[i] = valid[i]! & valid[i + 1]!;
  return { from, to, length, mode: 'samples', count: n, validCount, outside: false, s, x, y, z, valid, cell, intervalInside, fields: columns };
}

function emptyResult(from: Vec3, to: Vec3, length: number, mode: LineProbeOptions['mode'], fields: SampledField[]): LineProbeResult {
  return {
    from, to, length, mode, count: 0, validCount: 0, outside: true,
    s: new Float64Array(0), x: new Float64Array(0), y: new Float64Array(0), z: new Float64Array(0),
    valid: new Uint8Array(0), cell: new Int32Array(0), intervalInside: new Uint8Array(0), fields,
  };
}
