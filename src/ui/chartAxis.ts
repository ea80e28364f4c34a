/**
 * What a line-probe chart plots along its x axis: the arc length from the line's start, one coordinate,
 * or the distance from a chosen point divided by a chosen length (r/R across a pipe, say). Pure: no DOM.
 */

export type XMeasure = 's' | 'x' | 'y' | 'z' | 'distance';

export interface XChoice {
  measure: XMeasure;
  /** The point distances are measured from (file length unit). */
  point: [number, number, number];
  /** The length distances are divided by (file length unit); 1 leaves them in metres. */
  length: number;
}

export const DEFAULT_X: XChoice = { measure: 's', point: [0, 0, 0], length: 1 };

/** Sample positions of a line probe (file length unit). */
export interface SamplePositions {
  s: Float64Array;
  x: Float64Array;
  y: Float64Array;
  z: Float64Array;
}

/** The x value of every sample. */
export function xValues(c: XChoice, p: SamplePositions): Float64Array {
  switch (c.measure) {
    case 's': return p.s;
    case 'x': return p.x;
    case 'y': return p.y;
    case 'z': return p.z;
    default: {
      const [a, b, d] = c.point, out = new Float64Array(p.s.length);
      for (let i = 0; i < out.length; i++) out[i] = Math.hypot(p.x[i]! - a, p.y[i]! - b, p.z[i]! - d) / c.length;
      return out;
    }
  }
}

/** The axis name and unit: `arc length s` [m], `x` [m], `r/L (from (0, 0, 0.05), L = 0.01 m)` [] or `r` [m] when L = 1. */
export function xName(c: XChoice): { name: string; unit: string } {
  if (c.measure === 's') return { name: 'arc length s', unit: 'm' };
  if (c.measure !== 'distance') return { name: c.measure, unit: 'm' };
  const from = `from (${c.point.map(String).join(', ')})`;
  return c.length === 1 ? { name: `r ${from}`, unit: 'm' } : { name: `r/L ${from}, L = ${c.length} m`, unit: '' };
}

/** Checks a typed choice; a one-line message, or null. */
export function xProblem(c: XChoice): string | null {
  if (!c.point.every(Number.isFinite)) return `the point (${c.point.join(', ')}) needs three finite numbers`;
  if (!(c.length > 0) || !Number.isFinite(c.length)) return `the length ${c.length} must be a positive number`;
  return null;
}
