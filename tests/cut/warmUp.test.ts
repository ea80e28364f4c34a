import { describe, expect, it } from 'vitest';
import { integratePlane } from '../../src/cut/planeIntegrals.ts';
import { warmUpCutKernels } from '../../src/cut/warmUp.ts';
import { pipeCase, pipeExact } from '../../src/samples/pipe.ts';

describe('warming the cut kernels', () => {
  it('runs once per thread and leaves no state behind: a cut gives the same numbers before and after', async () => {
    // Reference: the cut of the same plane before the warm-up (the warm-up must not change any result).
    const e = pipeExact();
    const d = pipeCase();
    const q = { origin: [0, 0, 0.05] as [number, number, number], normal: [0, 0, 1] as [number, number, number], integral: { density: e.rho } };
    const before = integratePlane(d, q).integrals;
    const a = warmUpCutKernels(), b = warmUpCutKernels();
    expect(a).toBe(b);
    await a;
    const after = integratePlane(d, q).integrals;
    expect(after.volumeFlowRate).toBe(before.volumeFlowRate);
    expect(after.massFlowRate).toBe(before.massFlowRate);
    expect(after.totalPressure).toEqual(before.totalPressure);
    expect(after.area).toBe(before.area);
  });
});
