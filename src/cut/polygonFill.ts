/**
 * Triangulation of one planar polygon given as a loop of points, wound counter-clockwise about a unit
 * normal n. Convex loops (every cut of a convex cell) get a fan from their first vertex; other loops (cuts of
 * non-convex polyhedra, warped cells) are ear-clipped, which handles any simple polygon. Works on scratch
 * arrays passed in; allocates nothing.
 */

/** Relative tolerance on the turn of a corner below which it counts as straight (not reflex). */
const STRAIGHT = 1e-12;

/**
 * Writes triangles of the loop `loop[0..m-1]` (indices into xs/ys/zs) into `tri` as triples of loop
 * *positions* (0..m−1), wound like the loop; returns the triangle count (m − 2 for a simple polygon).
 * `tri` must hold 3m entries; `work` (an Int32Array of at least m entries) is scratch.
 */
export function fillPolygon(xs: Float64Array, ys: Float64Array, zs: Float64Array, loop: Int32Array, m: number,
  nx: number, ny: number, nz: number, tri: Int32Array, work: Int32Array): number {
  if (m < 3) return 0;
  if (m === 3 || isConvex(xs, ys, zs, loop, m, nx, ny, nz)) {
    for (let i = 1; i < m - 1; i++) { tri[3 * (i - 1)] = 0; tri[3 * (i - 1) + 1] = i; tri[3 * (i - 1) + 2] = i + 1; }
    return m - 2;
  }
  return earClip(xs, ys, zs, loop, m, nx, ny, nz, tri, work);
}

/** Turn of corner b (between a→b and b→c) about n: positive for a left (convex) turn. */
function turn(xs: Float64Array, ys: Float64Array, zs: Float64Array, a: number, b: number, c: number, nx: number, ny: number, nz: number): number {
  const ux = xs[b]! - xs[a]!, uy = ys[b]! - ys[a]!, uz = zs[b]! - zs[a]!;
  const vx = xs[c]! - xs[b]!, vy = ys[c]! - ys[b]!, vz = zs[c]! - zs[b]!;
  return nx * (uy * vz - uz * vy) + ny * (uz * vx - ux * vz) + nz * (ux * vy - uy * vx);
}

function isConvex(xs: Float64Array, ys: Float64Array, zs: Float64Array, loop: Int32Array, m: number, nx: number, ny: number, nz: number): boolean {
  for (let i = 0; i < m; i++) {
    const a = loop[i === 0 ? m - 1 : i - 1]!, b = loop[i]!, c = loop[i + 1 === m ? 0 : i + 1]!;
    const t = turn(xs, ys, zs, a, b, c, nx, ny, nz);
    if (t < 0) {
      const la = Math.hypot(xs[b]! - xs[a]!, ys[b]! - ys[a]!, zs[b]! - zs[a]!);
      const lc = Math.hypot(xs[c]! - xs[b]!, ys[c]! - ys[b]!, zs[c]! - zs[b]!);
      if (t < -STRAIGHT * la * lc) return false;
    }
  }
  return true;
}

/** Whether point p lies inside or on triangle (a, b, c) wound counter-clockwise about n. */
function inTriangle(xs: Float64Array, ys: Float64Array, zs: Float64Array, p: number, a: number, b: number, c: number,
  nx: number, ny: number, nz: number): boolean {
  return turn(xs, ys, zs, a, b, p, nx, ny, nz) >= 0 && turn(xs, ys, zs, b, c, p, nx, ny, nz) >= 0 && turn(xs, ys, zs, c, a, p, nx, ny, nz) >= 0;
}

/** Ear clipping, O(m²) per ear; m is a handful of vertices for cut polygons. */
function earClip(xs: Float64Array, ys: Float64Array, zs: Float64Array, loop: Int32Array, m: number,
  nx: number, ny: number, nz: number, tri: Int32Array, work: Int32Array): number {
  for (let i = 0; i < m; i++) work[i] = i;
  let left = m, nt = 0, guard = 0;
  let i = 0;
  while (left > 3) {
    const ip = (i + left - 1) % left, inx = (i + 1) % left;
    const pa = work[ip]!, pb = work[i]!, pc = work[inx]!;
    const a = loop[pa]!, b = loop[pb]!, c = loop[pc]!;
    let ear = turn(xs, ys, zs, a, b, c, nx, ny, nz) > 0;
    if (ear) {
      for (let j = 0; j < left; j++) {
        const q = work[j]!;
        if (q === pa || q === pb || q === pc) continue;
        const pq = loop[q]!;
        // A vertex at the same position as a corner (a pinch) does not block the ear.
        if ((xs[pq] === xs[a] && ys[pq] === ys[a] && zs[pq] === zs[a]) || (xs[pq] === xs[c] && ys[pq] === ys[c] && zs[pq] === zs[c])) continue;
        if (inTriangle(xs, ys, zs, pq, a, b, c, nx, ny, nz)) { ear = false; break; }
      }
    }
    if (ear || guard > left) {
      // No ear found in a whole round means a degenerate loop: clip anyway so the loop always finishes.
      tri[3 * nt] = pa; tri[3 * nt + 1] = pb; tri[3 * nt + 2] = pc; nt++;
      for (let j = i; j < left - 1; j++) work[j] = work[j + 1]!;
      left--;
      guard = 0;
      if (i >= left) i = 0;
    } else {
      i = (i + 1) % left;
      guard++;
    }
  }
  tri[3 * nt] = work[0]!; tri[3 * nt + 1] = work[1]!; tri[3 * nt + 2] = work[2]!;
  return nt + 1;
}
