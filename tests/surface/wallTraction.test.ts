/**
 * The viscous part of a force total from the second-order wall gradient (quadratic least-squares fit at each
 * wall node, the default) against the first-order route (the wall cell's linear gradient):
 *  - Stokes flow past a sphere (Stokes 1851; drag 6πμaU split 2πμaU pressure + 4πμaU viscous, i.e. 1/3 and
 *    2/3 — REFERENCES §3): on three mesh levels the viscous drag error falls ≈ 4× per halving with the
 *    second-order gradient, ≈ 2× with the first-order one;
 *  - Hagen–Poiseuille flow (REFERENCES §1; Hagen 1839, Poiseuille 1840): τ_w = 4μV/R along the flow, a
 *    quadratic profile the fit reproduces, so the wall's viscous force is exact for the faceted wall.
 */
import { describe, expect, it } from 'vitest';
import { PIPE_LEVELS, pipeCase, pipeExact } from '../../src/samples/pipe.ts';
import { sphereCase, sphereExact } from '../../src/samples/sphere.ts';
import type { Dataset } from '../../src/model/dataset.ts';
import { forceTotals } from '../../src/surface/forces.ts';
import { getBoundaryFaces, getSurfaceGroups } from '../../src/surface/surfaceCache.ts';
import { facesOfGroups } from '../../src/surface/surfaceGroups.ts';
import { surfaceLoads } from '../../src/surface/surfaceLoads.ts';
import { wallNodeGradients } from '../../src/surface/wallGradientCache.ts';
import { cornersFromNodes, cornerTraction, nodeTraction } from '../../src/surface/wallTraction.ts';

function viscous(d: Dataset, group: (g: { id: number; area: number }, i: number) => boolean, mu: number, wallGradient: 'second-order' | 'first-order') {
  const faces = getBoundaryFaces(d), groups = getSurfaceGroups(d);
  const picked = groups.groups.map((g, i) => (group(g, i) ? i : -1)).filter((i) => i >= 0);
  const loads = surfaceLoads(d, faces, facesOfGroups(groups, picked), { viscous: 'gradient', mu, wallGradient }, groups.faceSurfaceCell);
  return { r: forceTotals(d, faces, loads, { dragDirection: [0, 0, 1], liftDirection: [1, 0, 0] }), area: picked.reduce((s, i) => s + groups.groups[i]!.area, 0), loads };
}

describe('Stokes sphere: viscous drag 4πμaU (Stokes 1851)', () => {
  it('second-order wall gradient converges at second order, the first-order route at first order', () => {
    const ex = sphereExact();
    const errs = { 'second-order': [] as number[], 'first-order': [] as number[] };
    for (const refinement of [1, 2]) {
      const d = sphereCase({ refinement });
      for (const g of ['second-order', 'first-order'] as const) {
        const faces = getBoundaryFaces(d), groups = getSurfaceGroups(d);
        const wall = groups.groups.findIndex((x) => x.id === 1);
        const loads = surfaceLoads(d, faces, facesOfGroups(groups, [wall]), { viscous: 'gradient', mu: ex.mu, wallGradient: g }, groups.faceSurfaceCell);
        expect(loads.viscous.gradient).toBe(g);
        errs[g].push(Math.abs(forceTotals(d, faces, loads, {}).components.viscous!.drag / ex.dragViscous - 1));
      }
    }
    const s = errs['second-order'], f = errs['first-order'];
    expect(s[0]! / s[1]!, `second-order errors ${s}`).toBeGreaterThan(3.5);
    expect(f[0]! / f[1]!, `first-order errors ${f}`).toBeLessThan(2.5);
    expect(s[1]!).toBeLessThan(0.035);
    expect(s[1]!).toBeLessThan(f[1]!);
  });
});

describe('Hagen–Poiseuille wall: τ_w = 4μV/R', () => {
  it('second order: the wall gradient at every node is exact, so the force is τ_w·cos(π/n_θ) × faceted area', () => {
    const e = pipeExact(), d = pipeCase(PIPE_LEVELS.coarse);
    const largest = getSurfaceGroups(d).groups.reduce((b, g, i, all) => (g.area > all[b]!.area ? i : b), 0);
    const { r, area } = viscous(d, (_g, i) => i === largest, e.mu, 'second-order');
    // each flat face of the n_θ-gon wall meets the radial direction at its corner nodes at π/n_θ
    const facet = Math.cos(Math.PI / PIPE_LEVELS.coarse.nTheta);
    expect(r.viscousForce![2] / (e.wallShearStress * facet * area)).toBeCloseTo(1, 9);
    const first = viscous(d, (_g, i) => i === largest, e.mu, 'first-order');
    expect(Math.abs(first.r.viscousForce![2] / (e.wallShearStress * area) - 1)).toBeGreaterThan(1e-3);
  });
});

describe('traction read straight from the wall nodes equals the per-corner route', () => {
  it('Hagen–Poiseuille pipe wall: nodeTraction = cornerTraction(cornersFromNodes) bit for bit, constant μ and per corner', () => {
    const d = pipeCase(PIPE_LEVELS.coarse);
    const faces = getBoundaryFaces(d), groups = getSurfaceGroups(d);
    const sel = facesOfGroups(groups, groups.groups.map((_, i) => i));
    const offsets = new Int32Array(sel.length + 1);
    sel.forEach((f, k) => { offsets[k + 1] = offsets[k]! + faces.offsets[f + 1]! - faces.offsets[f]!; });
    const vel = d.pieces.map((p) => p.pointData.find((f) => f.components === 3));
    const { nodes, byPiece } = wallNodeGradients(d, faces, sel, offsets, vel);
    const G = cornersFromNodes(nodes, offsets, byPiece);
    const muAt = (s: number, j: number) => 1e-3 * (1 + ((s + j) % 3));
    for (const [a, b] of [[nodeTraction(faces, sel, offsets, nodes, byPiece, 2e-3), cornerTraction(faces, sel, offsets, G, () => 2e-3)],
      [nodeTraction(faces, sel, offsets, nodes, byPiece, muAt), cornerTraction(faces, sel, offsets, G, muAt)]] as const) {
      expect(a.length).toBe(3 * offsets[sel.length]!);
      expect(a.some((v) => v !== 0)).toBe(true);
      expect(a.every((v, i) => Object.is(v, b[i]))).toBe(true);
    }
  });
});
