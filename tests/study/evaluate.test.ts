/**
 * Evaluating a probe set: each kind gives the numbers of the library path it wraps (same code as the
 * command line), with SI units; exact solutions are met where the mesh allows; failures are flagged with a
 * message and never reported as zeros; declared units are converted to SI.
 */
import { describe, expect, it } from 'vitest';
import { pressureLoss } from '../../src/cut/composite.ts';
import { integratePlane } from '../../src/cut/planeIntegrals.ts';
import type { Dataset } from '../../src/model/dataset.ts';
import { pipeCase, pipeExact } from '../../src/samples/pipe.ts';
import { sphereCase, sphereExact } from '../../src/samples/sphere.ts';
import { evaluateProbeSet, type ProbeOutcome } from '../../src/study/evaluate.ts';
import type { Probe, ProbeSet } from '../../src/study/probeSet.ts';

const set = (probes: Probe[], extra: Partial<ProbeSet> = {}): ProbeSet => ({ format: 'fieldtally-probe-set', version: 2, ...extra, probes });
const q = (o: ProbeOutcome, key: string): number => {
  const x = o.quantities.find((y) => y.key === key);
  if (!x) throw new Error(`${o.id}: no quantity ${key} (has ${o.quantities.map((y) => y.key).join(', ')})`);
  return x.value;
};
const unit = (o: ProbeOutcome, key: string) => o.quantities.find((y) => y.key === key)!.unit;

const pipe = pipeCase();
const e = pipeExact();

describe('evaluateProbeSet on the laminar pipe', () => {
  it('a cut-plane gives integratePlane\'s numbers with SI units; Q ≈ πR²V', () => {
    const ev = evaluateProbeSet(pipe, set([{ id: 'mid', kind: 'cut-plane', geometry: { origin: [0, 0, 0.05], normal: [0, 0, 1] }, fields: { density: e.rho } }]));
    const o = ev.probes[0]!;
    expect(o.ok).toBe(true);
    const lib = integratePlane(pipe, { origin: [0, 0, 0.05], normal: [0, 0, 1], integral: { density: e.rho } }).integrals;
    expect(q(o, 'volumeFlowRate')).toBe(lib.volumeFlowRate);
    expect(q(o, 'massFlowRate')).toBe(lib.massFlowRate);
    expect(q(o, 'area')).toBe(lib.area);
    expect(q(o, 'totalPressure.massFlowMean')).toBe(lib.totalPressure!.massFlowMean);
    expect([unit(o, 'area'), unit(o, 'volumeFlowRate'), unit(o, 'massFlowRate'), unit(o, 'staticPressure.areaMean'), unit(o, 'uniformityIndex')])
      .toEqual(['m²', 'm³/s', 'kg/s', 'Pa', '1']);
    // Reference: docs/references.md §1, Hagen–Poiseuille (C): Q = πR²V; the faceted medium mesh fills the circle to 1.14 %
    expect(Math.abs(q(o, 'volumeFlowRate') / e.Q - 1)).toBeLessThan(0.02);
    expect(o.anchor![2]).toBeCloseTo(0.05, 12);
    expect(o.definition).toMatch(/^cut-plane through \(0, 0, 0\.05\) normal \(0, 0, 1\); velocity velocity \(point\), pressure p \(point\), density 998\.207 kg\/m³$/);
  });

  it('density: a density field, else the set\'s reference density (or its preset), else none with a note', () => {
    const plane: Probe = { id: 'a', kind: 'cut-plane', geometry: { origin: [0, 0, 0.05], normal: [0, 0, 1] } };
    const water = evaluateProbeSet(pipe, set([plane], { reference: { preset: 'water-20c' } })).probes[0]!;
    // Reference: docs/references.md §10, water at 20 °C: ρ = 998.207 kg/m³ (IAPWS-95)
    expect(q(water, 'massFlowRate') / q(water, 'volumeFlowRate')).toBeCloseTo(998.207, 9);
    const air = evaluateProbeSet(pipe, set([plane], { reference: { preset: 'air-isa-sea-level' } })).probes[0]!;
    // Reference: docs/references.md §10, ISA sea level: ρ = 1.2250 kg/m³
    expect(q(air, 'massFlowRate') / q(air, 'volumeFlowRate')).toBeCloseTo(1.225, 12);
    const none = evaluateProbeSet(pipe, set([plane])).probes[0]!;
    expect(none.ok).toBe(true);
    expect(none.quantities.some((x) => x.key === 'massFlowRate')).toBe(false);
    expect(none.notes.join(' ')).toMatch(/no density/);
  });

  it('a pressure loss between two planes: Δp₀ = G·Δz and K as pressureLoss computes it', () => {
    const up = { origin: [0, 0, 0.02] as [number, number, number], normal: [0, 0, 1] as [number, number, number] };
    const down = { origin: [0, 0, 0.08] as [number, number, number], normal: [0, 0, 1] as [number, number, number] };
    const o = evaluateProbeSet(pipe, set([{ id: 'l', kind: 'pressure-loss', geometry: { upstream: up, downstream: down }, fields: { density: e.rho } }])).probes[0]!;
    expect(o.ok).toBe(true);
    // Reference: Hagen–Poiseuille, docs/references.md §1 (C): p = G(L − z) is linear, the velocity profile the same on both planes,
    // so the mass-flow-weighted total-pressure loss is exactly G·Δz.
    expect(q(o, 'totalPressureLoss')).toBeCloseTo(e.G * 0.06, 12);
    const lib = pressureLoss(integratePlane(pipe, { ...up, integral: { density: e.rho } }).integrals, integratePlane(pipe, { ...down, integral: { density: e.rho } }).integrals);
    expect(q(o, 'lossCoefficient')).toBe(lib.lossCoefficient);
    expect(unit(o, 'lossCoefficient')).toBe('1');
  });

  it('a mass balance over two planes closes to rounding', () => {
    const o = evaluateProbeSet(pipe, set([{
      id: 'b', kind: 'mass-balance', fields: { density: e.rho },
      geometry: { planes: [{ origin: [0, 0, 0.02], normal: [0, 0, -1] }, { origin: [0, 0, 0.08], normal: [0, 0, 1] }] },
    }])).probes[0]!;
    expect(o.ok).toBe(true);
    // Reference: conservation of mass (identity): what enters the control volume leaves it
    expect(Math.abs(q(o, 'imbalanceShare'))).toBeLessThan(1e-12);
    expect(q(o, 'inflow')).toBeCloseTo(q(o, 'outflow'), 15);
    expect(unit(o, 'net')).toBe('kg/s');
  });

  it('line and point probes: values at nodes are exact, units by field name', () => {
    const ev = evaluateProbeSet(pipe, set([
      { id: 'c', kind: 'point', geometry: { at: [0, 0, 0.03] } },
      { id: 'd', kind: 'line', geometry: { from: [0, 0, 0.01], to: [0, 0, 0.09] }, options: { samples: 9 } },
    ]));
    const [c, d] = ev.probes as [ProbeOutcome, ProbeOutcome];
    // Reference: Hagen–Poiseuille, docs/references.md §1 (C): centre-line velocity 2V, p = G(L − z); the axis nodes hold them exactly
    expect(q(c, 'velocity_z')).toBeCloseTo(e.uMax, 14);
    expect(q(c, 'p')).toBeCloseTo(e.G * (e.L - 0.03), 14);
    expect(unit(c, 'p')).toBe('Pa');
    expect(unit(c, 'velocity_z')).toBe('m/s');
    expect(q(d, 'p.mean')).toBeCloseTo(e.G * (e.L - 0.05), 13);
    expect(q(d, 'coveredLength')).toBeCloseTo(0.08, 14);
  });

  it('failures are flagged with a message, never zeros, and do not stop the other probes', () => {
    const ev = evaluateProbeSet(pipe, set([
      { id: 'miss', kind: 'cut-plane', geometry: { origin: [0, 0, 0.5], normal: [0, 0, 1] } },
      { id: 'out', kind: 'point', geometry: { at: [1, 1, 1] } },
      { id: 'far', kind: 'line', geometry: { from: [1, 1, 1], to: [2, 2, 2] } },
      { id: 'nofield', kind: 'point', geometry: { at: [0, 0, 0.05] }, fields: { sample: ['temperature'] } },
      { id: 'nosurface', kind: 'force', geometry: { surfaces: ['hull'] } },
      { id: 'nobox', kind: 'force', geometry: { surfaces: [{ within: [1, 2, 1, 2, 1, 2] }] } },
      { id: 'ok', kind: 'point', geometry: { at: [0, 0, 0.05] } },
    ]));
    expect(ev.failed).toBe(6);
    const byId = Object.fromEntries(ev.probes.map((p) => [p.id, p]));
    expect(byId['miss']!.error).toBe('cut-plane: the plane misses every 3D cell of the mesh');
    expect(byId['out']!.error).toBe('the point lies outside the mesh: no values');
    expect(byId['far']!.error).toBe('the line lies wholly outside the mesh: no samples');
    expect(byId['nofield']!.error).toMatch(/no field "temperature"/);
    expect(byId['nosurface']!.error).toMatch(/^no surface group "hull" \(known: 0 "part 0", 1 "part 1", 2 "part 2"\)$/);
    // a selector is described in words, in the error and in the definition
    expect(byId['nobox']!.error).toMatch(/^no surface group within x 1 … 2, y 1 … 2, z 1 … 2 \(known: /);
    expect(byId['nobox']!.definition).toBe('force on the surfaces (within x 1 … 2, y 1 … 2, z 1 … 2)');
    for (const id of ['miss', 'out', 'far', 'nofield', 'nosurface', 'nobox']) expect(byId[id]!.quantities).toEqual([]);
    expect(byId['ok']!.ok).toBe(true);
  });

  it('a velocity that cannot be found by name fails the flow probes and asks for fields.velocity', () => {
    const renamed: Dataset = { ...pipe, pieces: pipe.pieces.map((p) => ({ ...p, pointData: p.pointData.map((f) => (f.name === 'velocity' ? { ...f, name: 'Uvec' } : f)) })) };
    const o = evaluateProbeSet(renamed, set([{ id: 'm', kind: 'cut-plane', geometry: { origin: [0, 0, 0.05], normal: [0, 0, 1] } }])).probes[0]!;
    expect(o.ok).toBe(false);
    expect(o.error).toMatch(/no field named like a velocity: set fields\.velocity to one of the 3-component fields \(Uvec \(point\)\) or to null/);
    const fixed = evaluateProbeSet(renamed, set([{ id: 'm', kind: 'cut-plane', geometry: { origin: [0, 0, 0.05], normal: [0, 0, 1] }, fields: { velocity: 'Uvec' } }])).probes[0]!;
    expect(fixed.ok).toBe(true);
  });
});

describe('units: declared units are converted to SI before computing', () => {
  it('a file in mm with p in kPa and velocity in mm/s gives the SI file\'s numbers', () => {
    // the same pipe written in other units: x_mm = 1000 x, p_kPa = p/1000, u_mm/s = 1000 u
    const scaled: Dataset = {
      ...pipe, pieces: pipe.pieces.map((p) => ({
        ...p, points: p.points.map((x) => x * 1000),
        pointData: p.pointData.map((f) => ({ ...f, values: Float64Array.from(f.values, (v) => v * (f.name === 'p' ? 1e-3 : 1e3)) })),
      })),
    };
    const probes = (k: number): Probe[] => [
      { id: 'mid', kind: 'cut-plane', geometry: { origin: [0, 0, 0.05 * k], normal: [0, 0, 1] }, fields: { density: e.rho } },
      { id: 'c', kind: 'point', geometry: { at: [0, 0, 0.03 * k] } },
    ];
    const si = evaluateProbeSet(pipe, set(probes(1)));
    const mm = evaluateProbeSet(scaled, set(probes(1000), { units: { length: 'mm', fields: { p: 'kPa', velocity: 'mm/s' } } }));
    // Reference: dimensional consistency — 1 mm = 1e-3 m, 1 kPa = 1e3 Pa (SI prefixes), so the SI numbers must agree
    for (const key of ['area', 'volumeFlowRate', 'massFlowRate', 'totalPressure.massFlowMean', 'staticPressure.areaMean']) {
      expect(q(mm.probes[0]!, key)).toBeCloseTo(q(si.probes[0]!, key), 12 - Math.ceil(Math.log10(Math.abs(q(si.probes[0]!, key)))));
    }
    expect(q(mm.probes[1]!, 'p')).toBeCloseTo(q(si.probes[1]!, 'p'), 12);
    expect(unit(mm.probes[1]!, 'p')).toBe('Pa');
    // anchors stay in the file's length unit
    expect(mm.probes[0]!.anchor![2]).toBeCloseTo(50, 9);
    expect(mm.lengthUnit).toBe('mm');
  });

  it('a field with no declared unit and no known name is marked undeclared', () => {
    const withT: Dataset = { ...pipe, pieces: pipe.pieces.map((p) => ({ ...p, pointData: [...p.pointData, { name: 'phi', association: 'point', components: 1, values: new Float64Array(p.points.length / 3).fill(2), sourceType: 'Float64' }] })) };
    const o = evaluateProbeSet(withT, set([{ id: 'c', kind: 'point', geometry: { at: [0, 0, 0.05] } }])).probes[0]!;
    expect(unit(o, 'phi')).toBe('undeclared');
    const d = evaluateProbeSet(withT, set([{ id: 'c', kind: 'point', geometry: { at: [0, 0, 0.05] } }], { units: { fields: { phi: 'K' } } })).probes[0]!;
    expect(unit(d, 'phi')).toBe('K');
  });
});

describe('force total on the Stokes sphere', () => {
  it('C_D ≈ 24/Re with the pressure/viscous split 1/3 : 2/3', () => {
    const x = sphereExact({ flow: 'stokes', refinement: 1 });
    const d = sphereCase({ flow: 'stokes', refinement: 1 });
    const o = evaluateProbeSet(d, set([{ id: 'bead', kind: 'force', geometry: { surfaces: ['group 1'] } }],
      { reference: { density: x.rho, speed: x.U, area: x.frontalArea } })).probes[0]!;
    expect(o.ok).toBe(true);
    // Reference: docs/references.md §3, Stokes drag (C): C_D = 24/Re; pressure 1/3, viscous 2/3
    expect(Math.abs(q(o, 'CD') / (24 / x.Re) - 1)).toBeLessThan(0.03);
    expect(q(o, 'CD.pressure') / q(o, 'CD')).toBeCloseTo(1 / 3, 1);
    expect(unit(o, 'force.drag')).toBe('N');
    expect(unit(o, 'CD')).toBe('1');
    expect(o.definition).toMatch(/^force on 1 "group 1"; drag \(1, 0, 0\), lift \(0, 0, 1\)/);
  });

  it('without reference speed and area: forces only, with a note asking for them', () => {
    const d = sphereCase({ flow: 'stokes', refinement: 0 });
    const o = evaluateProbeSet(d, set([{ id: 'bead', kind: 'force', geometry: { surfaces: [1] } }])).probes[0]!;
    expect(o.ok).toBe(true);
    expect(o.quantities.some((x) => x.key === 'CD')).toBe(false);
    expect(o.quantities.some((x) => x.key === 'force.drag')).toBe(true);
    expect(o.notes.join(' ')).toMatch(/coefficients need the reference density, speed and area/);
  });
  it('a force on part of a closed boundary says the surface is not closed; the whole boundary and the sphere wall do not', () => {
    // Reference: topology; the sphere wall and the whole boundary of a domain are closed surfaces, one group of the pipe's boundary is not.
    const d = sphereCase({ flow: 'stokes', refinement: 0 });
    const bead = evaluateProbeSet(d, set([{ id: 'bead', kind: 'force', geometry: { surfaces: [1] } }])).probes[0]!;
    expect(bead.notes.some((n) => /surface not closed/.test(n))).toBe(false);
    const parts = evaluateProbeSet(pipe, set([
      { id: 'one', kind: 'force', geometry: { surfaces: [0] } },
      { id: 'all', kind: 'force', geometry: { surfaces: [0, 1, 2] } },
    ])).probes;
    const one = parts[0]!.notes.find((n) => /surface not closed/.test(n));
    expect(one).toMatch(/^surface not closed \(\d+ open edges\): the total covers the chosen faces only$/);
    expect(parts[1]!.notes.some((n) => /surface not closed/.test(n))).toBe(false);
  });
});
