/**
 * The grid-convergence study over a probe set on three meshes. The committed sample pipes
 * (sample-fields/pipe-coarse/medium/fine.vtu, refinement ratio 1.5) hold the exact Hagen–Poiseuille field
 * at their nodes on a faceted wall, so the flow rate through a cut converges to Q = πR²V at second order:
 * the extrapolated value must be closer to it than the fine-mesh value.
 */
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { loadDatasetFile } from '../../src/io/nodeFiles.ts';
import { volumeSummary } from '../../src/model/cellMeasure.ts';
import { PIPE_LEVELS, pipeCase, pipeExact } from '../../src/samples/pipe.ts';
import { evaluateProbeSet, type SetEvaluation } from '../../src/study/evaluate.ts';
import { gridStudy, gridStudyJson, meshSize, type GridLevel } from '../../src/study/gridStudy.ts';
import type { ProbeSet } from '../../src/study/probeSet.ts';

const SET: ProbeSet = {
  format: 'fieldtally-probe-set', version: 2, reference: { preset: 'water-20c' },
  probes: [
    { id: 'mid', kind: 'cut-plane', geometry: { origin: [0, 0, 0.05], normal: [0, 0, 1] } },
    { id: 'loss', kind: 'pressure-loss', geometry: { upstream: { origin: [0, 0, 0.02], normal: [0, 0, 1] }, downstream: { origin: [0, 0, 0.08], normal: [0, 0, 1] } } },
  ],
};

async function level(name: 'coarse' | 'medium' | 'fine'): Promise<GridLevel> {
  const d = await loadDatasetFile(join(__dirname, `../../sample-fields/pipe-${name}.vtu`));
  return { file: `pipe-${name}.vtu`, size: meshSize(d), evaluation: evaluateProbeSet(d, SET) };
}

describe('grid-convergence study', () => {
  it('three pipe meshes: the extrapolated flow rate is closer to πR²V than the fine mesh\'s', async () => {
    const levels = [await level('coarse'), await level('medium'), await level('fine')];
    const s = gridStudy(levels);
    expect(s.levels.map((l) => l.file)).toEqual(['pipe-fine.vtu', 'pipe-medium.vtu', 'pipe-coarse.vtu']);
    const Q = s.quantities.find((x) => x.probe === 'mid' && x.key === 'volumeFlowRate')!;
    const exact = pipeExact().Q;
    expect(Q.result!.kind).toBe('monotonic');
    // Reference: docs/references.md §1, Hagen–Poiseuille (C): Q = πR²V = 1.5708e-5 m³/s
    const fineError = Math.abs(Q.phi[0]! - exact), extrapError = Math.abs(Q.result!.extrapolated! - exact);
    expect(extrapError).toBeLessThan(fineError / 10);
    // the faceted wall's area error is second order (chord area πR²(1 − sin(2π/n)/(2π/n)) ∝ 1/n²), so p ≈ 2
    expect(Q.result!.order!).toBeGreaterThan(1.8);
    expect(Q.result!.order!).toBeLessThan(2.2);
    // Reference: Celik et al. 2008, docs/references.md §6 — GCI_fine = 1.25 e_a/(r^p − 1), here a fraction
    const r = Q.result!;
    expect(r.gciFine!).toBeCloseTo(1.25 * r.approxRelError! / (r.r21 ** r.order! - 1), 14);
    expect(r.extrapRelError!).toBeLessThan(r.gciFine!);
    // mass flow in kg/s with the preset's density (IAPWS-95 water / ISA air, docs/references.md §10)
    const m = s.quantities.find((x) => x.probe === 'mid' && x.key === 'massFlowRate')!;
    expect(Math.abs(m.result!.extrapolated! / (998.207 * exact) - 1)).toBeLessThan(1e-3);
  });

  it('a quantity the mesh does not change is reported as converged, not as an oscillation of rounding noise', async () => {
    const s = gridStudy([await level('coarse'), await level('medium'), await level('fine')]);
    const dp0 = s.quantities.find((x) => x.probe === 'loss' && x.key === 'totalPressureLoss')!;
    // Reference: Hagen–Poiseuille, docs/references.md §1 (C): Δp₀ = G·Δz exactly on every mesh (p linear, same profile on both planes)
    expect(dp0.phi.every((v) => Math.abs(v! - 4.0064 * 0.06) < 1e-12)).toBe(true);
    expect(dp0.result!.kind).toBe('converged');
    expect(dp0.result!.order).toBeNull();
    const json = gridStudyJson(s) as { quantities: { quantity: string; behaviour: string }[] };
    expect(json.quantities.find((x) => x.quantity === 'totalPressureLoss')!.behaviour).toBe('converged');
  });

  it('h = (ΣV/N)^(1/3) of the 3D cells, in m; the levels refine by about 1.5', () => {
    const sizes = (['coarse', 'medium', 'fine'] as const).map((k) => { const d = pipeCase(PIPE_LEVELS[k]); return { d, s: meshSize(d) }; });
    for (const { d, s } of sizes) {
      const v = volumeSummary(d);
      // Reference: docs/references.md §6 — h = (ΣΔV/N)^(1/3) (Celik et al. 2008)
      expect(s.h).toBeCloseTo(Math.cbrt(v.volume / v.cells3D), 15);
    }
    expect(sizes[0]!.s.h / sizes[1]!.s.h).toBeCloseTo(1.49, 1);
    // a mesh given in mm: h in m
    expect(meshSize(sizes[1]!.d, 1e-3).h).toBeCloseTo(sizes[1]!.s.h * 1e-3, 15);
  });

  it('a quantity missing on one mesh is listed with the reason; equal sizes are refused', async () => {
    const fine = await level('fine'), medium = await level('medium'), coarse = await level('coarse');
    const broken: SetEvaluation = { ...coarse.evaluation, probes: coarse.evaluation.probes.map((p) => (p.id === 'mid' ? { ...p, ok: false, error: 'the plane misses every 3D cell of the mesh', quantities: [] } : p)) };
    const s = gridStudy([fine, medium, { ...coarse, evaluation: broken }], ['mid.area']);
    expect(s.quantities).toHaveLength(1);
    expect(s.quantities[0]!.result).toBeNull();
    expect(s.quantities[0]!.missing).toBe('missing on the coarse mesh pipe-coarse.vtu: the plane misses every 3D cell of the mesh');
    expect(() => gridStudy([fine, fine, coarse])).toThrow(/the three meshes need different sizes/);
    expect(() => gridStudy([fine, coarse])).toThrow(/needs exactly three meshes, got 2/);
  });
});
