/**
 * Connected parts of a triangle set, and the part around a seed point.
 *
 * Connectivity: two triangles are connected when they share a vertex position. The cut computes every
 * crossing of a mesh edge with bit-identical coordinates in each cell (and each piece) that holds the edge,
 * so positions identify mesh edges exactly; `ExactPointIndex` turns them into ids (typed-array hash, no
 * strings) and a union–find over those ids labels the parts. A plane across a manifold crosses several
 * passages whose cuts share no mesh edge, so they come out as separate parts.
 *
 * Seed: projected along the plane normal onto the cut (its distance from the plane does not matter), then
 * snapped to the nearest triangle; if that triangle is farther than `maxDistance` in the plane, the seed is
 * off the cut and the region is flagged empty with the distance in the reason.
 */
import { ExactPointIndex } from './pointKey.ts';
import { emptyTriangleSet, subsetTriangles, triangleCount, vertexCount, type TriangleSet, type Vec3 } from './triangleSet.ts';

/** Part label per triangle (0 … count−1, numbered by first triangle) and the number of parts. */
export function connectedParts(set: TriangleSet): { part: Int32Array; count: number } {
  const nv = vertexCount(set), nt = triangleCount(set), P = set.positions, I = set.indices;
  const index = new ExactPointIndex(nv);
  const pid = new Int32Array(nv);
  for (let v = 0; v < nv; v++) pid[v] = index.idOf(P[3 * v]!, P[3 * v + 1]!, P[3 * v + 2]!);
  const parent = new Int32Array(index.count);
  for (let i = 0; i < parent.length; i++) parent[i] = i;
  const find = (x: number): number => {
    while (parent[x] !== x) { parent[x] = parent[parent[x]!]!; x = parent[x]!; }
    return x;
  };
  const union = (a: number, b: number): void => { a = find(a); b = find(b); if (a !== b) parent[a < b ? b : a] = a < b ? a : b; };
  for (let t = 0; t < nt; t++) {
    const a = pid[I[3 * t]!]!;
    union(a, pid[I[3 * t + 1]!]!); union(a, pid[I[3 * t + 2]!]!);
  }
  const label = new Int32Array(index.count).fill(-1), part = new Int32Array(nt);
  let count = 0;
  for (let t = 0; t < nt; t++) {
    const r = find(pid[I[3 * t]!]!);
    if (label[r]! < 0) label[r] = count++;
    part[t] = label[r]!;
  }
  return { part, count };
}

/** Closest point of triangle (a, b, c) to p, squared distance (Ericson, *Real-Time Collision Detection*, §5.1.5). */
function distance2ToTriangle(P: Float64Array, ia: number, ib: number, ic: number, px: number, py: number, pz: number): number {
  const ax = P[ia]!, ay = P[ia + 1]!, az = P[ia + 2]!;
  const abx = P[ib]! - ax, aby = P[ib + 1]! - ay, abz = P[ib + 2]! - az;
  const acx = P[ic]! - ax, acy = P[ic + 1]! - ay, acz = P[ic + 2]! - az;
  const apx = px - ax, apy = py - ay, apz = pz - az;
  const d1 = abx * apx + aby * apy + abz * apz, d2 = acx * apx + acy * apy + acz * apz;
  let qx: number, qy: number, qz: number;
  const bpx = px - P[ib]!, bpy = py - P[ib + 1]!, bpz = pz - P[ib + 2]!;
  const d3 = abx * bpx + aby * bpy + abz * bpz, d4 = acx * bpx + acy * bpy + acz * bpz;
  const cpx = px - P[ic]!, cpy = py - P[ic + 1]!, cpz = pz - P[ic + 2]!;
  const d5 = abx * cpx + aby * cpy + abz * cpz, d6 = acx * cpx + acy * cpy + acz * cpz;
  const va = d3 * d6 - d5 * d4, vb = d5 * d2 - d1 * d6, vc = d1 * d4 - d3 * d2;
  if (d1 <= 0 && d2 <= 0) { qx = ax; qy = ay; qz = az; }
  else if (d3 >= 0 && d4 <= d3) { qx = P[ib]!; qy = P[ib + 1]!; qz = P[ib + 2]!; }
  else if (vc <= 0 && d1 >= 0 && d3 <= 0) { const v = d1 / (d1 - d3); qx = ax + v * abx; qy = ay + v * aby; qz = az + v * abz; }
  else if (d6 >= 0 && d5 <= d6) { qx = P[ic]!; qy = P[ic + 1]!; qz = P[ic + 2]!; }
  else if (vb <= 0 && d2 >= 0 && d6 <= 0) { const w = d2 / (d2 - d6); qx = ax + w * acx; qy = ay + w * acy; qz = az + w * acz; }
  else if (va <= 0 && d4 - d3 >= 0 && d5 - d6 >= 0) {
    const w = (d4 - d3) / ((d4 - d3) + (d5 - d6));
    qx = P[ib]! + w * (P[ic]! - P[ib]!); qy = P[ib + 1]! + w * (P[ic + 1]! - P[ib + 1]!); qz = P[ib + 2]! + w * (P[ic + 2]! - P[ib + 2]!);
  } else {
    const den = 1 / (va + vb + vc), v = vb * den, w = vc * den;
    qx = ax + abx * v + acx * w; qy = ay + aby * v + acy * w; qz = az + abz * v + acz * w;
  }
  return (px - qx) ** 2 + (py - qy) ** 2 + (pz - qz) ** 2;
}

/** The seed's triangle and how far it is from the seed (length unit). */
export interface SeedSnap {
  triangle: number;
  distance: number;
}

/** Nearest triangle to point p (after projecting p along `normal` onto the plane through `origin`, when given). */
export function snapSeed(set: TriangleSet, seed: Vec3, plane?: { origin: Vec3; normal: Vec3 }): SeedSnap | null {
  let [px, py, pz] = seed;
  if (plane) {
    const [nx, ny, nz] = plane.normal, [ox, oy, oz] = plane.origin;
    const d = nx * (px - ox) + ny * (py - oy) + nz * (pz - oz);
    px -= d * nx; py -= d * ny; pz -= d * nz;
  }
  const nt = triangleCount(set), I = set.indices, P = set.positions;
  let best = -1, bestD = Infinity;
  for (let t = 0; t < nt; t++) {
    const d = distance2ToTriangle(P, 3 * I[3 * t]!, 3 * I[3 * t + 1]!, 3 * I[3 * t + 2]!, px, py, pz);
    if (d < bestD) { bestD = d; best = t; }
  }
  return best < 0 ? null : { triangle: best, distance: Math.sqrt(bestD) };
}

/** The part of a set around a seed. */
export interface SeedRegion {
  set: TriangleSet;
  /** Null when the set is empty. */
  snap: SeedSnap | null;
  /** Why the region is empty, or null. */
  reason: string | null;
}

/**
 * The connected part of `set` containing the seed. `maxDistance` (length unit) is how far from the cut the
 * projected seed may lie; default 1e-6 × the set's bounding-box diagonal.
 */
export function seedRegion(set: TriangleSet, seed: Vec3, plane?: { origin: Vec3; normal: Vec3 }, maxDistance?: number): SeedRegion {
  const snap = snapSeed(set, seed, plane);
  if (!snap) return { set, snap, reason: 'the cut is empty, so no part contains the seed' };
  const limit = maxDistance ?? 1e-6 * setDiagonal(set);
  if (snap.distance > limit) {
    return {
      set: emptyTriangleSet(set.fields), snap,
      reason: `seed (${seed.join(', ')}) is off the cut: the nearest cut triangle is ${snap.distance.toPrecision(4)} away (allowed ${limit.toPrecision(3)})`,
    };
  }
  const { part } = connectedParts(set);
  const want = part[snap.triangle]!, keep = new Uint8Array(part.length);
  for (let t = 0; t < part.length; t++) keep[t] = part[t] === want ? 1 : 0;
  return { set: subsetTriangles(set, keep), snap, reason: null };
}

/** Bounding-box diagonal of a set's vertices (0 when empty). */
export function setDiagonal(set: TriangleSet): number {
  const P = set.positions;
  if (P.length === 0) return 0;
  let x0 = Infinity, x1 = -Infinity, y0 = Infinity, y1 = -Infinity, z0 = Infinity, z1 = -Infinity;
  for (let i = 0; i < P.length; i += 3) {
    const x = P[i]!, y = P[i + 1]!, z = P[i + 2]!;
    if (x < x0) x0 = x; if (x > x1) x1 = x; if (y < y0) y0 = y; if (y > y1) y1 = y; if (z < z0) z0 = z; if (z > z1) z1 = z;
  }
  return Math.hypot(x1 - x0, y1 - y0, z1 - z0);
}
