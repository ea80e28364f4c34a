// Outline edges of a drawn surface: each edge once per group, with the faces sharing it. The counts are
// those of a box's surface (geometry: a closed polyhedron's faces list each edge twice, Euler's
// V − E + F = 2 for a box subdivided into quads).
import { describe, expect, it } from 'vitest';
import { datasetOf, hexGrid } from '../../src/model/meshBuild.ts';
import { getBoundaryFaces } from '../../src/surface/surfaceCache.ts';
import { outlineEdges } from '../../src/surface/outlineEdges.ts';
import { drawFaces } from '../../src/surface/surfaceDrawing.ts';

/** Segments as sorted "x,y,z|x,y,z" keys (ends ordered), with their group and share count. */
function segments(o: ReturnType<typeof outlineEdges>): string[] {
  const out: string[] = [];
  for (let s = 0; s < o.edgeGroups.length / 2; s++) {
    const a = [...o.edges.subarray(6 * s, 6 * s + 3)].join(','), b = [...o.edges.subarray(6 * s + 3, 6 * s + 6)].join(',');
    out.push(`${a < b ? a : b}|${a < b ? b : a} g${o.edgeGroups[2 * s]} n${o.edgeShares[2 * s]}`);
  }
  return out.sort();
}

describe('outlineEdges', () => {
  it('lists every edge of a closed single-group surface once, shared by two faces', () => {
    const d = datasetOf([hexGrid(2, 1, 1)]);
    const f = getBoundaryFaces(d);
    expect(f.count).toBe(10);
    const o = outlineEdges(d, f, null);
    // a 2×1×1 box of quads: F = 10, V = 12, so E = V + F − 2 = 20 edges, each listed by two faces
    expect(o.edgeGroups.length / 2).toBe(20);
    expect([...o.edgeShares].every((n) => n === 2)).toBe(true);
    expect(new Set(segments(o)).size).toBe(20);
    expect(o.edges.length).toBe(6 * 20);
  });

  it('keeps an edge between two groups once for each group, shared by one face of each', () => {
    const d = datasetOf([hexGrid(1, 1, 1)]);
    const f = getBoundaryFaces(d);
    expect(f.count).toBe(6);
    // the face whose nodes all lie at z = 1 forms group 1, the other five group 0
    const P = d.pieces[0]!.points, groupOfFace = new Int32Array(6);
    for (let i = 0; i < 6; i++) {
      const ids = f.nodes.subarray(f.offsets[i]!, f.offsets[i + 1]!);
      if ([...ids].every((n) => P[3 * n + 2] === 1)) groupOfFace[i] = 1;
    }
    expect(groupOfFace.reduce((a, b) => a + b, 0)).toBe(1);
    const s = segments(outlineEdges(d, f, groupOfFace));
    // 12 cube edges: the top square's 4 appear for group 1 and group 0 (one face each), the other 8 in group 0 twice
    expect(s.length).toBe(16);
    expect(s.filter((x) => x.endsWith('g1 n1')).length).toBe(4);
    expect(s.filter((x) => x.endsWith('g0 n1')).length).toBe(4);
    expect(s.filter((x) => x.endsWith('g0 n2')).length).toBe(8);
    for (const x of s.filter((y) => y.includes(' g1 '))) expect(x).toMatch(/^[01],[01],1\|[01],[01],1 /);
  });

  it('is what drawFaces hands the view', () => {
    const d = datasetOf([hexGrid(3, 2, 2)]);
    const f = getBoundaryFaces(d);
    const drawn = drawFaces(d, f, null), direct = outlineEdges(d, f, null);
    expect(drawn.edges).toEqual(direct.edges);
    expect(drawn.edgeGroups).toEqual(direct.edgeGroups);
    expect(drawn.edgeShares).toEqual(direct.edgeShares);
    // 3×2×2 box: F = 2(6 + 6 + 4) = 32 quads, V = 4·3·3 − 2·1·1 = 34 surface nodes, E = V + F − 2 = 64
    expect(drawn.edgeGroups.length / 2).toBe(64);
  });
});
