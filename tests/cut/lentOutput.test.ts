/**
 * Cuts lent the kernel's own buffers (`lendOutput`, used by the pool's share workers): the same arrays as a
 * cut of their own, left alone by a later cut until given back (`releaseCut`), and written again after.
 */
import { describe, expect, it } from 'vitest';
import { cutPlane, releaseCut } from '../../src/cut/cutPlane.ts';
import { datasetOf, hexGrid, pointFieldFrom, withFields } from '../../src/model/meshBuild.ts';

const d = datasetOf([withFields(hexGrid(6, 6, 6), [pointFieldFrom(hexGrid(6, 6, 6), 'p', 1, (x, y, z, o) => { o[0] = x + 2 * y - z; })])]);
const A: [[number, number, number], [number, number, number]] = [[0.5, 0.5, 0.5], [0.2, 0.3, 1]];
const B: [[number, number, number], [number, number, number]] = [[0.3, 0.5, 0.5], [1, -0.4, 0.1]];

describe('lent cut output', () => {
  it('holds the same arrays as a cut of its own, and a later cut does not touch it until it is given back', () => {
    const own = cutPlane(d, ...A), lent = cutPlane(d, ...A, { lendOutput: true });
    expect(lent.positions).toEqual(own.positions);
    expect(lent.indices).toEqual(own.indices);
    expect(lent.vertexEdges).toEqual(own.vertexEdges);
    expect(lent.vertexT).toEqual(own.vertexT);
    expect(lent.fields[0]!.values).toEqual(own.fields[0]!.values);
    const before = lent.positions.slice();
    const other = cutPlane(d, ...B, { lendOutput: true });
    expect(other.positions.buffer).not.toBe(lent.positions.buffer);
    expect(lent.positions).toEqual(before);
    releaseCut(lent); // not the latest: nothing to give back
    releaseCut(other);
    const next = cutPlane(d, ...A, { lendOutput: true });
    expect(next.positions.buffer).toBe(other.positions.buffer);
    expect(next.positions).toEqual(own.positions);
    releaseCut(next);
    // a cut of its own after a given-back one: its arrays stay its own when the next cut writes
    const mine = cutPlane(d, ...B), copy = mine.positions.slice();
    cutPlane(d, ...A);
    expect(mine.positions).toEqual(copy);
  });
});
