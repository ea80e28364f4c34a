/**
 * A small software rasteriser for report pictures where there is no GPU or browser (the command line):
 * a perspective camera framed like the viewer's (30° field of view, fitted to a box), z-buffered
 * triangles coloured per vertex through a colour table (Gouraud: the value is interpolated, then mapped)
 * and shaded flat by a head light, translucent triangles blended over the opaque ones, thick line
 * segments and dots on top. 2 × 2 supersampling smooths the edges. Output: RGBA bytes, top row first.
 *
 * Layout of a layer's triangles: non-indexed, vertex v of triangle t at `positions[9t + 3v …]` (world
 * units), its value at `values[3t + v]`.
 */

export type Vec3 = readonly [number, number, number];

/** A pinhole camera. `fovY` in degrees. */
export interface Camera {
  eye: Vec3;
  target: Vec3;
  up: Vec3;
  fovY: number;
  width: number;
  height: number;
}

/**
 * The camera looking from direction `dir` (eye side) at the box's centre, backed off until every corner of
 * the box lies in the view with `margin` to spare (1.2: a fifth of the frame left for pins).
 */
export function fitCamera(bounds: readonly number[], width: number, height: number, dir: Vec3 = [1, -1, 1], up: Vec3 = [0, 0, 1], fovY = 30, margin = 1.2): Camera {
  const c: Vec3 = [(bounds[0]! + bounds[1]!) / 2, (bounds[2]! + bounds[3]!) / 2, (bounds[4]! + bounds[5]!) / 2];
  const f = norm([-dir[0], -dir[1], -dir[2]]);
  let r = cross(f, up);
  if (Math.hypot(...r) < 1e-9) r = cross(f, Math.abs(f[2]) < 0.9 ? [0, 0, 1] : [0, 1, 0]);
  const right = norm(r), u = cross(right, f);
  const ty = Math.tan((fovY / 2) * Math.PI / 180), tx = ty * (width / height);
  // a corner at offset o from the centre is in view when |o·right| ≤ tx (d + o·f) and |o·up| ≤ ty (d + o·f)
  let dist = 1e-12;
  for (const x of [bounds[0]!, bounds[1]!]) for (const y of [bounds[2]!, bounds[3]!]) for (const z of [bounds[4]!, bounds[5]!]) {
    const o = [x - c[0], y - c[1], z - c[2]];
    const of = o[0]! * f[0] + o[1]! * f[1] + o[2]! * f[2];
    const or = Math.abs(o[0]! * right[0] + o[1]! * right[1] + o[2]! * right[2]) * margin;
    const ou = Math.abs(o[0]! * u[0] + o[1]! * u[1] + o[2]! * u[2]) * margin;
    dist = Math.max(dist, or / tx - of, ou / ty - of);
  }
  return { eye: [c[0] - f[0] * dist, c[1] - f[1] * dist, c[2] - f[2] * dist], target: c, up, fovY, width, height };
}

/** The camera's view basis and projection scale, for projecting many points. */
export interface Projection {
  /** Rows of the view basis: forward, right, up (unit); eye; x and y scales (pixels per unit of tan). */
  readonly m: Float64Array;
  /** Projects a world point to pixels (origin top-left) and its distance along the view axis; `behind` when not in front. */
  project(x: number, y: number, z: number): { x: number; y: number; depth: number; behind: boolean };
}

/** A projection for a camera. */
export function projection(cam: Camera): Projection {
  const f = norm([cam.target[0] - cam.eye[0], cam.target[1] - cam.eye[1], cam.target[2] - cam.eye[2]]);
  let r = cross(f, cam.up);
  if (Math.hypot(...r) < 1e-9) r = cross(f, Math.abs(f[2]) < 0.9 ? [0, 0, 1] : [0, 1, 0]);
  const right = norm(r), u = cross(right, f);
  const k = 1 / Math.tan((cam.fovY / 2) * Math.PI / 180), aspect = cam.width / cam.height;
  const [ex, ey, ez] = cam.eye;
  const m = Float64Array.of(f[0], f[1], f[2], right[0], right[1], right[2], u[0], u[1], u[2], ex, ey, ez,
    (k / aspect) * cam.width / 2, k * cam.height / 2, cam.width / 2, cam.height / 2);
  return {
    m,
    project(x, y, z) {
      const dx = x - ex, dy = y - ey, dz = z - ez;
      const depth = dx * f[0] + dy * f[1] + dz * f[2];
      const sx = dx * right[0] + dy * right[1] + dz * right[2], sy = dx * u[0] + dy * u[1] + dz * u[2];
      const nx = (k / aspect) * sx / depth, ny = k * sy / depth;
      return { x: (nx + 1) / 2 * cam.width, y: (1 - ny) / 2 * cam.height, depth, behind: !(depth > 0) };
    },
  };
}

function norm(v: readonly number[]): [number, number, number] {
  const l = Math.hypot(v[0]!, v[1]!, v[2]!) || 1;
  return [v[0]! / l, v[1]! / l, v[2]! / l];
}
function cross(a: readonly number[], b: readonly number[]): [number, number, number] {
  return [a[1]! * b[2]! - a[2]! * b[1]!, a[2]! * b[0]! - a[0]! * b[2]!, a[0]! * b[1]! - a[1]! * b[0]!];
}

/** Triangles to draw. Without `values` (or where a value is NaN) they take `color`. */
export interface TriangleLayer {
  positions: ArrayLike<number>;
  values?: ArrayLike<number> | null;
  /** RGB 0–255 for triangles without values. Default light grey. */
  color?: readonly [number, number, number];
  /** 1 opaque (default); below 1 blended over the opaque layers without hiding what lies behind. */
  opacity?: number;
}

/** A thick segment or a dot drawn over everything. */
export interface Mark {
  from: Vec3;
  to: Vec3;
  color: readonly [number, number, number];
  /** Pixels. */
  width: number;
}

export interface RasterOptions {
  /** Packed RGB colour table, low end first (e.g. a colour map's `colors`). */
  colors: Uint8Array;
  /** Values mapped to the table's ends. */
  range: readonly [number, number];
  /** Background RGB. Default a light grey-blue like the viewer's. */
  background: readonly [number, number, number];
  /** Supersampling factor per axis. Default 2. */
  supersample: number;
}

const RASTER_DEFAULTS = { background: [245, 246, 248] as const, supersample: 2 };

// module-level scratch, grown when needed
let zbuf = new Float32Array(0);
let cbuf = new Float32Array(0);
let sxyz = new Float64Array(0); // projected vertices: x, y (pixels), depth

/** Projects every vertex of `P` into `sxyz` (depth ≤ 0 marks a vertex not in front of the camera). */
function projectAll(pr: Projection, P: ArrayLike<number>, nv: number): void {
  if (sxyz.length < 3 * nv) sxyz = new Float64Array(3 * nv);
  const m = pr.m;
  const fx = m[0]!, fy = m[1]!, fz = m[2]!, rx = m[3]!, ry = m[4]!, rz = m[5]!, ux = m[6]!, uy = m[7]!, uz = m[8]!;
  const ex = m[9]!, ey = m[10]!, ez = m[11]!, kx = m[12]!, ky = m[13]!, cx = m[14]!, cy = m[15]!;
  for (let v = 0; v < nv; v++) {
    const dx = P[3 * v]! - ex, dy = P[3 * v + 1]! - ey, dz = P[3 * v + 2]! - ez;
    const d = dx * fx + dy * fy + dz * fz;
    sxyz[3 * v] = cx + kx * (dx * rx + dy * ry + dz * rz) / d;
    sxyz[3 * v + 1] = cy - ky * (dx * ux + dy * uy + dz * uz) / d;
    sxyz[3 * v + 2] = d;
  }
}

/** Renders the layers (opaque first, then translucent, then marks) into RGBA bytes of `cam.width × cam.height`. */
export function rasterise(cam: Camera, layers: readonly TriangleLayer[], marks: readonly Mark[], options: Partial<RasterOptions> & Pick<RasterOptions, 'colors' | 'range'>): Uint8Array {
  const ss = Math.max(1, Math.round(options.supersample ?? RASTER_DEFAULTS.supersample));
  const bg = options.background ?? RASTER_DEFAULTS.background;
  const W = cam.width * ss, H = cam.height * ss, n = W * H;
  if (zbuf.length < n) { zbuf = new Float32Array(n); cbuf = new Float32Array(3 * n); }
  zbuf.fill(Infinity, 0, n);
  for (let i = 0; i < n; i++) { cbuf[3 * i] = bg[0]; cbuf[3 * i + 1] = bg[1]; cbuf[3 * i + 2] = bg[2]; }
  const big = { ...cam, width: W, height: H };
  const proj = projection(big);
  const view = norm([cam.target[0] - cam.eye[0], cam.target[1] - cam.eye[1], cam.target[2] - cam.eye[2]]);
  for (const pass of [0, 1]) {
    for (const l of layers) {
      const opacity = l.opacity ?? 1;
      if ((opacity >= 1) !== (pass === 0)) continue;
      drawTriangles(proj, view, l, opacity, W, H, options.colors, options.range);
    }
  }
  for (const m of marks) drawMark(proj, m, W, H, ss);
  const out = new Uint8Array(4 * cam.width * cam.height), inv = 1 / (ss * ss);
  for (let y = 0; y < cam.height; y++) {
    for (let x = 0; x < cam.width; x++) {
      let r = 0, g = 0, b = 0;
      for (let j = 0; j < ss; j++) for (let i = 0; i < ss; i++) {
        const p = 3 * ((y * ss + j) * W + x * ss + i);
        r += cbuf[p]!; g += cbuf[p + 1]!; b += cbuf[p + 2]!;
      }
      const o = 4 * (y * cam.width + x);
      out[o] = Math.round(r * inv); out[o + 1] = Math.round(g * inv); out[o + 2] = Math.round(b * inv); out[o + 3] = 255;
    }
  }
  return out;
}

function drawTriangles(proj: Projection, view: Vec3, l: TriangleLayer, opacity: number, W: number, H: number, table: Uint8Array, range: readonly [number, number]): void {
  const P = l.positions, V = l.values ?? null, nt = Math.floor(P.length / 9);
  const base = l.color ?? [200, 204, 210];
  const lo = range[0], span = range[1] - range[0] || 1, nc = table.length / 3;
  projectAll(proj, P, 3 * nt);
  for (let t = 0; t < nt; t++) {
    const o = 9 * t;
    const ax = sxyz[o]!, ay = sxyz[o + 1]!, ad = sxyz[o + 2]!, bx = sxyz[o + 3]!, by = sxyz[o + 4]!, bd = sxyz[o + 5]!;
    const cx = sxyz[o + 6]!, cy = sxyz[o + 7]!, cd = sxyz[o + 8]!;
    if (!(ad > 0 && bd > 0 && cd > 0)) continue;
    // head light, two-sided: brightness from the angle between the face and the view direction
    const ux = P[o + 3]! - P[o]!, uy = P[o + 4]! - P[o + 1]!, uz = P[o + 5]! - P[o + 2]!;
    const vx = P[o + 6]! - P[o]!, vy = P[o + 7]! - P[o + 1]!, vz = P[o + 8]! - P[o + 2]!;
    const nx = uy * vz - uz * vy, ny = uz * vx - ux * vz, nz = ux * vy - uy * vx;
    const nl = Math.hypot(nx, ny, nz);
    if (!(nl > 0)) continue;
    const shade = 0.45 + 0.55 * Math.abs((nx * view[0] + ny * view[1] + nz * view[2]) / nl);
    const area = (bx - ax) * (cy - ay) - (by - ay) * (cx - ax);
    if (area === 0) continue;
    const x0 = Math.max(0, Math.floor(Math.min(ax, bx, cx))), x1 = Math.min(W - 1, Math.ceil(Math.max(ax, bx, cx)));
    const y0 = Math.max(0, Math.floor(Math.min(ay, by, cy))), y1 = Math.min(H - 1, Math.ceil(Math.max(ay, by, cy)));
    if (x0 > x1 || y0 > y1) continue;
    const va = V ? V[3 * t]! : NaN, vb = V ? V[3 * t + 1]! : NaN, vc = V ? V[3 * t + 2]! : NaN;
    const colored = V !== null && Number.isFinite(va) && Number.isFinite(vb) && Number.isFinite(vc);
    // perspective-correct interpolation: interpolate value/depth and 1/depth in screen space
    const ia = 1 / ad, ib = 1 / bd, ic = 1 / cd;
    const inv = 1 / area;
    for (let y = y0; y <= y1; y++) {
      const py = y + 0.5;
      for (let x = x0; x <= x1; x++) {
        const px = x + 0.5;
        const w0 = ((bx - px) * (cy - py) - (by - py) * (cx - px)) * inv;
        const w1 = ((cx - px) * (ay - py) - (cy - py) * (ax - px)) * inv;
        const w2 = 1 - w0 - w1;
        if (w0 < 0 || w1 < 0 || w2 < 0) continue;
        const iz = w0 * ia + w1 * ib + w2 * ic, z = 1 / iz, p = y * W + x;
        if (z >= zbuf[p]!) continue;
        let r: number, g: number, bl: number;
        if (colored) {
          const v = (w0 * va * ia + w1 * vb * ib + w2 * vc * ic) * z;
          const s = Math.min(1, Math.max(0, (v - lo) / span)) * (nc - 1);
          const i = Math.min(nc - 2, Math.floor(s)), fr = s - i;
          r = table[3 * i]! * (1 - fr) + table[3 * i + 3]! * fr;
          g = table[3 * i + 1]! * (1 - fr) + table[3 * i + 4]! * fr;
          bl = table[3 * i + 2]! * (1 - fr) + table[3 * i + 5]! * fr;
        } else { r = base[0]; g = base[1]; bl = base[2]; }
        r *= shade; g *= shade; bl *= shade;
        const q = 3 * p;
        if (opacity >= 1) {
          zbuf[p] = z;
          cbuf[q] = r; cbuf[q + 1] = g; cbuf[q + 2] = bl;
        } else {
          cbuf[q] = opacity * r + (1 - opacity) * cbuf[q]!;
          cbuf[q + 1] = opacity * g + (1 - opacity) * cbuf[q + 1]!;
          cbuf[q + 2] = opacity * bl + (1 - opacity) * cbuf[q + 2]!;
        }
      }
    }
  }
}

function drawMark(proj: Projection, m: Mark, W: number, H: number, ss: number): void {
  const a = proj.project(...m.from), b = proj.project(...m.to);
  if (a.behind || b.behind) return;
  const r = (m.width * ss) / 2, len = Math.hypot(b.x - a.x, b.y - a.y);
  const x0 = Math.max(0, Math.floor(Math.min(a.x, b.x) - r)), x1 = Math.min(W - 1, Math.ceil(Math.max(a.x, b.x) + r));
  const y0 = Math.max(0, Math.floor(Math.min(a.y, b.y) - r)), y1 = Math.min(H - 1, Math.ceil(Math.max(a.y, b.y) + r));
  for (let y = y0; y <= y1; y++) {
    for (let x = x0; x <= x1; x++) {
      const px = x + 0.5 - a.x, py = y + 0.5 - a.y;
      // distance from the pixel to the segment
      const t = len > 0 ? Math.min(1, Math.max(0, (px * (b.x - a.x) + py * (b.y - a.y)) / (len * len))) : 0;
      const dx = px - t * (b.x - a.x), dy = py - t * (b.y - a.y);
      if (dx * dx + dy * dy > r * r) continue;
      const q = 3 * (y * W + x);
      cbuf[q] = m.color[0]; cbuf[q + 1] = m.color[1]; cbuf[q + 2] = m.color[2];
    }
  }
}
