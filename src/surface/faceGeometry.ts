/**
 * Geometry of one polygonal face given as node ids into an xyz-interleaved point array.
 *
 * Every face with more than three nodes is read as a fan of triangles around its vertex average `c`
 * (triangle i = c, node i, node i+1), the same split the force integrals and the cell gradients use, so
 * area, centroid and integrals all describe one triangulated surface. A triangle is used as it is.
 * Area vectors follow the right-hand rule on the node order; magnitude = area (length unit²).
 */

/**
 * Writes the area vector of the face into `area[3at..3at+2]` and its centroid into `centroid[3at..3at+2]`.
 * The centroid is the fan triangles' centroids weighted by their area projected on the face's mean normal
 * (the exact centroid of a planar polygon); it falls back to the vertex average for a zero-area face.
 */
export function faceAreaCentroid(
  points: Float64Array, nodes: ArrayLike<number>, start: number, n: number,
  area: Float64Array, centroid: Float64Array, at: number,
): void {
  const o = 3 * at;
  if (n === 3) {
    const a = 3 * nodes[start]!, b = 3 * nodes[start + 1]!, c = 3 * nodes[start + 2]!;
    const ax = points[a]!, ay = points[a + 1]!, az = points[a + 2]!;
    const ux = points[b]! - ax, uy = points[b + 1]! - ay, uz = points[b + 2]! - az;
    const vx = points[c]! - ax, vy = points[c + 1]! - ay, vz = points[c + 2]! - az;
    area[o] = 0.5 * (uy * vz - uz * vy); area[o + 1] = 0.5 * (uz * vx - ux * vz); area[o + 2] = 0.5 * (ux * vy - uy * vx);
    centroid[o] = ax + (ux + vx) / 3; centroid[o + 1] = ay + (uy + vy) / 3; centroid[o + 2] = az + (uz + vz) / 3;
    return;
  }
  let cx = 0, cy = 0, cz = 0;
  for (let j = 0; j < n; j++) {
    const p = 3 * nodes[start + j]!;
    cx += points[p]!; cy += points[p + 1]!; cz += points[p + 2]!;
  }
  cx /= n; cy /= n; cz /= n;
  let sx = 0, sy = 0, sz = 0;
  for (let j = 0; j < n; j++) {
    const p = 3 * nodes[start + j]!, q = 3 * nodes[start + (j + 1 === n ? 0 : j + 1)]!;
    const ux = points[p]! - cx, uy = points[p + 1]! - cy, uz = points[p + 2]! - cz;
    const vx = points[q]! - cx, vy = points[q + 1]! - cy, vz = points[q + 2]! - cz;
    sx += uy * vz - uz * vy; sy += uz * vx - ux * vz; sz += ux * vy - uy * vx;
  }
  area[o] = 0.5 * sx; area[o + 1] = 0.5 * sy; area[o + 2] = 0.5 * sz;
  // Centroid: Σ w_t (c + p_i + p_{i+1})/3 / Σ w_t with w_t = (triangle area vector)·(mean normal).
  let wsum = 0, mx = 0, my = 0, mz = 0;
  for (let j = 0; j < n; j++) {
    const p = 3 * nodes[start + j]!, q = 3 * nodes[start + (j + 1 === n ? 0 : j + 1)]!;
    const ux = points[p]! - cx, uy = points[p + 1]! - cy, uz = points[p + 2]! - cz;
    const vx = points[q]! - cx, vy = points[q + 1]! - cy, vz = points[q + 2]! - cz;
    const w = (uy * vz - uz * vy) * sx + (uz * vx - ux * vz) * sy + (ux * vy - uy * vx) * sz;
    wsum += w;
    mx += w * (ux + vx); my += w * (uy + vy); mz += w * (uz + vz);
  }
  if (wsum > 0) { cx += mx / (3 * wsum); cy += my / (3 * wsum); cz += mz / (3 * wsum); }
  centroid[o] = cx; centroid[o + 1] = cy; centroid[o + 2] = cz;
}

/** Vertex average of the nodes `ids[start .. start+n-1]`, written to `out[0..2]`. */
export function vertexAverage(points: Float64Array, ids: ArrayLike<number>, start: number, n: number, out: Float64Array): void {
  let x = 0, y = 0, z = 0;
  for (let j = 0; j < n; j++) {
    const p = 3 * ids[start + j]!;
    x += points[p]!; y += points[p + 1]!; z += points[p + 2]!;
  }
  out[0] = x / n; out[1] = y / n; out[2] = z / n;
}
