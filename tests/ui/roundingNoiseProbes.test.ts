/**
 * Rounding noise of lines, points and cut-planes (src/ui/roundingNoise.ts): a mean or integral at most 10⁻⁹
 * of its stated scale is marked "≈ 0 relative to …" on pins and in the table, and keeps its value in the
 * exports. The real case: the app's first line probe on the bundled Stokes sphere runs along x through the
 * bead's centre, where p = −(3/2)μa(U·x)/r³ is odd in x (Stokes' solution; Batchelor 1967, An Introduction
 * to Fluid Dynamics, §4.9): its samples cancel to rounding, while p on the wall runs ±3μU/(2a) = ±4.5 Pa.
 */
import { resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { loadDatasetFile } from '../../src/io/nodeFiles.ts';
import { datasetBounds } from '../../src/model/bounds.ts';
import { loadReport } from '../../src/model/loadReport.ts';
import { probeLine } from '../../src/locate/lineProbe.ts';
import { lineStats } from '../../src/locate/lineStats.ts';
import { evaluateProbeSet } from '../../src/study/evaluate.ts';
import { checkProbeSet } from '../../src/study/probeSetCheck.ts';
import { outcomeResult } from '../../src/app/outcomeResult.ts';
import { assignNoiseScales, meshMagnitudes, quantityText, sampleScale } from '../../src/ui/roundingNoise.ts';
import { resultsAsCsv, resultsAsJson, type Quantity } from '../../src/ui/results.ts';

const q = (key: string, label: string, value: number, unit = ''): Quantity => ({ key, label, value, unit, pinned: false });
const SPHERE = resolve(__dirname, '../../sample-fields/sphere-stokes.vtu');

describe('scales of means over samples, points and cut-planes', () => {
  it('a mean against the larger magnitude of its extremes; extremes and lengths get no scale', () => {
    const r = assignNoiseScales('line', [q('L', 'L', 2, 'm'), q('p.mean', 'p mean', 1.431e-16, 'Pa'), q('p.min', 'p min', -4.2, 'Pa'), q('p.max', 'p max', 3.9, 'Pa'),
      q('u.mean', 'u mean', 0.25, 'm/s'), q('u.min', 'u min', 0, 'm/s'), q('u.max', 'u max', 1, 'm/s')]);
    expect(r.map((x) => quantityText(x))).toEqual(['2.000 m', '1.431×10⁻¹⁶ Pa (≈ 0 relative to max |p| on the line)', '-4.200 Pa', '3.900 Pa', '0.2500 m/s', '0 m/s', '1.000 m/s']);
    expect(r[1]!.scale).toEqual({ value: 4.2, label: 'max |p| on the line' });
    // 10⁻⁹ × 4.2 is the edge: just above it is a number
    expect(quantityText({ ...r[1]!, value: 4.2e-9 * 1.01 })).toBe('4.242×10⁻⁹ Pa');
    expect(sampleScale(0, 0, 'p', 'on the line')).toBeUndefined();
    // a magnitude keeps its own bars
    expect(sampleScale(0, 2, '|velocity|', 'on the line')).toEqual({ value: 2, label: 'max |velocity| on the line' });
    // a wall group's mean has only a maximum beside it (c_f)
    const w = assignNoiseScales('wall', [q('cf.mean', 'c_f mean', 3e-19), q('cf.max', 'c_f max', 0.01)]);
    expect(quantityText(w[0]!)).toBe('3.000×10⁻¹⁹ (≈ 0 relative to max |c_f| on the group)');
  });
  it('a point value against its field over the mesh (components by the vector magnitude), in the probe set units', () => {
    const report = {
      pointData: [{ name: 'p', association: 'point' as const, components: 1, type: 'Float64', range: [-4.5, 4.5] as [number, number], pieces: 1 },
        { name: 'velocity', association: 'point' as const, components: 3, type: 'Float64', range: [0, 0.0015] as [number, number], pieces: 1 }],
      cellData: [],
    };
    const r = assignNoiseScales('point', [q('p', 'p', 2e-15, 'Pa'), q('velocity_y', 'velocity_y', -1e-21, 'm/s'), q('velocity_x', 'velocity_x', 1e-3, 'm/s'),
      q('|velocity|', '|velocity|', 1e-3, 'm/s')], { fields: meshMagnitudes(report) });
    expect(r.map((x) => quantityText(x))).toEqual(['2.000×10⁻¹⁵ Pa (≈ 0 relative to max |p| in the mesh)', '-1.000×10⁻²¹ m/s (≈ 0 relative to max |velocity| in the mesh)',
      '0.001000 m/s', '0.001000 m/s']);
    expect(r[1]!.scale!.value).toBe(0.0015);
    // a field declared in kPa is reported in Pa by the probe set: its scale is converted too
    expect(meshMagnitudes(report, { p: 1000 }).of('p')).toBe(4500);
  });
  it('a cut-plane: Q against max |u|·A, ṁ against ρ·max |u|·A, pressure means against max |p|', () => {
    const report = {
      pointData: [{ name: 'p', association: 'point' as const, components: 1, type: 'Float64', range: [-2, 8] as [number, number], pieces: 1 },
        { name: 'velocity', association: 'point' as const, components: 3, type: 'Float64', range: [0, 0.5] as [number, number], pieces: 1 }],
      cellData: [],
    };
    const r = assignNoiseScales('plane', [q('massFlowRate', 'ṁ', 1e-15, 'kg/s'), q('volumeFlowRate', 'Q', 1e-18, 'm³/s'), q('area', 'A', 0.01, 'm²'),
      q('pressureAreaMean', 'p area-mean', 7e-9, 'Pa'), q('totalPressureMassMean', 'p₀ mass-mean', 1e-6, 'Pa'), q('uniformityIndex', 'uniformity γ', 1e-12)],
    { fields: meshMagnitudes(report), density: 1000 });
    expect(r.map((x) => x.scale?.value)).toEqual([5, 0.005, undefined, 8, 8 + 0.5 * 1000 * 0.25, undefined]);
    expect(r.map((x) => quantityText(x))).toEqual(['1.000×10⁻¹⁵ kg/s (≈ 0 relative to ρ·max |velocity|·A)', '1.000×10⁻¹⁸ m³/s (≈ 0 relative to max |velocity|·A)',
      '0.01000 m²', '7.000×10⁻⁹ Pa (≈ 0 relative to max |p| in the mesh)', '1.000×10⁻⁶ Pa', '1.000×10⁻¹²']);
    // the probe set's spelling with a loss's prefix, and the density field by name
    const loss = assignNoiseScales('plane', [q('upstream.area', 'A', 2, 'm²'), q('upstream.massFlowRate', 'ṁ', 1e-30, 'kg/s')],
      { fields: meshMagnitudes({ ...report, cellData: [{ name: 'rho', association: 'cell', components: 1, type: 'Float64', range: [990, 1010], pieces: 1 }] }), density: 'rho' });
    expect(loss[1]!.scale).toEqual({ value: 1010 * 0.5 * 2, label: 'ρ·max |velocity|·A' });
  });
});

describe('the Stokes sphere: the first line probe of the app', async () => {
  const d = await loadDatasetFile(SPHERE);
  const b = datasetBounds(d);
  // the line the app's "+ new line probe" adds: across the centre along the shortest side (all equal: x), 201 samples
  const from: [number, number, number] = [b[0], (b[2] + b[3]) / 2, (b[4] + b[5]) / 2], to: [number, number, number] = [b[1], from[1], from[2]];

  it('marks the pressure mean ≈ 0 against max |p| on the line, and keeps the value in CSV and JSON', () => {
    const r = probeLine(d, from, to, { samples: 201 });
    const p = lineStats(r).series.find((s) => s.label === 'p')!;
    // p on the line: odd in x about the bead, reaching the wall values ±4.5 Pa (Stokes' solution; the
    // samples meet the wall's nodes); the mean is what the issue saw pinned, 1.431×10⁻¹⁶ Pa
    expect(p.stats.mean).toBeCloseTo(1.431e-16, 19);
    expect(p.stats.max).toBeCloseTo(4.5, 12);
    expect(p.stats.min).toBeCloseTo(-4.5, 12);
    const quantities = assignNoiseScales('line', [q('p.mean', 'p mean', p.stats.mean, 'Pa'), q('p.min', 'p min', p.stats.min, 'Pa'), q('p.max', 'p max', p.stats.max, 'Pa')]);
    expect(quantities[0]!.scale).toEqual({ value: Math.max(Math.abs(p.stats.min), Math.abs(p.stats.max)), label: 'max |p| on the line' });
    expect(quantityText(quantities[0]!)).toBe('1.431×10⁻¹⁶ Pa (≈ 0 relative to max |p| on the line)');
    expect(quantityText(quantities[2]!)).toBe('4.500 Pa');
  });

  it('a probe set of the same line and a point on the symmetry plane: marked on screen, full values in the exports', () => {
    const set = checkProbeSet({
      format: 'fieldtally-probe-set', version: 2,
      probes: [
        { id: 'line-1', kind: 'line', geometry: { from, to }, options: { samples: 201 } },
        // x = 0: p = 0 exactly in Stokes' solution, interpolated from nodes on either side
        { id: 'point-1', kind: 'point', geometry: { at: [0, 0.002, 0.0005] } },
      ],
    }, 'test set');
    const ev = evaluateProbeSet(d, set);
    const fields = meshMagnitudes(loadReport(d));
    const results = ev.probes.map((o) => outcomeResult(o, [0, 0, 0], { noise: { fields, density: 1300 } }));
    const line = results[0]!, mean = line.quantities.find((x) => x.key === 'p.mean')!;
    const lo = line.quantities.find((x) => x.key === 'p.min')!.value, hi = line.quantities.find((x) => x.key === 'p.max')!.value;
    expect(mean.scale).toEqual({ value: Math.max(Math.abs(lo), Math.abs(hi)), label: 'max |p| on the line' });
    expect(Math.abs(mean.value)).toBeLessThan(1e-12);
    const pointP = results[1]!.quantities.find((x) => x.key === 'p')!;
    expect(pointP.scale!.label).toBe('max |p| in the mesh');
    // the mesh's range of p is the wall's ±4.5 Pa at its nodes (sample-fields/README.md)
    expect(pointP.scale!.value).toBeCloseTo(4.5, 2);
    const ctx = { file: 'sphere-stokes.vtu', createdAt: '2026-01-01T00:00:00Z', tool: 'fieldtally' };
    const csvRow = resultsAsCsv(results, ctx).split('\n').find((l) => l.includes(',p.mean,'))!;
    expect(Number(csvRow.split(',').at(-2))).toBe(mean.value);
    const json = JSON.parse(resultsAsJson(results, ctx)) as { probes: { quantities: { key: string; value: number }[] }[] };
    expect(json.probes[0]!.quantities.find((x) => x.key === 'p.mean')!.value).toBe(mean.value);
  });
});
