/** Axis-aligned bounds of points, as `[xmin, xmax, ymin, ymax, zmin, zmax]` in the file's length unit. */
import type { Dataset } from './dataset.ts';

export type Bounds = [number, number, number, number, number, number];

/** An empty box (min > max), which `isEmptyBounds` recognises. */
export const emptyBounds = (): Bounds => [Infinity, -Infinity, Infinity, -Infinity, Infinity, -Infinity];

export const isEmptyBounds = (b: Bounds): boolean => b[0] > b[1];

/** Bounds of an xyz-interleaved point array, grown into `out`. */
export function growBounds(points: Float64Array, out: Bounds = emptyBounds()): Bounds {
  let x0 = out[0], x1 = out[1], y0 = out[2], y1 = out[3], z0 = out[4], z1 = out[5];
  for (let i = 0; i < points.length; i += 3) {
    const x = points[i]!, y = points[i + 1]!, z = points[i + 2]!;
    if (x < x0) x0 = x; if (x > x1) x1 = x;
    if (y < y0) y0 = y; if (y > y1) y1 = y;
    if (z < z0) z0 = z; if (z > z1) z1 = z;
  }
  out[0] = x0; out[1] = x1; out[2] = y0; out[3] = y1; out[4] = z0; out[5] = z1;
  return out;
}

const boundsCache = new WeakMap<Dataset, Bounds>();

/**
 * Bounds of every point of every piece of a dataset (of the whole piece set for an assembled dataset).
 * Computed once per dataset (a loaded dataset's points never change) and returned as a fresh copy, so the
 * load report, the view and the first cut's tolerance share one pass over the points.
 */
export function datasetBounds(d: Dataset): Bounds {
  if (d.assembled) return [...d.assembled.bounds];
  let b = boundsCache.get(d);
  if (!b) {
    b = emptyBounds();
    for (const p of d.pieces) growBounds(p.points, b);
    boundsCache.set(d, b);
  }
  return [...b];
}

/** Length of the bounds' diagonal (0 for empty bounds): the dataset's length scale for tolerances. */
export function boundsDiagonal(b: Bounds): number {
  if (isEmptyBounds(b)) return 0;
  return Math.hypot(b[1] - b[0], b[3] - b[2], b[5] - b[4]);
}
