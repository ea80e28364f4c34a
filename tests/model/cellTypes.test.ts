import { describe, expect, it } from 'vitest';
import { CELL_EDGES, CELL_FACES, EDGE_TABLE, FACE_TABLE, REFERENCE_NODES } from '../../src/model/cellTypes.ts';

/** Newell's area vector of a polygon given as node indices into xyz. */
function areaVector(xyz: readonly number[], face: readonly number[]): [number, number, number] {
  let ax = 0, ay = 0, az = 0;
  for (let i = 0; i < face.length; i++) {
    const a = face[i]!, b = face[(i + 1) % face.length]!;
    const [x1, y1, z1] = [xyz[3 * a]!, xyz[3 * a + 1]!, xyz[3 * a + 2]!];
    const [x2, y2, z2] = [xyz[3 * b]!, xyz[3 * b + 1]!, xyz[3 * b + 2]!];
    ax += (y1 - y2) * (z1 + z2); ay += (z1 - z2) * (x1 + x2); az += (x1 - x2) * (y1 + y2);
  }
  return [ax / 2, ay / 2, az / 2];
}

describe('cell face tables', () => {
  // Reference: a closed surface has zero total area vector (divergence theorem), and on a convex cell
  // every outward face normal points away from the cell centroid.
  for (const type of [10, 11, 12, 13, 14]) {
    it(`type ${type}: faces close and point outward`, () => {
      const xyz = REFERENCE_NODES[type]!;
      const n = xyz.length / 3;
      const c = [0, 1, 2].map((k) => { let s = 0; for (let i = 0; i < n; i++) s += xyz[3 * i + k]!; return s / n; });
      const sum = [0, 0, 0];
      for (const f of CELL_FACES[type]!) {
        const a = areaVector(xyz, f);
        for (let k = 0; k < 3; k++) sum[k]! += a[k]!;
        const fc = [0, 1, 2].map((k) => f.reduce((s, i) => s + xyz[3 * i + k]!, 0) / f.length);
        const out = (fc[0]! - c[0]!) * a[0] + (fc[1]! - c[1]!) * a[1] + (fc[2]! - c[2]!) * a[2];
        expect(out).toBeGreaterThan(0);
      }
      for (const s of sum) expect(Math.abs(s)).toBeLessThan(1e-14);
    });
  }

  it('edge counts follow from faces (Euler: V − E + F = 2)', () => {
    for (const type of [10, 11, 12, 13, 14, 15, 16]) {
      const faces = CELL_FACES[type]!;
      const v = new Set(faces.flat()).size;
      expect(v - CELL_EDGES[type]!.length + faces.length).toBe(2);
    }
    expect(CELL_EDGES[12]!.length).toBe(12);
    expect(CELL_EDGES[10]!.length).toBe(6);
  });

  it('flat tables mirror the nested ones', () => {
    const t = 13;
    const faces = [];
    for (let f = FACE_TABLE.start[t]!; f < FACE_TABLE.start[t + 1]!; f++) {
      faces.push(Array.from(FACE_TABLE.nodes.subarray(FACE_TABLE.first[f]!, FACE_TABLE.first[f]! + FACE_TABLE.size[f]!)));
    }
    expect(faces).toEqual(CELL_FACES[t]!.map((f) => [...f]));
    expect(EDGE_TABLE.start[13]! - EDGE_TABLE.start[12]!).toBe(12);
  });
});
