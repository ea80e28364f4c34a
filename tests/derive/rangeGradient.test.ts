/**
 * The gradient of a node range (src/derive/rangeGradient.ts) equals the whole piece's gradient
 * (fieldGradient.ts) bit for bit, however the nodes are split; reference: this repository's single-thread
 * kernel (Barth & Frederickson 1990 quadratic least-squares fit), itself checked for second-order
 * convergence in quadraticGradient.test.ts.
 */
import { describe, expect, it } from 'vitest';
import { fieldGradient } from '../../src/derive/fieldGradient.ts';
import { nodeRanges, pointGradientRange } from '../../src/derive/rangeGradient.ts';
import { pointStencilOfRange } from '../../src/derive/localStencil.ts';
import { pointStencil } from '../../src/derive/stencils.ts';
import { hexGrid, pointFieldFrom, tetGrid, withFields } from '../../src/model/meshBuild.ts';
import type { Piece } from '../../src/model/piece.ts';

const bent = (u: number, v: number, w: number): [number, number, number] => [u + 0.1 * Math.sin(v), 1.3 * v, w + 0.05 * u * v];

function withVelocity(p: Piece): Piece {
  return withFields(p, [
    pointFieldFrom(p, 'velocity', 3, (x, y, z, o) => { o[0] = Math.sin(3 * y) * z; o[1] = Math.cos(2 * x) + y * y; o[2] = x * y * z; }),
    pointFieldFrom(p, 'p', 1, (x, y, z, o) => { o[0] = Math.exp(0.3 * x) * y - z * z; }),
  ]);
}

function sameBits(a: Float64Array, b: Float64Array): number {
  expect(a.length).toBe(b.length);
  let differ = 0;
  for (let i = 0; i < a.length; i++) if (!Object.is(a[i], b[i])) differ++;
  return differ;
}

/** The piece with its nodes renumbered by a fixed scramble (i → 11i mod n, n not a multiple of 11), so a node range's neighbours lie all over the numbering. */
function scrambled(p: Piece): Piece {
  const n = p.points.length / 3, to = new Int32Array(n), points = new Float64Array(3 * n);
  expect(n % 11).not.toBe(0);
  for (let i = 0; i < n; i++) to[i] = (11 * i) % n;
  for (let i = 0; i < n; i++) points.set(p.points.subarray(3 * i, 3 * i + 3), 3 * to[i]!);
  return { ...p, points, connectivity: p.connectivity.map((q) => to[q]!), pointData: [] };
}

describe('pointGradientRange', () => {
  const meshes: [string, Piece][] = [
    ['bent hexahedra 9×7×5', withVelocity(hexGrid(9, 7, 5, bent))],
    ['tetrahedra 5×4×4', withVelocity(tetGrid(5, 4, 4, bent))],
    ['one layer of hexahedra 12×10×1', withVelocity(hexGrid(12, 10, 1, (u, v, w) => [u, v, 0.02 * w]))],
    ['scrambled node numbering, hexahedra 8×6×4', withVelocity(scrambled(hexGrid(8, 6, 4, bent)))],
  ];
  for (const [name, p] of meshes) {
    for (const field of ['velocity', 'p']) {
      it(`${name}, ${field}: ranges for 1, 2, 3 and 7 shares give the whole gradient bit for bit`, () => {
        const f = p.pointData.find((x) => x.name === field)!;
        const whole = fieldGradient(p, f), np = p.points.length / 3;
        for (const parts of [1, 2, 3, 7]) {
          const out = new Float64Array(whole.length).fill(Number.NaN), b = nodeRanges(np, parts);
          for (let i = 0; i + 1 < b.length; i++) pointGradientRange(p, f.values, f.components, b[i]!, b[i + 1]!, out);
          expect(sameBits(out, whole)).toBe(0);
        }
      });
    }
  }

  it('a range stencil holds exactly the whole stencil\'s rows of the range and its neighbours, the rest empty', () => {
    for (const [, p] of meshes) {
      const whole = pointStencil(p), np = p.points.length / 3;
      const row = (st: typeof whole, i: number) => Array.from(st.ids.subarray(st.offsets[i]!, st.offsets[i + 1]!));
      for (const [from, to] of [[0, 1], [Math.floor(np / 3), Math.floor(np / 2)], [np - 5, np]] as const) {
        const part = pointStencilOfRange(p, from, to), needed = new Set<number>();
        for (let i = from; i < to; i++) { needed.add(i); for (const j of row(whole, i)) needed.add(j); }
        for (let i = 0; i < np; i++) expect(row(part, i)).toEqual(needed.has(i) ? row(whole, i) : []);
      }
    }
  });

  it('splits nodes into contiguous near-equal ranges', () => {
    expect(Array.from(nodeRanges(10, 3))).toEqual([0, 3, 7, 10]);
    expect(Array.from(nodeRanges(2, 5))).toEqual([0, 1, 2]);
    expect(Array.from(nodeRanges(0, 3))).toEqual([0, 0]);
  });

  it('rejects a range outside the piece and a result of the wrong size, naming both', () => {
    const p = meshes[0]![1], f = p.pointData[0]!, np = p.points.length / 3;
    expect(() => pointGradientRange(p, f.values, 3, 0, np + 1, new Float64Array(9 * np))).toThrow(`node range 0..${np + 1} is outside the piece's ${np} nodes`);
    expect(() => pointGradientRange(p, f.values, 3, 0, 4, new Float64Array(5))).toThrow(`result holds 5 values, expected ${9 * np}`);
  });
});
