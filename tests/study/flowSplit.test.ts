/**
 * A flow split by the mass-balance evaluator: each outlet's share of the inflow. The pipe's outlet cut is
 * split in two halves by rectangles either side of x = 0; the O-grid mesh is a mirror image across that
 * plane (nodes every 15° around), so each half carries exactly half of what enters.
 */
import { describe, expect, it } from 'vitest';
import { pipeCase, pipeExact } from '../../src/samples/pipe.ts';
import { evaluateProbeSet, type ProbeOutcome } from '../../src/study/evaluate.ts';
import type { PlaneDoc } from '../../src/study/probeSet.ts';

const q = (o: ProbeOutcome, key: string): number => {
  const x = o.quantities.find((y) => y.key === key);
  if (!x) throw new Error(`${o.id}: no quantity ${key} (has ${o.quantities.map((y) => y.key).join(', ')})`);
  return x.value;
};

describe('flow split shares', () => {
  const e = pipeExact();
  const half = (side: 1 | -1): PlaneDoc => ({
    origin: [0, 0, 0.08], normal: [0, 0, 1],
    region: { rectangle: { centre: [side * 0.01, 0, 0.08], axis: [1, 0, 0], halfSizes: [0.01, 0.02] } },
  });

  it('two outlets of a symmetric split each take half of the inflow; the shares and the imbalance add up', () => {
    const o = evaluateProbeSet(pipeCase(), {
      format: 'fieldtally-probe-set', version: 2, reference: { preset: 'water-20c' },
      probes: [{ id: 'split', kind: 'mass-balance', geometry: { planes: [{ origin: [0, 0, 0.02], normal: [0, 0, -1] }, half(1), half(-1)] } }],
    }).probes[0]!;
    expect(o.ok).toBe(true);
    // Reference: conservation of mass (identity) and the mirror symmetry of the mesh and of the Hagen–Poiseuille profile
    expect(q(o, 'item2.outflowShare')).toBeCloseTo(0.5, 12);
    expect(q(o, 'item3.outflowShare')).toBeCloseTo(0.5, 12);
    expect(q(o, 'item2.outflowShare') + q(o, 'item3.outflowShare')).toBeCloseTo(1 + q(o, 'imbalanceShare'), 14);
    // the inlet (net inward flux) is no outlet: it has no share
    expect(o.quantities.some((x) => x.key === 'item1.outflowShare')).toBe(false);
    expect(o.quantities.find((x) => x.key === 'item2.outflowShare')!.unit).toBe('1');
    // Reference: Hagen–Poiseuille, ṁ = ρπR²V on the exact circle; the faceted medium mesh under-fills it by 1.14 %
    expect(Math.abs(q(o, 'inflow') / e.massFlow - 1)).toBeLessThan(0.02);
  });

  it('a balance with no inflow gives no shares', () => {
    const o = evaluateProbeSet(pipeCase(), {
      format: 'fieldtally-probe-set', version: 2, reference: { preset: 'water-20c' },
      probes: [{ id: 'out', kind: 'mass-balance', geometry: { planes: [{ origin: [0, 0, 0.08], normal: [0, 0, 1] }] } }],
    }).probes[0]!;
    expect(o.quantities.some((x) => /outflowShare$/.test(x.key))).toBe(false);
  });
});
