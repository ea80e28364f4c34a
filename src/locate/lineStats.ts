/**
 * Statistics of sampled fields along a line probe: min, max, mean and ∫ f ds, over the valid part only.
 *
 * ∫ f ds is the trapezoid rule over the stretches that lie in the mesh (`intervalInside`); stretches
 * outside are gaps, left out and reported. `mean` is length-weighted (∫ f ds / covered length); where the
 * valid samples cover no length (isolated valid samples) it is their arithmetic mean. Min and max are
 * over valid samples. With no valid sample every value is NaN (shown as null in JSON), never zero.
 * Vectors get one series per component plus one for the magnitude. Units: the field's for min, max and
 * mean; field unit × length unit for the integral.
 */
import type { LineProbeResult } from './lineProbe.ts';

export interface SeriesStats {
  validSamples: number;
  /** Sum of the lengths of the stretches inside the mesh. */
  coveredLength: number;
  min: number;
  max: number;
  mean: number;
  integral: number;
}

export interface LineSeries {
  /** Field name. */
  field: string;
  /** Column label, or `|name|` for a magnitude. */
  label: string;
  /** Component index, or −1 for the magnitude. */
  component: number;
  stats: SeriesStats;
}

export interface LineStats {
  /** Length of the line inside the mesh. */
  coveredLength: number;
  /** Stretches of [0, length] (arc length) outside the mesh, in order. */
  gaps: { from: number; to: number }[];
  series: LineSeries[];
}

/** Statistics of one column `f` over samples at arc lengths `s` (layout of LineProbeResult). */
export function seriesStats(s: Float64Array, f: Float64Array, valid: Uint8Array, intervalInside: Uint8Array): SeriesStats {
  let n = 0, lo = Infinity, hi = -Infinity, sum = 0, integral = 0, covered = 0;
  for (let i = 0; i < f.length; i++) {
    if (!valid[i]) continue;
    const v = f[i]!;
    n++; sum += v;
    if (v < lo) lo = v; if (v > hi) hi = v;
  }
  for (let i = 0; i + 1 < f.length; i++) {
    if (!intervalInside[i]) continue;
    const h = s[i + 1]! - s[i]!;
    covered += h;
    integral += 0.5 * h * (f[i]! + f[i + 1]!);
  }
  if (n === 0) return { validSamples: 0, coveredLength: 0, min: NaN, max: NaN, mean: NaN, integral: NaN };
  return { validSamples: n, coveredLength: covered, min: lo, max: hi, mean: covered > 0 ? integral / covered : sum / n, integral };
}

/** The stretches of the line outside the mesh (leading and trailing ones included). */
export function lineGaps(r: LineProbeResult): { from: number; to: number }[] {
  if (r.count === 0) return [{ from: 0, to: r.length }];
  const gaps: { from: number; to: number }[] = [];
  const add = (a: number, b: number) => {
    if (b <= a) return;
    const last = gaps[gaps.length - 1];
    if (last && last.to >= a) last.to = b; else gaps.push({ from: a, to: b });
  };
  add(0, r.s[0]!);
  for (let i = 0; i + 1 < r.count; i++) if (!r.intervalInside[i]) add(r.s[i]!, r.s[i + 1]!);
  add(r.s[r.count - 1]!, r.length);
  return gaps;
}

/** Statistics of every sampled field of a line probe (components, and magnitudes of vectors). */
export function lineStats(r: LineProbeResult): LineStats {
  let covered = 0;
  for (let i = 0; i + 1 < r.count; i++) if (r.intervalInside[i]) covered += r.s[i + 1]! - r.s[i]!;
  const series: LineSeries[] = [];
  for (const f of r.fields) {
    f.columns.forEach((col, c) => series.push({ field: f.name, label: f.labels[c]!, component: f.components === 1 ? 0 : c, stats: seriesStats(r.s, col, r.valid, r.intervalInside) }));
    if (f.components > 1) {
      const mag = new Float64Array(r.count);
      for (let i = 0; i < r.count; i++) {
        let q = 0;
        for (const col of f.columns) q += col[i]! * col[i]!;
        mag[i] = Math.sqrt(q);
      }
      series.push({ field: f.name, label: `|${f.name}|`, component: -1, stats: seriesStats(r.s, mag, r.valid, r.intervalInside) });
    }
  }
  return { coveredLength: covered, gaps: lineGaps(r), series };
}
