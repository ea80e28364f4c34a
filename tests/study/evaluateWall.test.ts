/**
 * The wall-quantities probe kind in a probe set, on sample-fields/pipe-medium.vtu (laminar water pipe,
 * Hagen–Poiseuille: τ_w = 4μV/R and c_f = 16/Re_D, REFERENCES §1; Hagen 1839, Poiseuille 1840; on the
 * 24-sided faceted wall the exact nodal gradient gives τ_w·cos(π/24) per face). The set's reference values
 * give ρ, μ (water preset) and U; the outcome states where τ_w came from and how y was taken.
 */
import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { expect, it } from 'vitest';
import { readDataset } from '../../src/io/readDataset.ts';
import { pipeExact } from '../../src/samples/pipe.ts';
import { evaluateProbeSet } from '../../src/study/evaluate.ts';
import { checkProbeSet } from '../../src/study/probeSetCheck.ts';
import { resultsJson } from '../../src/study/resultTables.ts';

const PIPE = resolve(__dirname, '../../sample-fields/pipe-medium.vtu');

it('wall probe: τ_w, c_f = 16/Re_D and y+ statistics with units, source and y definition; bad options refused by the checker', async () => {
  const e = pipeExact(), d = await readDataset('pipe-medium.vtu', new Uint8Array(readFileSync(PIPE)));
  const set = checkProbeSet({
    format: 'fieldtally-probe-set', version: 2, reference: { density: e.rho, viscosity: e.mu, speed: e.V },
    probes: [{ id: 'wall', kind: 'wall', geometry: { surfaces: [1] }, options: { thresholds: [1, 3], wallDistance: 'first-node' } }],
  }, 'test');
  const ev = evaluateProbeSet(d, set);
  const p = ev.probes[0]!;
  expect(p.ok, p.error ?? '').toBe(true);
  const q = (k: string) => p.quantities.find((x) => x.key === k)!;
  const facet = Math.cos(Math.PI / 24);
  expect(q('wallShear.mean').value / (e.wallShearStress * facet)).toBeCloseTo(1, 9);
  expect(q('wallShear.mean').unit).toBe('Pa');
  expect(q('cf.mean').value / ((16 / e.Re) * facet)).toBeCloseTo(1, 9);
  expect(q('yPlusAbove.1').value).toBe(1);
  expect(q('yPlus.mean').unit).toBe('1');
  expect(p.definition).toMatch(/τ_w from the second-order velocity gradient of "velocity"/);
  expect(p.definition).toMatch(/nearest node of the wall cell off the wall face/);
  expect(JSON.stringify(resultsJson([{ file: 'pipe-medium.vtu', evaluation: ev }], { tool: 'fieldtally', version: '0', createdAt: 'now', caution: 'c' }))).toMatch(/yPlus\.mean/);
  expect(() => checkProbeSet({ format: 'fieldtally-probe-set', version: 2, probes: [{ id: 'w', kind: 'wall', geometry: { surfaces: [1] }, options: { wallDistance: 'middle' } }] }, 'bad.json'))
    .toThrow(/wallDistance/);
});

it('wall probe chosen by what it is: the pipe wall by its area, or the group nearest a point on it, gives τ_w = 4μV/R; a selector matching nothing names the known groups', async () => {
  const e = pipeExact(), d = await readDataset('pipe-medium.vtu', new Uint8Array(readFileSync(PIPE)));
  // Hagen–Poiseuille (REFERENCES §1): τ_w = 4μV/R, reduced by cos(π/24) on the 24-faceted wall
  const tauW = 4 * e.mu * e.V / e.R, facet = Math.cos(Math.PI / 24);
  // the wall's area is 2πR·L·(faceted) ≈ 6.3e-3 m², each end ≈ 3.1e-4 m²; a box around the pipe holds every group
  const byArea = { areaFrom: 1e-3 }, byPoint = { nearest: [e.R, 0, e.L / 2] as [number, number, number] };
  const box = { within: [-2 * e.R, 2 * e.R, -2 * e.R, 2 * e.R, -0.01, e.L + 0.01] as [number, number, number, number, number, number], areaFrom: 1e-3 };
  const set = checkProbeSet({
    format: 'fieldtally-probe-set', version: 2, reference: { density: e.rho, viscosity: e.mu, speed: e.V },
    probes: [
      { id: 'by-id', kind: 'wall', geometry: { surfaces: [1] } },
      { id: 'by-area', kind: 'wall', geometry: { surfaces: [byArea] } },
      { id: 'by-point', kind: 'wall', geometry: { surfaces: [byPoint] } },
      { id: 'by-box', kind: 'wall', geometry: { surfaces: [box] } },
      { id: 'none', kind: 'wall', geometry: { surfaces: [{ name: 'outlet' }] } },
    ],
  }, 'test');
  const ev = evaluateProbeSet(d, set);
  const mean = (id: string) => {
    const p = ev.probes.find((x) => x.id === id)!;
    expect(p.ok, p.error ?? '').toBe(true);
    return p.quantities.find((x) => x.key === 'wallShear.mean')!.value;
  };
  for (const id of ['by-area', 'by-point', 'by-box']) {
    expect(mean(id) / (tauW * facet)).toBeCloseTo(1, 9);
    expect(mean(id)).toBe(mean('by-id'));
  }
  // the outcome names the selector it used
  expect(ev.probes.find((x) => x.id === 'by-area')!.definition).toMatch(/^wall quantities on 1 "part 1" \(chosen area 0\.001 … ∞\); τ_w from/);
  const none = ev.probes.find((x) => x.id === 'none')!;
  expect(none.ok).toBe(false);
  expect(none.error).toMatch(/^no surface group named "outlet" \(known: 0 "part 0" \(area [\d.e-]+\), 1 "part 1" \(area [\d.e-]+\), 2 "part 2" \(area [\d.e-]+\)\)/);
});
