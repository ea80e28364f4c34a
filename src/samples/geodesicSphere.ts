/**
 * A triangulated unit sphere: each face of the icosahedron divided into n² triangles, the points
 * pushed out to the sphere along their rays. Points shared by neighbouring faces are stored once, so
 * the triangulation is closed and conforming.
 */

/** A unit-sphere triangulation. `dirs`: xyz-interleaved unit vectors; `triangles`: 3 point indices each, counter-clockwise seen from outside. */
export interface SphereTriangulation {
  dirs: Float64Array;
  triangles: Int32Array;
}

/** The 12 icosahedron vertices (not normalised): cyclic permutations of (0, ±1, ±φ). */
function icosahedronVertices(): number[][] {
  const g = (1 + Math.sqrt(5)) / 2, v: number[][] = [];
  for (const s1 of [-1, 1]) for (const s2 of [-1, 1]) v.push([0, s1, s2 * g], [s1, s2 * g, 0], [s2 * g, 0, s1]);
  return v;
}

/** The 20 faces as vertex triples, found as the triples of mutually adjacent vertices (edge length 2), oriented outward. */
function icosahedronFaces(v: number[][]): [number, number, number][] {
  const adj = (i: number, j: number) => Math.abs((v[i]![0]! - v[j]![0]!) ** 2 + (v[i]![1]! - v[j]![1]!) ** 2 + (v[i]![2]! - v[j]![2]!) ** 2 - 4) < 1e-9;
  const faces: [number, number, number][] = [];
  for (let i = 0; i < 12; i++) for (let j = i + 1; j < 12; j++) for (let k = j + 1; k < 12; k++) {
    if (!adj(i, j) || !adj(j, k) || !adj(i, k)) continue;
    const [a, b, c] = [v[i]!, v[j]!, v[k]!];
    const n = [(b[1]! - a[1]!) * (c[2]! - a[2]!) - (b[2]! - a[2]!) * (c[1]! - a[1]!),
      (b[2]! - a[2]!) * (c[0]! - a[0]!) - (b[0]! - a[0]!) * (c[2]! - a[2]!),
      (b[0]! - a[0]!) * (c[1]! - a[1]!) - (b[1]! - a[1]!) * (c[0]! - a[0]!)];
    const outward = n[0]! * a[0]! + n[1]! * a[1]! + n[2]! * a[2]! > 0;
    faces.push(outward ? [i, j, k] : [i, k, j]);
  }
  if (faces.length !== 20) throw new Error(`geodesicSphere: found ${faces.length} icosahedron faces, expected 20`);
  return faces;
}

/**
 * The sphere triangulation with `n` divisions per icosahedron edge: 20n² triangles, 10n² + 2 points;
 * edges about 1.1/n long on the unit sphere.
 */
export function geodesicSphere(n: number): SphereTriangulation {
  if (!Number.isInteger(n) || n < 1) throw new Error(`geodesicSphere: divisions must be a positive integer, got ${n}`);
  const v = icosahedronVertices(), faces = icosahedronFaces(v);
  const index = new Map<string, number>();
  const dirs: number[] = [];
  // A point is named by its barycentric weights over global vertex ids, so neighbours agree on it.
  const pointOf = (ids: number[], w: number[]): number => {
    const parts: [number, number][] = [];
    for (let q = 0; q < 3; q++) if (w[q]! > 0) parts.push([ids[q]!, w[q]!]);
    parts.sort((p, r) => p[0] - r[0]);
    const key = parts.map(([id, wt]) => `${id}:${wt}`).join(',');
    let k = index.get(key);
    if (k === undefined) {
      let x = 0, y = 0, z = 0;
      for (const [id, wt] of parts) { x += wt * v[id]![0]!; y += wt * v[id]![1]!; z += wt * v[id]![2]!; }
      const s = 1 / Math.hypot(x, y, z);
      k = dirs.length / 3;
      dirs.push(x * s, y * s, z * s);
      index.set(key, k);
    }
    return k;
  };
  const tris: number[] = [];
  for (const f of faces) {
    // Grid node (i, j), i + j ≤ n: weights (n − i − j, i, j) on the face's vertices (A, B, C).
    const node = (i: number, j: number) => pointOf(f, [n - i - j, i, j]);
    for (let j = 0; j < n; j++) for (let i = 0; i < n - j; i++) {
      tris.push(node(i, j), node(i + 1, j), node(i, j + 1));
      if (i + j < n - 1) tris.push(node(i + 1, j), node(i + 1, j + 1), node(i, j + 1));
    }
  }
  return { dirs: Float64Array.from(dirs), triangles: Int32Array.from(tris) };
}
