import { describe, expect, it } from 'vitest';
import { cutPlane } from '../../src/cut/cutPlane.ts';
import { planCutRuns } from '../../src/parallel/placeCuts.ts';
import { cutShare, placeCutShare, type SharedCutArrays } from '../../src/parallel/shareTasks.ts';
import { warmUpShareKernels } from '../../src/parallel/shareWarmUp.ts';
import { shareDataset, splitCells } from '../../src/parallel/shares.ts';
import { toSharedDataset } from '../../src/parallel/sharedDataset.ts';
import { pipeCase } from '../../src/samples/pipe.ts';

const origin: [number, number, number] = [0.001, 0, 0.05], normal: [number, number, number] = [0.1, 0.05, 1];

/** The pipe sample cut by two shares (keys 1 and 2) and placed as the pool places it. */
function twoShareCut(): SharedCutArrays {
  const d = toSharedDataset(pipeCase());
  const ranges = splitCells(d.pieces[0]!.cellTypes.length, 2);
  const parts = ranges.map((r, i) => cutShare(shareDataset(d, r), i + 1, origin, normal, {}));
  const plan = planCutRuns(parts);
  const into: SharedCutArrays = {
    positions: new Float64Array(3 * plan.vertices), indices: new Uint32Array(3 * plan.triangles), sourceCell: new Int32Array(plan.triangles),
    vertexEdges: new Int32Array(2 * plan.vertices), vertexT: new Float64Array(plan.vertices),
    fields: parts[0]!.fields.map((f) => new Float64Array((f.association === 'point' ? plan.vertices : plan.triangles) * f.components)),
  };
  ranges.forEach((r, i) => placeCutShare(i + 1, r, plan.runs[i]!, into));
  return into;
}

describe('warming a share worker\'s cut path', () => {
  it('runs once per thread and leaves no state behind: shares cut and placed give the same arrays before and after', async () => {
    // Reference: the same two-share cut before the warm-up, and the one-thread cut of the whole pipe.
    const before = twoShareCut();
    const a = warmUpShareKernels(1), b = warmUpShareKernels(1);
    expect(a).toBe(b);
    await a;
    const after = twoShareCut();
    expect(after.positions).toEqual(before.positions);
    expect(after.indices).toEqual(before.indices);
    expect(after.sourceCell).toEqual(before.sourceCell);
    expect(after.fields).toEqual(before.fields);
    const whole = cutPlane(pipeCase(), origin, normal);
    expect(after.positions).toEqual(whole.positions);
    expect(after.indices).toEqual(whole.indices);
  });
});
