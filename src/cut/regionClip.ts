/**
 * Parts of a planar triangle set inside a rectangle or a disk drawn in its plane, clipped exactly.
 *
 * Rectangle: each triangle is clipped against the four sides (Sutherland–Hodgman); the convex remainder is
 * fanned into triangles whose vertices carry barycentric coordinates of the source triangle, so point fields
 * stay the same linear functions and every integral of `integrals.ts` stays exact.
 *
 * Disk: each triangle ∩ disk is a convex region bounded by straight pieces and circular arcs. It is split
 * into its chord polygon (the polygon through its boundary points — triangles as above, exact) and, for each
 * arc, the circular segment between the arc and its chord. A segment is not a polygon: it goes to the
 * integrator as quadrature points (`circularSegmentRule`, exact to rounding for the polynomial integrands)
 * carrying the source triangle's linear fields. So the area of a disk region is πR² to rounding when the
 * disk lies inside the cut — no polygonal approximation of the circle.
 *
 * Coordinates in the file's length unit; the plane's frame (e1, e2, n) is right-handed.
 */
import { circularSegmentRule } from './quadrature.ts';
import type { ArcCloud } from './integrals.ts';
import { planeAxes, triangleCount, unitVector, type SurfaceField, type TriangleSet, type Vec3 } from './triangleSet.ts';

/** Builds a triangle set from pieces of a source set's triangles (barycentric vertices). */
class ClipBuilder {
  private pos: number[] = [];
  private idx: number[] = [];
  private parent: number[] = [];
  private pvals: number[][];
  private readonly pointFields: SurfaceField[];
  constructor(private readonly src: TriangleSet) {
    this.pointFields = src.fields.filter((f) => f.association === 'point');
    this.pvals = this.pointFields.map(() => []);
  }

  vertex(t: number, l0: number, l1: number, l2: number): number {
    const I = this.src.indices, P = this.src.positions;
    const a = I[3 * t]!, b = I[3 * t + 1]!, c = I[3 * t + 2]!;
    for (let k = 0; k < 3; k++) this.pos.push(l0 * P[3 * a + k]! + l1 * P[3 * b + k]! + l2 * P[3 * c + k]!);
    this.pointFields.forEach((f, i) => {
      const nc = f.components, v = f.values, out = this.pvals[i]!;
      for (let k = 0; k < nc; k++) out.push(l0 * v[a * nc + k]! + l1 * v[b * nc + k]! + l2 * v[c * nc + k]!);
    });
    return this.pos.length / 3 - 1;
  }

  triangle(a: number, b: number, c: number, t: number): void { this.idx.push(a, b, c); this.parent.push(t); }

  /** Copies a whole source triangle. */
  copy(t: number): void {
    const a = this.vertex(t, 1, 0, 0), b = this.vertex(t, 0, 1, 0), c = this.vertex(t, 0, 0, 1);
    this.triangle(a, b, c, t);
  }

  finish(): TriangleSet {
    const sc = this.src.sourceCell;
    let pi = 0;
    const fields = this.src.fields.map((f) => {
      if (f.association === 'point') return { ...f, values: Float64Array.from(this.pvals[pi++]!) };
      const nc = f.components, out = new Float64Array(this.parent.length * nc);
      this.parent.forEach((t, i) => { for (let k = 0; k < nc; k++) out[i * nc + k] = f.values[t * nc + k]!; });
      return { ...f, values: out };
    });
    return {
      positions: Float64Array.from(this.pos), indices: Uint32Array.from(this.idx),
      sourceCell: Int32Array.from(this.parent, (t) => sc[t]!), fields,
    };
  }
}

/** In-plane frame: 2D coordinates (u, v) of each vertex relative to `centre`, and the triangles' orientation in it. */
function frame(set: TriangleSet, centre: Vec3, e1: Vec3, e2: Vec3): Float64Array {
  const P = set.positions, n = P.length / 3, uv = new Float64Array(2 * n);
  for (let v = 0; v < n; v++) {
    const x = P[3 * v]! - centre[0], y = P[3 * v + 1]! - centre[1], z = P[3 * v + 2]! - centre[2];
    uv[2 * v] = x * e1[0] + y * e1[1] + z * e1[2];
    uv[2 * v + 1] = x * e2[0] + y * e2[1] + z * e2[2];
  }
  return uv;
}

// Polygon scratch for clipping: u, v and barycentrics per vertex (≤ 8 vertices after four half-planes).
const polyA = new Float64Array(5 * 16), polyB = new Float64Array(5 * 16);

/**
 * The part of a planar set (unit normal `normal`) inside the rectangle centred at `centre` with side axis
 * `axis` (projected into the plane) and half-sizes `half` = [along axis, along normal × axis].
 */
export function clipRectangle(set: TriangleSet, normal: Vec3, centre: Vec3, axis: Vec3, half: readonly [number, number]): TriangleSet {
  const n = unitVector(normal, 'rectangle region: normal');
  const dot = axis[0] * n[0] + axis[1] * n[1] + axis[2] * n[2];
  const e1 = unitVector([axis[0] - dot * n[0], axis[1] - dot * n[1], axis[2] - dot * n[2]], 'rectangle region: axis (in the plane)');
  const e2: Vec3 = [n[1] * e1[2] - n[2] * e1[1], n[2] * e1[0] - n[0] * e1[2], n[0] * e1[1] - n[1] * e1[0]];
  if (!(half[0] > 0 && half[1] > 0)) throw new Error(`rectangle region: half-sizes must be positive, got ${half.join(', ')}`);
  const uv = frame(set, centre, e1, e2), I = set.indices, nt = triangleCount(set), out = new ClipBuilder(set);
  const [h1, h2] = half;
  for (let t = 0; t < nt; t++) {
    let m = 3, src = polyA, dst = polyB;
    for (let j = 0; j < 3; j++) {
      const v = I[3 * t + j]!;
      src[5 * j] = uv[2 * v]!; src[5 * j + 1] = uv[2 * v + 1]!;
      src[5 * j + 2] = j === 0 ? 1 : 0; src[5 * j + 3] = j === 1 ? 1 : 0; src[5 * j + 4] = j === 2 ? 1 : 0;
    }
    let inside = true;
    for (let j = 0; j < 3; j++) if (Math.abs(src[5 * j]!) > h1 || Math.abs(src[5 * j + 1]!) > h2) inside = false;
    if (inside) { out.copy(t); continue; }
    // Half-planes s·coord ≤ h for (coord, s, h) = (u, +1, h1), (u, −1, h1), (v, +1, h2), (v, −1, h2).
    for (let side = 0; side < 4 && m > 0; side++) {
      const k = side < 2 ? 0 : 1, s = side % 2 === 0 ? 1 : -1, h = side < 2 ? h1 : h2;
      let mo = 0;
      for (let j = 0; j < m; j++) {
        const jn = (j + 1) % m;
        const fa = s * src[5 * j + k]! - h, fb = s * src[5 * jn + k]! - h;
        if (fa <= 0) { for (let q = 0; q < 5; q++) dst[5 * mo + q] = src[5 * j + q]!; mo++; }
        if ((fa <= 0) !== (fb <= 0)) {
          const r = fa / (fa - fb);
          for (let q = 0; q < 5; q++) dst[5 * mo + q] = src[5 * j + q]! + r * (src[5 * jn + q]! - src[5 * j + q]!);
          mo++;
        }
      }
      const tmp = src; src = dst; dst = tmp; m = mo;
    }
    if (m < 3) continue;
    const first = out.vertex(t, src[2]!, src[3]!, src[4]!);
    let prev = out.vertex(t, src[7]!, src[8]!, src[9]!);
    for (let j = 2; j < m; j++) {
      const cur = out.vertex(t, src[5 * j + 2]!, src[5 * j + 3]!, src[5 * j + 4]!);
      out.triangle(first, prev, cur, t);
      prev = cur;
    }
  }
  return out.finish();
}

/** A disk region: straight pieces as triangles, arc segments as quadrature points. */
export interface DiskClip {
  set: TriangleSet;
  arcs: ArcCloud;
}

/**
 * The part of a planar set (unit normal `normal`, triangles wound counter-clockwise about it) inside the
 * disk of `radius` around `centre` (projected onto each triangle's plane along the normal).
 */
export function clipDisk(set: TriangleSet, normal: Vec3, centre: Vec3, radius: number): DiskClip {
  const n = unitVector(normal, 'disk region: normal');
  if (!(radius > 0 && Number.isFinite(radius))) throw new Error(`disk region: radius must be positive, got ${radius}`);
  const [e1, e2] = planeAxes(n);
  const uv = frame(set, centre, e1, e2), I = set.indices, nt = triangleCount(set), out = new ClipBuilder(set);
  const R = radius, R2 = R * R;
  const arcPos: number[] = [], arcW: number[] = [];
  const arcVals: number[][] = set.fields.map(() => []);
  const rule = { st: new Float64Array(0), w: new Float64Array(0) };
  // Boundary events of one triangle: u, v, barycentrics (5 per event), at most 3 vertices + 6 crossings.
  const ev = new Float64Array(5 * 9);
  const keep = new Int32Array(9), arcAfter = new Uint8Array(9);
  for (let t = 0; t < nt; t++) {
    const ia = I[3 * t]!, ib = I[3 * t + 1]!, ic = I[3 * t + 2]!;
    const ua = uv[2 * ia]!, va = uv[2 * ia + 1]!, ub = uv[2 * ib]!, vb = uv[2 * ib + 1]!, uc = uv[2 * ic]!, vc = uv[2 * ic + 1]!;
    const da = ua * ua + va * va, db = ub * ub + vb * vb, dc = uc * uc + vc * vc;
    if (da <= R2 && db <= R2 && dc <= R2) { out.copy(t); continue; }
    let ne = 0;
    for (let j = 0; j < 3; j++) {
      const p = j === 0 ? [ua, va] : j === 1 ? [ub, vb] : [uc, vc], q = j === 0 ? [ub, vb] : j === 1 ? [uc, vc] : [ua, va];
      const jn = (j + 1) % 3;
      ev[5 * ne] = p[0]!; ev[5 * ne + 1] = p[1]!; ev[5 * ne + 2] = 0; ev[5 * ne + 3] = 0; ev[5 * ne + 4] = 0; ev[5 * ne + 2 + j] = 1; ne++;
      // |p + s(q − p)|² = R²: a s² + 2 b s + c = 0.
      const dx = q[0]! - p[0]!, dy = q[1]! - p[1]!;
      const a = dx * dx + dy * dy, b = p[0]! * dx + p[1]! * dy, c = p[0]! * p[0]! + p[1]! * p[1]! - R2;
      const disc = b * b - a * c;
      if (a === 0 || disc <= 0) continue;
      const sq = Math.sqrt(disc);
      // Stable roots, in increasing order.
      const r1 = b > 0 ? c / (-b - sq) : (-b + sq) / a, r2 = b > 0 ? (-b - sq) / a : c / (-b + sq);
      for (const s of r1 < r2 ? [r1, r2] : [r2, r1]) {
        if (!(s > 0 && s < 1)) continue;
        ev[5 * ne] = p[0]! + s * dx; ev[5 * ne + 1] = p[1]! + s * dy;
        ev[5 * ne + 2] = 0; ev[5 * ne + 3] = 0; ev[5 * ne + 4] = 0; ev[5 * ne + 2 + j] = 1 - s; ev[5 * ne + 2 + jn] = s;
        ne++;
      }
    }
    // Keep the events on or inside the circle; mark where the boundary leaves the disk after a kept event.
    let nk = 0;
    for (let e = 0; e < ne; e++) {
      const u = ev[5 * e]!, v = ev[5 * e + 1]!;
      if (u * u + v * v > R2 * (1 + 1e-12)) continue;
      const en = (e + 1) % ne, mu = 0.5 * (u + ev[5 * en]!), mv = 0.5 * (v + ev[5 * en + 1]!);
      keep[nk] = e; arcAfter[nk] = mu * mu + mv * mv > R2 ? 1 : 0; nk++;
    }
    if (nk === 0) {
      // No boundary point inside: the disk is either wholly inside the triangle or misses it.
      if (pointInTriangle(0, 0, ua, va, ub, vb, uc, vc)) addSegment(t, Math.PI, 1, 0, 0, 1);
      continue;
    }
    // A single point on the circle is a touch of zero area.
    if (nk === 1) continue;
    if (nk >= 3) {
      const first = out.vertex(t, ev[5 * keep[0]! + 2]!, ev[5 * keep[0]! + 3]!, ev[5 * keep[0]! + 4]!);
      let prev = out.vertex(t, ev[5 * keep[1]! + 2]!, ev[5 * keep[1]! + 3]!, ev[5 * keep[1]! + 4]!);
      for (let j = 2; j < nk; j++) {
        const e = keep[j]!, cur = out.vertex(t, ev[5 * e + 2]!, ev[5 * e + 3]!, ev[5 * e + 4]!);
        out.triangle(first, prev, cur, t);
        prev = cur;
      }
    }
    for (let j = 0; j < nk; j++) {
      if (!arcAfter[j]) continue;
      const x = keep[j]!, e = keep[(j + 1) % nk]!;
      const tx = Math.atan2(ev[5 * x + 1]!, ev[5 * x]!);
      let span = Math.atan2(ev[5 * e + 1]!, ev[5 * e]!) - tx;
      while (span <= 0) span += 2 * Math.PI;
      const mid = tx + 0.5 * span;
      addSegment(t, 0.5 * span, Math.cos(mid), Math.sin(mid), -Math.sin(mid), Math.cos(mid));
    }
  }

  /** Quadrature points of the segment of half-angle `half` about direction (nu, nv) (t along (tu, tv)), with fields of triangle t. */
  function addSegment(t: number, half: number, nu: number, nv: number, tu: number, tv: number): void {
    const np = circularSegmentRule(R, half, rule, 0);
    const ia = I[3 * t]!, ib = I[3 * t + 1]!, ic = I[3 * t + 2]!;
    const ua = uv[2 * ia]!, va = uv[2 * ia + 1]!;
    const x1 = uv[2 * ib]! - ua, y1 = uv[2 * ib + 1]! - va, x2 = uv[2 * ic]! - ua, y2 = uv[2 * ic + 1]! - va;
    const det = x1 * y2 - x2 * y1;
    for (let i = 0; i < np; i++) {
      const s = rule.st[2 * i]!, w = rule.st[2 * i + 1]!;
      const u = s * nu + w * tu, v = s * nv + w * tv;
      arcPos.push(centre[0] + u * e1[0] + v * e2[0], centre[1] + u * e1[1] + v * e2[1], centre[2] + u * e1[2] + v * e2[2]);
      arcW.push(rule.w[i]!);
      const l1 = ((u - ua) * y2 - x2 * (v - va)) / det, l2 = (x1 * (v - va) - (u - ua) * y1) / det, l0 = 1 - l1 - l2;
      set.fields.forEach((f, k) => {
        const nc = f.components, vals = f.values, o = arcVals[k]!;
        for (let c = 0; c < nc; c++) {
          o.push(f.association === 'cell' ? vals[t * nc + c]! : l0 * vals[ia * nc + c]! + l1 * vals[ib * nc + c]! + l2 * vals[ic * nc + c]!);
        }
      });
    }
  }

  return {
    set: out.finish(),
    arcs: { positions: Float64Array.from(arcPos), weights: Float64Array.from(arcW), normal: n, values: arcVals.map((a) => Float64Array.from(a)) },
  };
}

function pointInTriangle(px: number, py: number, ax: number, ay: number, bx: number, by: number, cx: number, cy: number): boolean {
  const d1 = (bx - ax) * (py - ay) - (by - ay) * (px - ax);
  const d2 = (cx - bx) * (py - by) - (cy - by) * (px - bx);
  const d3 = (ax - cx) * (py - cy) - (ay - cy) * (px - cx);
  return (d1 >= 0 && d2 >= 0 && d3 >= 0) || (d1 <= 0 && d2 <= 0 && d3 <= 0);
}
