/**
 * The face loop of a pressure-only force total (no viscous part asked or found) on point pressure over faces
 * that are all triangles (every boundary face of a tetrahedral mesh): the triangle rule, additions and order of
 * the general loop of `forces.ts`, with no traction work, no fan, and the corner pressures read in place from
 * the pieces' point arrays (`SurfaceLoads.pointPressure`) instead of a gathered per-corner array. Each corner
 * value is computed by the expression the gather uses, `scale × (p − shift)`, so force, moment, wetted area and
 * Σ|dF| (`ForceResult.grossForce`) are the general loop's bits (tests/surface/pressureOnlyForces.test.ts).
 *
 * Why a loop of its own, repeating the general loop's triangle lines: a file's force total runs once, almost all
 * of it before the engine has optimised the loop, and the unoptimised loop boxes every double it makes (the
 * collections of that garbage were most of the stage); this loop runs about half the code per face and skips
 * the gather's pass over every corner. A helper shared by both loops would cost the unoptimised run a call and
 * boxed results per triangle. Other surfaces (quads, polygons) take the general loop.
 *
 * Units: force in pressure unit × length unit², moment × length unit, area in length unit².
 */
import type { Dataset } from '../model/dataset.ts';
import type { BoundaryFaces } from './boundaryFaces.ts';
import type { PointPressure } from './surfaceLoads.ts';

/** Faces per call of `pressureTriangles` (see `integrate` in forces.ts for why the loop runs in calls). */
const CHUNK = 64;

/**
 * Integrates the point pressure `pp` over the triangles `selection` (faces of three nodes only) into `acc[0..5]`
 * (pressure force, moment about `ref`), `acc[12]` (Σ|A_f|) and `acc[13]` (Σ|dF|); `acc[6..11]` (viscous) are left 0.
 */
export function integratePressureTriangles(d: Dataset, faces: BoundaryFaces, selection: Int32Array, pp: PointPressure,
  ref: readonly number[], acc: Float64Array): void {
  acc.fill(0);
  const n = selection.length;
  for (let k = 0; k < n; k += CHUNK) pressureTriangles(d, faces, selection, pp, ref, acc, k, Math.min(n, k + CHUNK));
}

/** The triangles k0 … k1 − 1 of the selection, added to the running sums in `acc`. */
function pressureTriangles(d: Dataset, faces: BoundaryFaces, sel: Int32Array, pp: PointPressure, ref: readonly number[],
  acc: Float64Array, k0: number, k1: number): void {
  const rx = ref[0]!, ry = ref[1]!, rz = ref[2]!, scale = pp.scale, shift = pp.shift, byPiece = pp.byPiece;
  let fpx = acc[0]!, fpy = acc[1]!, fpz = acc[2]!, mpx = acc[3]!, mpy = acc[4]!, mpz = acc[5]!, wetted = acc[12]!, gross = acc[13]!;
  const fo = faces.offsets, nodes = faces.nodes, fp = faces.piece, pieces = d.pieces, av = faces.areaVector;
  for (let k = k0; k < k1; k++) {
    const f = sel[k]!, a = fo[f]!, piece = fp[f]!;
    const pts = pieces[piece]!.points, P = byPiece[piece]!;
    const avx = av[3 * f]!, avy = av[3 * f + 1]!, avz = av[3 * f + 2]!;
    wetted += Math.sqrt(avx * avx + avy * avy + avz * avz);
    const v0 = nodes[a]!, v1 = nodes[a + 1]!, v2 = nodes[a + 2]!, q0 = 3 * v0, q1 = 3 * v1, q2 = 3 * v2;
    const x0 = pts[q0]!, y0 = pts[q0 + 1]!, z0 = pts[q0 + 2]!;
    const x1 = pts[q1]!, y1 = pts[q1 + 1]!, z1 = pts[q1 + 2]!, x2 = pts[q2]!, y2 = pts[q2 + 1]!, z2 = pts[q2 + 2]!;
    const p0 = scale * (P[v0]! - shift), p1 = scale * (P[v1]! - shift), p2 = scale * (P[v2]! - shift);
    const ux = x1 - x0, uy = y1 - y0, uz = z1 - z0, vx = x2 - x0, vy = y2 - y0, vz = z2 - z0;
    const sx = 0.5 * (uy * vz - uz * vy), sy = 0.5 * (uz * vx - ux * vz), sz = 0.5 * (ux * vy - uy * vx);
    const pm = (p0 + p1 + p2) / 3;
    fpx += pm * sx; fpy += pm * sy; fpz += pm * sz;
    gross += Math.abs(pm) * Math.sqrt(sx * sx + sy * sy + sz * sz);
    const m0x = 0.5 * (x0 + x1) - rx, m0y = 0.5 * (y0 + y1) - ry, m0z = 0.5 * (z0 + z1) - rz, pa = 0.5 * (p0 + p1);
    const m1x = 0.5 * (x1 + x2) - rx, m1y = 0.5 * (y1 + y2) - ry, m1z = 0.5 * (z1 + z2) - rz, pb = 0.5 * (p1 + p2);
    const m2x = 0.5 * (x2 + x0) - rx, m2y = 0.5 * (y2 + y0) - ry, m2z = 0.5 * (z2 + z0) - rz, pc = 0.5 * (p2 + p0);
    const wx = (m0x * pa + m1x * pb + m2x * pc) / 3, wy = (m0y * pa + m1y * pb + m2y * pc) / 3, wz = (m0z * pa + m1z * pb + m2z * pc) / 3;
    mpx += wy * sz - wz * sy; mpy += wz * sx - wx * sz; mpz += wx * sy - wy * sx;
  }
  acc[0] = fpx; acc[1] = fpy; acc[2] = fpz; acc[3] = mpx; acc[4] = mpy; acc[5] = mpz; acc[12] = wetted; acc[13] = gross;
}
