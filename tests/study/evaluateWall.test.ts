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
