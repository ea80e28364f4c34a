/**
 * Velocity profile across a laminar pipe by line probe, on three meshes.
 * Reference: docs/references.md §1, Hagen–Poiseuille (C): u = G(R² − r²)/4μ with G = 8μV/R²
 * (u_max = 2V on the axis). The sample field holds the exact profile at the nodes; between nodes the
 * probe interpolates, so its error must fall at about second order in the mesh size (the levels refine
 * by 1.5 in every direction).
 */
import { describe, expect, it } from 'vitest';
import { probeLine } from '../../src/locate/lineProbe.ts';
import { lineStats } from '../../src/locate/lineStats.ts';
import { PIPE_DEFAULTS, PIPE_LEVELS, pipeCase } from '../../src/samples/pipe.ts';

const { radius: R, meanVelocity: V, mu } = PIPE_DEFAULTS;
const G = (8 * mu * V) / (R * R);
const exact = (x: number, y: number) => (G * (R * R - x * x - y * y)) / (4 * mu);

/** Chords across the pipe at z = 0.0437 (ends outside the wall), off any grid line. */
const CHORDS = [-0.0081, -0.0052, -0.0031, -0.0009, 0.0011, 0.0023, 0.0037, 0.0049, 0.0063, 0.0077, 0.0089];

/** RMS and max error of u_z over the valid samples of every chord. */
function chordErrors(level: keyof typeof PIPE_LEVELS) {
  const d = pipeCase({ ...PIPE_LEVELS[level] });
  let sq = 0, max = 0, n = 0, flagged = 0, gaps = 0;
  for (const y of CHORDS) {
    const r = probeLine(d, [-1.05 * R, y, 0.0437], [1.05 * R, y, 0.0437], { samples: 401, fields: ['velocity'] });
    const uz = r.fields[0]!.columns[2]!;
    for (let i = 0; i < r.count; i++) {
      if (!r.valid[i]) { expect(uz[i]).toBeNaN(); flagged++; continue; }
      const e = Math.abs(uz[i]! - exact(r.x[i]!, r.y[i]!));
      sq += e * e; max = Math.max(max, e); n++;
    }
    gaps += lineStats(r).gaps.length;
  }
  return { rms: Math.sqrt(sq / n), max, flagged, gaps };
}

describe('Hagen–Poiseuille profile across the pipe (docs/references.md §1)', () => {
  it('the error of the sampled profile falls at about second order over coarse, medium, fine', () => {
    const e = (['coarse', 'medium', 'fine'] as const).map((l) => chordErrors(l));
    const p1 = Math.log(e[0]!.rms / e[1]!.rms) / Math.log(1.5), p2 = Math.log(e[1]!.rms / e[2]!.rms) / Math.log(1.5);
    expect(p1).toBeGreaterThan(1.8); expect(p1).toBeLessThan(2.3);
    expect(p2).toBeGreaterThan(1.8); expect(p2).toBeLessThan(2.3);
    // Small already on the coarse mesh, relative to the centre-line velocity 2V.
    expect(e[0]!.max / (2 * V)).toBeLessThan(0.05);
    // Every chord's two ends lie outside the pipe: flagged, and reported as gaps.
    for (const q of e) {
      expect(q.flagged).toBeGreaterThan(2 * CHORDS.length);
      expect(q.gaps).toBe(2 * CHORDS.length);
    }
  });

  it('the mean of u_z along a diameter tends to (2/3)·u_max, the mean of the parabola', () => {
    const d = pipeCase({ ...PIPE_LEVELS.fine });
    const r = probeLine(d, [-R, 0, 0.05], [R, 0, 0.05], { mode: 'crossings', fields: ['velocity'] });
    const uz = lineStats(r).series.find((q) => q.label === 'velocity_z')!.stats;
    // The fine level has no node on the axis: the peak is interpolated, within O(h²) of 2V.
    expect(Math.abs(uz.max / (2 * V) - 1)).toBeLessThan(1e-2);
    expect(Math.abs(uz.mean / ((2 / 3) * 2 * V) - 1)).toBeLessThan(5e-3);
  });
});
