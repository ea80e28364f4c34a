/**
 * Composite results: pressure loss and loss coefficient between two planes, mass balance over planes and
 * boundary surfaces.
 * References: docs/references.md §1, Hagen–Poiseuille (C) — fully developed, so the profile is the same
 * on every section and Δp₀ between two sections equals the static drop G·ΔL exactly, K = G·ΔL/(½ρV²);
 * divergence theorem — the net flux of a divergence-free field through a closed surface is zero.
 */
import { describe, expect, it } from 'vitest';
import { massBalance, pressureLoss } from '../../src/cut/composite.ts';
import { boundaryTriangleSet } from '../../src/cut/faceSet.ts';
import { integrateSurface } from '../../src/cut/integrals.ts';
import { integratePlane } from '../../src/cut/planeIntegrals.ts';
import type { RegionSpec } from '../../src/cut/region.ts';
import { datasetOf, hexGrid, pointFieldFrom, tetGrid, withFields } from '../../src/model/meshBuild.ts';
import { pipeCase, pipeExact } from '../../src/samples/pipe.ts';
import { boundaryFaces } from '../../src/surface/boundaryFaces.ts';
import { facesOfGroups, surfaceGroups } from '../../src/surface/surfaceGroups.ts';

describe('pressure loss between two planes (Poiseuille pipe)', () => {
  const e = pipeExact();
  const d = pipeCase();
  const up = integratePlane(d, { origin: [0, 0, 0.02], normal: [0, 0, 1], integral: { density: e.rho } }).integrals;
  const down = integratePlane(d, { origin: [0, 0, 0.08], normal: [0, 0, 1], integral: { density: e.rho } }).integrals;

  it('Δp₀ = static drop = G·ΔL exactly; K = G·ΔL/(½ρV²) with V = Q/A of the reference plane', () => {
    const l = pressureLoss(up, down);
    expect(Math.abs(l.totalPressureLoss! / (e.G * 0.06) - 1)).toBeLessThan(1e-10);
    expect(Math.abs(l.staticPressureDrop!.massFlowWeighted! / (e.G * 0.06) - 1)).toBeLessThan(1e-10);
    expect(Math.abs(l.staticPressureDrop!.areaWeighted / (e.G * 0.06) - 1)).toBeLessThan(1e-10);
    const V = up.volumeFlowRate! / up.area!;
    expect(l.meanVelocity).toBeCloseTo(V, 15);
    expect(l.density).toBe(e.rho);
    expect(Math.abs(l.lossCoefficient! / (e.G * 0.06 / (0.5 * e.rho * V * V)) - 1)).toBeLessThan(1e-10);
    // Against the exact mean velocity the mesh's V is off at O(h²): K within 3 % here (f·ΔL/D = 64/Re·ΔL/D).
    expect(Math.abs(l.lossCoefficient! / (e.fDarcy * 0.06 / (2 * e.R)) - 1)).toBeLessThan(0.03);
    expect(l.notes).toHaveLength(0);
  });

  it('the normal of either plane may point either way; an empty plane gives nulls with a note', () => {
    const flipped = integratePlane(d, { origin: [0, 0, 0.08], normal: [0, 0, -1], integral: { density: e.rho } }).integrals;
    expect(pressureLoss(up, flipped).totalPressureLoss).toBeCloseTo(pressureLoss(up, down).totalPressureLoss!, 12);
    const miss = integratePlane(d, { origin: [0, 0, 0.5], normal: [0, 0, 1], integral: { density: e.rho } }).integrals;
    const l = pressureLoss(up, miss);
    expect(l.totalPressureLoss).toBeNull();
    expect(l.lossCoefficient).toBeNull();
    expect(l.notes[0]).toMatch(/downstream plane is empty/);
  });
});

describe('sudden expansion with uniform profiles (Borda–Carnot)', () => {
  // Reference: docs/references.md §5, Borda–Carnot (C): with σ = A₁/A₂, p₂ − p₁ = ρV₁²σ(1−σ) (momentum)
  // and K = Δp₀/(½ρV₁²) = (1−σ)², the form of Idelchik Diag. 4-1 as quoted there (V); on the downstream
  // velocity V₂ = σV₁ the same loss gives K₂ = (1/σ − 1)².
  // The field is built from the uniform-profile model (narrow square duct 1×1, wide 2×2, σ = 1/4), so this
  // checks the mass-flow weighting, the total pressure and the reference-plane choice, not a flow solution.
  const rho = 998.2, V1 = 0.8, sigma = 0.25, p1 = 1500;
  const V2 = sigma * V1, p2 = p1 + rho * V1 * V1 * sigma * (1 - sigma);
  const block = (half: number, z0: number, n: number, V: number, p: number) => {
    const g = hexGrid(n, n, 3, (u, v, w) => [half * (2 * u - 1), half * (2 * v - 1), z0 + w]);
    return withFields(g, [
      pointFieldFrom(g, 'velocity', 3, (_x, _y, _z, o) => { o[0] = 0; o[1] = 0; o[2] = V; }),
      pointFieldFrom(g, 'p', 1, (_x, _y, _z, o) => { o[0] = p; }),
    ]);
  };
  const d = datasetOf([block(0.5, 0, 3, V1, p1), block(1, 1, 5, V2, p2)], 'stepped duct');
  const up = integratePlane(d, { origin: [0, 0, 0.43], normal: [0, 0, 1], integral: { density: rho } }).integrals;
  const down = integratePlane(d, { origin: [0, 0, 1.61], normal: [0, 0, 1], integral: { density: rho } }).integrals;

  it('areas and flow rates of the two sections (σ = 1/4, Q the same)', () => {
    expect(up.area).toBeCloseTo(1, 12);
    expect(down.area).toBeCloseTo(4, 12);
    expect(down.volumeFlowRate!).toBeCloseTo(up.volumeFlowRate!, 12);
  });

  it('K on the upstream velocity = (1 − σ)² = 0.5625; static pressure rises by ρV₁²σ(1−σ)', () => {
    const l = pressureLoss(up, down);
    expect(Math.abs(l.lossCoefficient! / (1 - sigma) ** 2 - 1)).toBeLessThan(1e-12);
    expect(Math.abs(l.totalPressureLoss! / (0.5 * rho * V1 * V1 * (1 - sigma) ** 2) - 1)).toBeLessThan(1e-12);
    expect(l.staticPressureDrop!.massFlowWeighted!).toBeCloseTo(-rho * V1 * V1 * sigma * (1 - sigma), 9);
    expect(l.staticPressureDrop!.areaWeighted).toBeCloseTo(-rho * V1 * V1 * sigma * (1 - sigma), 9);
    expect(l.meanVelocity).toBeCloseTo(V1, 12);
  });

  it('K on the downstream velocity = (1/σ − 1)² = 9', () => {
    const l = pressureLoss(up, down, { reference: 'downstream' });
    expect(l.meanVelocity).toBeCloseTo(V2, 12);
    expect(Math.abs(l.lossCoefficient! / (1 / sigma - 1) ** 2 - 1)).toBeLessThan(1e-12);
  });
});

describe('mass balance', () => {
  it('six rectangle-limited planes closing a box inside the mesh: net flux of a divergence-free field is 0', () => {
    let p = tetGrid(4, 4, 4, (u, v, w) => [u, v + 0.1 * u * u, w]);
    p = withFields(p, [pointFieldFrom(p, 'velocity', 3, (x, y, z, o) => { o[0] = 1 + y - z; o[1] = 0.5 + z - 2 * x; o[2] = -0.3 + x + y; })]);
    const d = datasetOf([p]);
    const items = [];
    for (const axis of [0, 1, 2]) for (const side of [-1, 1]) {
      const n: [number, number, number] = [0, 0, 0]; n[axis] = side;
      const o: [number, number, number] = [0.5, 0.55, 0.5]; o[axis] += 0.25 * side;
      const a: [number, number, number] = [0, 0, 0]; a[(axis + 1) % 3] = 1;
      const region: RegionSpec[] = [{ kind: 'rectangle', centre: o, axis: a, half: [0.25, 0.25] }];
      items.push({ label: `${side > 0 ? '+' : '−'}${'xyz'[axis]}`, integrals: integratePlane(d, { origin: o, normal: n, region, integral: { density: 1.2 } }).integrals });
    }
    const b = massBalance(items);
    expect(b.basis).toBe('mass');
    expect(b.inflow).toBeGreaterThan(0.1);
    expect(Math.abs(b.net!)).toBeLessThan(1e-14);
    expect(Math.abs(b.imbalanceShare!)).toBeLessThan(1e-13);
    expect(b.outflow! - b.inflow!).toBeCloseTo(b.net!, 14);
  });

  it('pipe: inlet boundary surface + wall surface + outlet plane balance to rounding', () => {
    const e = pipeExact();
    const d = pipeCase();
    const faces = boundaryFaces(d), groups = surfaceGroups(d, faces);
    // Feature-angle groups of the pipe: inlet disk (centroid z = 0), wall (z = L/2), outlet disk (z = L).
    const byZ = (z: number) => groups.groups.findIndex((g) => Math.abs(g.centroid[2] - z) < 1e-9 && Math.hypot(g.centroid[0], g.centroid[1]) < 1e-9);
    const surface = (gi: number) => integrateSurface(boundaryTriangleSet(d, faces, facesOfGroups(groups, [gi])), { density: e.rho });
    expect(groups.groups).toHaveLength(3);
    // The wall carries no flux (no-slip: zero velocity at every wall node), so the whole wall may close z ∈ [0, 0.06].
    const items = [
      { label: 'inlet surface', integrals: surface(byZ(0)) },
      { label: 'wall surface', integrals: surface(byZ(0.05)) },
      { label: 'outlet plane', integrals: integratePlane(d, { origin: [0, 0, 0.06], normal: [0, 0, 1], integral: { density: e.rho } }).integrals },
    ];
    const b = massBalance(items);
    expect(b.items[0]!.inflow).toBeCloseTo(items[2]!.integrals.massFlowRate!, 12);
    expect(Math.abs(b.items[1]!.flux!)).toBeLessThan(1e-30); // no-slip wall: zero velocity (to rounding) at every wall node
    expect(Math.abs(b.imbalanceShare!)).toBeLessThan(1e-12);
    expect(Math.abs(b.inflow! / e.massFlow - 1)).toBeLessThan(0.02);
  });

  it('an empty plane makes the balance undefined (nulls), and without density it is a volume balance', () => {
    const d = pipeCase();
    const a = integratePlane(d, { origin: [0, 0, 0.02], normal: [0, 0, -1] }).integrals;
    const miss = integratePlane(d, { origin: [0, 0, 1], normal: [0, 0, 1] }).integrals;
    const b = massBalance([{ label: 'in', integrals: a }, { label: 'miss', integrals: miss }]);
    expect(b.basis).toBe('volume');
    expect(b.net).toBeNull();
    expect(b.notes.join(' ')).toMatch(/miss: empty/);
  });
});
