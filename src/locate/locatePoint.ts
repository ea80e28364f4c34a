/**
 * Point location: the volume cell containing a point, its parametric coordinates and the interpolation
 * weights of the cell's nodes.
 *
 * Per cell type:
 *  - tetra: barycentric coordinates (one 3×3 solve);
 *  - hexahedron, voxel, wedge, pyramid: Newton inversion of the isoparametric map (shapeFunctions.ts),
 *    started at the parametric centre. If Newton meets a singular Jacobian, diverges or does not converge
 *    (strongly distorted cells, points near a pyramid's apex), the cell is split into tetrahedra; the
 *    tetrahedron holding the point gives approximate parametric coordinates (its barycentric mix of the
 *    nodes' parametric positions), and Newton is restarted from there; if it still fails, the
 *    approximation is kept (inside/outside is then decided by the tetra split);
 *  - polyhedron (42) and pentagonal/hexagonal prisms (15, 16): split into tetrahedra around the cell
 *    centre (mean of the cell's points), each face fanned around its own centre (mean of its points;
 *    triangles are used as they are). Weights of a face centre go equally to the face's points and weights
 *    of the cell centre equally to the cell's points, so linear fields are reproduced exactly. Parametric
 *    coordinates are NaN for these cells. Assumes cells star-shaped about their centre;
 *  - 2D, 1D and 0D cells are not volumes: skipped. A dataset with no volume cells cannot locate (throws).
 *
 * Tolerance and tie rule: a cell contains the point when its parametric violation (how far outside the
 * parametric cell the point is, in parametric units, i.e. relative to the cell size) is at most
 * `tolerance`. Among candidate cells the one with the smallest max(violation, 0) wins; ties — a point on
 * a shared face or edge, which every neighbour holds at violation ≤ 0 — go to the lowest global cell id.
 * A point deeper inside a cell than the tolerance ends the search at once (no other cell of a conforming
 * mesh can hold it). Coordinates are in the file's length unit.
 */
import { cellDimension, CellType, FACE_TABLE } from '../model/cellTypes.ts';
import { pieceOfCell } from '../model/dataset.ts';
import type { Piece } from '../model/piece.ts';
import { cellsAtPoint, PAD, type CellTree } from './cellTree.ts';
import { nodeParametric, parametricViolation, shapeDerivatives, shapeFunctions } from './shapeFunctions.ts';

/** Default parametric tolerance (relative to the cell size). */
export const DEFAULT_TOLERANCE = 1e-6;

/** Where a point lies. Reused between calls (create once with `createLocation`). */
export interface Location {
  /** Global cell id (`cellStarts` numbering), or −1 when no volume cell holds the point. */
  cell: number;
  piece: number;
  /** Cell number within its piece. */
  localCell: number;
  /** VTK type of the cell (0 when not found). */
  type: number;
  /** Parametric coordinates (conventions in shapeFunctions.ts); NaN for polyhedra and prisms. */
  r: number;
  s: number;
  t: number;
  /** Parametric distance outside the cell (≤ 0 inside). */
  violation: number;
  /** Interpolation weights: point field value = Σ weights[k] · value(ids[k]), k < count; ids are the piece's point numbers. */
  count: number;
  ids: Int32Array;
  weights: Float64Array;
}

/** A fresh, empty location. */
export function createLocation(): Location {
  return { cell: -1, piece: -1, localCell: -1, type: 0, r: NaN, s: NaN, t: NaN, violation: Infinity, count: 0, ids: new Int32Array(16), weights: new Float64Array(16) };
}

/** Throws unless the dataset has volume cells (point location is undefined on surfaces). */
export function assertLocatable(tree: Pick<CellTree, 'dataset' | 'cellCount' | 'volumeCellCount'>): void {
  if (tree.volumeCellCount === 0) {
    throw new Error(`locate: "${tree.dataset.source}" holds no volume cells (${tree.cellCount} surface/line/vertex cells); point location is defined only inside 3D cells`);
  }
}

/** Checks a tolerance option at the edge. */
export function checkTolerance(tolerance: number, where: string): void {
  if (!(tolerance >= 0 && tolerance <= PAD)) throw new Error(`${where}: tolerance ${tolerance} is outside 0..${PAD} (parametric, relative to the cell size)`);
}

/**
 * Finds the volume cell holding (x, y, z) and fills `loc`; returns false (loc.cell = −1) when none does.
 * `tolerance`: parametric, relative to the cell size; values above PAD (1e-4, the tree's box padding) are
 * not fully honoured (check them at the edge with `checkTolerance`).
 * `hint`: a global cell id to try first (e.g. the previous sample's cell); it is accepted only when the
 * point lies deeper inside it than the tolerance, so the tie rule is unaffected.
 */
export function locatePoint(tree: CellTree, x: number, y: number, z: number, loc: Location,
  tolerance = DEFAULT_TOLERANCE, hint = -1): boolean {
  assertLocatable(tree);
  const pieces = tree.dataset.pieces, starts = tree.starts;
  loc.cell = -1; loc.piece = -1; loc.localCell = -1; loc.type = 0; loc.count = 0; loc.violation = Infinity;
  loc.r = NaN; loc.s = NaN; loc.t = NaN;
  if (hint >= 0 && hint < tree.cellCount) {
    const k = pieces.length === 1 ? 0 : pieceOfCell(starts, hint);
    const v = evaluateCell(pieces[k]!, hint - starts[k]!, x, y, z);
    if (v < -tolerance) { accept(loc, hint, k, hint - starts[k]!, v); return true; }
  }
  const cands = cellsAtPoint(tree, x, y, z);
  let bestScore = Infinity;
  for (let q = 0; q < cands.length; q++) {
    const g = cands[q]!;
    const k = pieces.length === 1 ? 0 : pieceOfCell(starts, g);
    const p = pieces[k]!, c = g - starts[k]!;
    if (cellDimension(p.cellTypes[c]!) !== 3) continue;
    const v = evaluateCell(p, c, x, y, z);
    const score = v > 0 ? v : 0;
    if (!(score <= tolerance)) continue;
    if (score < bestScore || (score === bestScore && g < loc.cell)) {
      bestScore = score;
      accept(loc, g, k, c, v);
      if (v < -tolerance) break;
    }
  }
  return loc.cell >= 0;
}

/**
 * Evaluates (x, y, z) in the given global cell, whether or not it lies inside, and fills `loc` (weights
 * then extrapolate outside the cell). Returns the parametric violation (Infinity for non-volume or
 * degenerate cells, which leave `loc.cell` at −1).
 */
export function locateInCell(tree: Pick<CellTree, 'dataset' | 'starts'>, g: number, x: number, y: number, z: number, loc: Location): number {
  const k = tree.dataset.pieces.length === 1 ? 0 : pieceOfCell(tree.starts, g);
  const c = g - tree.starts[k]!;
  const v = evaluateCell(tree.dataset.pieces[k]!, c, x, y, z);
  if (v === Infinity) { loc.cell = -1; loc.count = 0; loc.violation = Infinity; return v; }
  accept(loc, g, k, c, v);
  return v;
}

function accept(loc: Location, g: number, k: number, c: number, v: number): void {
  loc.cell = g; loc.piece = k; loc.localCell = c; loc.type = lastType; loc.violation = v;
  loc.r = PC[0]!; loc.s = PC[1]!; loc.t = PC[2]!;
  if (loc.ids.length < wCount) { loc.ids = new Int32Array(2 * wCount); loc.weights = new Float64Array(2 * wCount); }
  for (let i = 0; i < wCount; i++) { loc.ids[i] = wIds[i]!; loc.weights[i] = wVals[i]!; }
  loc.count = wCount;
}

// ---------------------------------------------------------------------------------------------------
// One cell. Results of the last evaluation live in module scratch: PC (r, s, t), wIds/wVals/wCount.

const P = new Float64Array(3 * 8);
const N = new Float64Array(8);
const DN = new Float64Array(24);
const PC = new Float64Array(3);
const LAM = new Float64Array(4);
const BEST_LAM = new Float64Array(4);
const REF = new Float64Array(3);
let wIds = new Int32Array(64);
let wVals = new Float64Array(64);
let wCount = 0;
let lastType = 0;

/** Local node quadruples of the tetra splits used when Newton fails. */
const SPLIT: Readonly<Record<number, Int32Array>> = {
  [CellType.HEXAHEDRON]: Int32Array.of(0, 1, 2, 6, 0, 2, 3, 6, 0, 3, 7, 6, 0, 7, 4, 6, 0, 4, 5, 6, 0, 5, 1, 6),
  [CellType.VOXEL]: Int32Array.of(0, 1, 3, 7, 0, 3, 2, 7, 0, 2, 6, 7, 0, 6, 4, 7, 0, 4, 5, 7, 0, 5, 1, 7),
  [CellType.WEDGE]: Int32Array.of(0, 1, 2, 3, 1, 2, 3, 4, 2, 3, 4, 5),
  [CellType.PYRAMID]: Int32Array.of(0, 1, 2, 4, 0, 2, 3, 4),
};

/**
 * Evaluates whether cell `c` of piece `p` holds (x, y, z): returns the parametric violation (Infinity for
 * a degenerate or non-volume cell) and leaves parametric coordinates and weights in module scratch.
 */
export function evaluateCell(p: Piece, c: number, x: number, y: number, z: number): number {
  const type = p.cellTypes[c]!;
  lastType = type;
  switch (type) {
    case CellType.TETRA: case CellType.HEXAHEDRON: case CellType.VOXEL: case CellType.WEDGE: case CellType.PYRAMID:
      return evaluateIsoparametric(p, c, type, x, y, z);
    case CellType.POLYHEDRON: case CellType.PENTAGONAL_PRISM: case CellType.HEXAGONAL_PRISM:
      return evaluateFaceted(p, c, type, x, y, z);
    default:
      wCount = 0;
      return Infinity;
  }
}

function evaluateIsoparametric(p: Piece, c: number, type: number, x: number, y: number, z: number): number {
  const pts = p.points, conn = p.connectivity, a = p.offsets[c]!, n = p.offsets[c + 1]! - a;
  // Node coordinates relative to the query point: the map's target is then the origin.
  for (let k = 0; k < n; k++) {
    const i = 3 * conn[a + k]!;
    P[3 * k] = pts[i]! - x; P[3 * k + 1] = pts[i + 1]! - y; P[3 * k + 2] = pts[i + 2]! - z;
  }
  let v: number;
  if (type === CellType.TETRA) {
    v = barycentric(P[0]!, P[1]!, P[2]!, P[3]!, P[4]!, P[5]!, P[6]!, P[7]!, P[8]!, P[9]!, P[10]!, P[11]!);
    PC[0] = LAM[1]!; PC[1] = LAM[2]!; PC[2] = LAM[3]!;
  } else {
    const r0 = type === CellType.WEDGE ? 1 / 3 : 0.5, t0 = type === CellType.PYRAMID ? 0.25 : 0.5;
    if (newton(type, n, r0, r0, t0)) {
      v = parametricViolation(type, PC[0]!, PC[1]!, PC[2]!);
    } else {
      v = splitFallback(type);
      if (v === Infinity) { wCount = 0; return v; }
    }
  }
  shapeFunctions(type, PC[0]!, PC[1]!, PC[2]!, N);
  for (let k = 0; k < n; k++) { wIds[k] = conn[a + k]!; wVals[k] = N[k]!; }
  wCount = n;
  return v;
}

/** Newton iteration for Σ N_k(r,s,t) P_k = 0 from (r, s, t); on success leaves the root in PC. */
function newton(type: number, n: number, r: number, s: number, t: number): boolean {
  let scale = 0;
  for (let k = 1; k < n; k++) {
    scale = Math.max(scale, Math.abs(P[3 * k]! - P[0]!), Math.abs(P[3 * k + 1]! - P[1]!), Math.abs(P[3 * k + 2]! - P[2]!));
  }
  const tinyDet = 1e-13 * scale * scale * scale;
  for (let it = 0; it < 30; it++) {
    shapeFunctions(type, r, s, t, N);
    shapeDerivatives(type, r, s, t, DN);
    let fx = 0, fy = 0, fz = 0, j00 = 0, j01 = 0, j02 = 0, j10 = 0, j11 = 0, j12 = 0, j20 = 0, j21 = 0, j22 = 0;
    for (let k = 0; k < n; k++) {
      const px = P[3 * k]!, py = P[3 * k + 1]!, pz = P[3 * k + 2]!, w = N[k]!;
      const dr = DN[3 * k]!, ds = DN[3 * k + 1]!, dt = DN[3 * k + 2]!;
      fx += w * px; fy += w * py; fz += w * pz;
      j00 += dr * px; j01 += ds * px; j02 += dt * px;
      j10 += dr * py; j11 += ds * py; j12 += dt * py;
      j20 += dr * pz; j21 += ds * pz; j22 += dt * pz;
    }
    const c00 = j11 * j22 - j12 * j21, c01 = j12 * j20 - j10 * j22, c02 = j10 * j21 - j11 * j20;
    const det = j00 * c00 + j01 * c01 + j02 * c02;
    if (!(Math.abs(det) > tinyDet)) return false;
    const inv = 1 / det;
    // Δ = J⁻¹ F by the adjugate.
    const dr = inv * (c00 * fx + (j02 * j21 - j01 * j22) * fy + (j01 * j12 - j02 * j11) * fz);
    const ds = inv * (c01 * fx + (j00 * j22 - j02 * j20) * fy + (j02 * j10 - j00 * j12) * fz);
    const dt = inv * (c02 * fx + (j01 * j20 - j00 * j21) * fy + (j00 * j11 - j01 * j10) * fz);
    r -= dr; s -= ds; t -= dt;
    if (!(Math.abs(r) + Math.abs(s) + Math.abs(t) < 1e3)) return false;
    if (Math.abs(dr) + Math.abs(ds) + Math.abs(dt) < 1e-11) { PC[0] = r; PC[1] = s; PC[2] = t; return true; }
  }
  return false;
}

/** Tetra split of an isoparametric cell; returns the violation and leaves parametric coordinates in PC. */
function splitFallback(type: number): number {
  const split = SPLIT[type]!;
  let best = Infinity, bt = -1;
  for (let q = 0; q < split.length; q += 4) {
    const a = 3 * split[q]!, b = 3 * split[q + 1]!, c = 3 * split[q + 2]!, d = 3 * split[q + 3]!;
    const v = barycentric(P[a]!, P[a + 1]!, P[a + 2]!, P[b]!, P[b + 1]!, P[b + 2]!, P[c]!, P[c + 1]!, P[c + 2]!, P[d]!, P[d + 1]!, P[d + 2]!);
    if (v < best) { best = v; bt = q; BEST_LAM.set(LAM); }
  }
  if (bt < 0) return Infinity;
  let r = 0, s = 0, t = 0;
  for (let j = 0; j < 4; j++) {
    nodeParametric(type, split[bt + j]!, REF);
    r += BEST_LAM[j]! * REF[0]!; s += BEST_LAM[j]! * REF[1]!; t += BEST_LAM[j]! * REF[2]!;
  }
  const n = type === CellType.WEDGE ? 6 : type === CellType.PYRAMID ? 5 : 8;
  if (best <= PAD && newton(type, n, r, s, t)) return parametricViolation(type, PC[0]!, PC[1]!, PC[2]!);
  PC[0] = r; PC[1] = s; PC[2] = t;
  return best;
}

/**
 * Barycentric coordinates of the origin in the tetra (a, b, c, d), written to LAM; returns the violation
 * max(−λ) (Infinity for a degenerate tetra).
 */
function barycentric(ax: number, ay: number, az: number, bx: number, by: number, bz: number,
  cx: number, cy: number, cz: number, dx: number, dy: number, dz: number): number {
  const e1x = bx - ax, e1y = by - ay, e1z = bz - az;
  const e2x = cx - ax, e2y = cy - ay, e2z = cz - az;
  const e3x = dx - ax, e3y = dy - ay, e3z = dz - az;
  const nx = e2y * e3z - e2z * e3y, ny = e2z * e3x - e2x * e3z, nz = e2x * e3y - e2y * e3x;
  const det = e1x * nx + e1y * ny + e1z * nz;
  // The product of the edge lengths (Math.hypot with three arguments allocated on every call).
  const size = Math.sqrt((e1x * e1x + e1y * e1y + e1z * e1z) * (e2x * e2x + e2y * e2y + e2z * e2z) * (e3x * e3x + e3y * e3y + e3z * e3z));
  if (!(Math.abs(det) > 1e-14 * size)) return Infinity;
  const inv = 1 / det;
  // Right-hand side: origin − a.
  const fx = -ax, fy = -ay, fz = -az;
  const l1 = (fx * nx + fy * ny + fz * nz) * inv;
  const l2 = (e1x * (fy * e3z - fz * e3y) + e1y * (fz * e3x - fx * e3z) + e1z * (fx * e3y - fy * e3x)) * inv;
  const l3 = (e1x * (e2y * fz - e2z * fy) + e1y * (e2z * fx - e2x * fz) + e1z * (e2x * fy - e2y * fx)) * inv;
  const l0 = 1 - l1 - l2 - l3;
  LAM[0] = l0; LAM[1] = l1; LAM[2] = l2; LAM[3] = l3;
  return Math.max(-l0, -l1, -l2, -l3);
}

// Faces of the cell under evaluation, as piece point ids: face f is fIds[fOff[f] .. fOff[f+1]-1].
let fOff = new Int32Array(64);
let fIds = new Int32Array(256);

/** Collects the faces of a polyhedron or prism into fOff/fIds; returns the face count. */
function collectFaces(p: Piece, c: number, type: number): number {
  let nf = 0, ni = 0;
  if (type === CellType.POLYHEDRON) {
    const pf = p.polyFaces!, f0 = pf.cellFaceStart[c]!, f1 = pf.cellFaceStart[c + 1]!;
    const need = pf.faceOffsets[f1]! - pf.faceOffsets[f0]!;
    if (fOff.length < f1 - f0 + 1) fOff = new Int32Array(2 * (f1 - f0 + 1));
    if (fIds.length < need) fIds = new Int32Array(2 * need);
    fOff[0] = 0;
    for (let f = f0; f < f1; f++) {
      for (let q = pf.faceOffsets[f]!, e = pf.faceOffsets[f + 1]!; q < e; q++) fIds[ni++] = pf.faceConnectivity[q]!;
      fOff[++nf] = ni;
    }
  } else {
    const a = p.offsets[c]!;
    fOff[0] = 0;
    for (let f = FACE_TABLE.start[type]!, e = FACE_TABLE.start[type + 1]!; f < e; f++) {
      for (let q = 0, m = FACE_TABLE.size[f]!; q < m; q++) fIds[ni++] = p.connectivity[a + FACE_TABLE.nodes[FACE_TABLE.first[f]! + q]!]!;
      fOff[++nf] = ni;
    }
  }
  return nf;
}

function evaluateFaceted(p: Piece, c: number, type: number, x: number, y: number, z: number): number {
  const pts = p.points, nf = collectFaces(p, c, type);
  // The cell's points: its connectivity, or (polyhedron written without it) its face stream.
  let cellIds: Int32Array = p.connectivity, ca = p.offsets[c]!, cb = p.offsets[c + 1]!;
  if (ca === cb) { cellIds = fIds; ca = 0; cb = fOff[nf]!; }
  const m = cb - ca;
  let cx = 0, cy = 0, cz = 0;
  for (let q = ca; q < cb; q++) { const i = 3 * cellIds[q]!; cx += pts[i]!; cy += pts[i + 1]!; cz += pts[i + 2]!; }
  cx = cx / m - x; cy = cy / m - y; cz = cz / m - z;
  let best = Infinity, bf = -1, bi = -1, l0 = 0, l1 = 0, l2 = 0, l3 = 0;
  for (let f = 0; f < nf; f++) {
    const s0 = fOff[f]!, k = fOff[f + 1]! - s0;
    if (k === 3) {
      const a = 3 * fIds[s0]!, b = 3 * fIds[s0 + 1]!, d = 3 * fIds[s0 + 2]!;
      const v = barycentric(pts[a]! - x, pts[a + 1]! - y, pts[a + 2]! - z, pts[b]! - x, pts[b + 1]! - y, pts[b + 2]! - z,
        pts[d]! - x, pts[d + 1]! - y, pts[d + 2]! - z, cx, cy, cz);
      if (v < best) { best = v; bf = f; bi = -1; l0 = LAM[0]!; l1 = LAM[1]!; l2 = LAM[2]!; l3 = LAM[3]!; }
      continue;
    }
    let fx = 0, fy = 0, fz = 0;
    for (let q = 0; q < k; q++) { const i = 3 * fIds[s0 + q]!; fx += pts[i]!; fy += pts[i + 1]!; fz += pts[i + 2]!; }
    fx = fx / k - x; fy = fy / k - y; fz = fz / k - z;
    for (let q = 0; q < k; q++) {
      const a = 3 * fIds[s0 + q]!, b = 3 * fIds[s0 + ((q + 1) % k)]!;
      const v = barycentric(pts[a]! - x, pts[a + 1]! - y, pts[a + 2]! - z, pts[b]! - x, pts[b + 1]! - y, pts[b + 2]! - z, fx, fy, fz, cx, cy, cz);
      if (v < best) { best = v; bf = f; bi = q; l0 = LAM[0]!; l1 = LAM[1]!; l2 = LAM[2]!; l3 = LAM[3]!; }
    }
  }
  PC[0] = NaN; PC[1] = NaN; PC[2] = NaN;
  if (bf < 0) { wCount = 0; return Infinity; }
  const s0 = fOff[bf]!, k = fOff[bf + 1]! - s0;
  const need = 3 + k + m;
  if (wIds.length < need) { wIds = new Int32Array(2 * need); wVals = new Float64Array(2 * need); }
  let w = 0;
  if (bi < 0) {
    wIds[w] = fIds[s0]!; wVals[w++] = l0;
    wIds[w] = fIds[s0 + 1]!; wVals[w++] = l1;
    wIds[w] = fIds[s0 + 2]!; wVals[w++] = l2;
  } else {
    wIds[w] = fIds[s0 + bi]!; wVals[w++] = l0;
    wIds[w] = fIds[s0 + ((bi + 1) % k)]!; wVals[w++] = l1;
    const share = l2 / k;
    for (let q = 0; q < k; q++) { wIds[w] = fIds[s0 + q]!; wVals[w++] = share; }
  }
  const cshare = l3 / m;
  for (let q = ca; q < cb; q++) { wIds[w] = cellIds[q]!; wVals[w++] = cshare; }
  wCount = w;
  return best;
}
