/**
 * Cut-plane: the intersection of a plane (origin o, unit normal n) with every 3D cell of a dataset — tetra,
 * voxel, hexahedron, wedge, pyramid, pentagonal and hexagonal prisms, and polyhedra from their face stream —
 * across all pieces. 2D, 1D and 0D cells are skipped. One loop serves every type: cell topology comes from
 * `FACE_TABLE` (polyhedra: their own faces).
 *
 * Per cell: signed distances d = n·(x − o) at the nodes, classified half-open — below (d < 0) or above
 * (d ≥ 0), with |d| ≤ tol snapped to 0. On each face, every maximal run of "below" nodes is bounded by two
 * crossing edges; their crossing points make one segment of the cut (faces of more than four nodes with
 * several runs may be non-convex: there the crossings are paired in order along the cut line). The
 * segments of a cell are chained
 * (undirected, by shared crossing) into closed loops, each loop is wound counter-clockwise about n and
 * triangulated (fan when convex, ear clipping otherwise). A crossing on edge (a, b) lies at
 *   x = (d_b·x_a − d_a·x_b)/(d_b − d_a),
 * symmetric in a and b, so the cells (and pieces) sharing an edge compute bit-identical points; a crossing
 * at a node with d = 0 is that node exactly.
 *
 * On-plane rule: because of the half-open classification every part of the plane inside the mesh is cut
 * by exactly one cell, also when the plane runs through a layer of nodes (the layer's faces belong to the
 * cells below). Faces in the plane with no cell below — the mesh boundary — are added from the cell above
 * (`planeFaces.ts`). So a unit cube cut at any height, its two end faces included, has area 1.
 *
 * Fast path: tetrahedra, voxels, hexahedra, wedges and pyramids with no repeated node go through their case
 * tables (`tableCut.ts`; `caseTables.ts`, and `onPlaneCases.ts` when nodes lie on the plane), which give this
 * builder's loops vertex for vertex and its in-plane face records; every other cell comes here. Option
 * `caseTables: false` sends every cell here.
 *
 * Fields are not interpolated here: each vertex keeps its provenance (edge end points and parameter), and
 * `cutFields.ts` materialises only the fields asked for.
 */
import { CellType, FACE_TABLE } from '../model/cellTypes.ts';
import { datasetBounds, boundsDiagonal } from '../model/bounds.ts';
import { cellStarts, pieceOfCell, pointStarts, type Dataset } from '../model/dataset.ts';
import type { Piece } from '../model/piece.ts';
import { candidateCells, prepareScan, type CandidateSource } from './crossingCells.ts';
import { interpolateCutFields, type FieldRef } from './cutFields.ts';
import { claimedFaceKeys, facePositionKey, forEachUnclaimedFace, recordPlaneFace, resetPlaneFaces } from './planeFaces.ts';
import { resetOutput, returnOutput, takeOutput, triangleTotal, vertexTotal, writePolygon } from './cutOutput.ts';
import { cutByTable, setTablePlane, setTablePoints } from './tableCut.ts';
import { unitVector, type TriangleSet, type Vec3 } from './triangleSet.ts';

/** Options of `cutPlane`; every field optional. */
export interface CutOptions {
  /** Fields to carry onto the cut: 'all' (default: every point and cell field present in every piece), 'none', or a list. */
  fields: 'all' | 'none' | readonly FieldRef[];
  /** Node-on-plane tolerance relative to the dataset's bounds diagonal. Default 1e-10. */
  tolerance: number;
  /** Where candidate cells come from (see `crossingCells.ts`). Default 'auto'. */
  candidates: CandidateSource;
  /** Keep the position keys of in-plane faces (`PlaneCut.planeFaces`), for the worker pool's merge of cell shares. Default false. */
  planeFaceKeys: boolean;
  /**
   * Cut the tetrahedra, voxels, hexahedra, wedges and pyramids with no repeated node through their case
   * tables (`caseTables.ts`, `onPlaneCases.ts`; same triangles bit for bit); false sends every cell through the general polygon
   * builder (for comparisons). Default true.
   */
  caseTables: boolean;
  /**
   * The cut's arrays are views of the cut kernel's own buffers, valid until the next cut of this thread starts
   * or until given back (`releaseCut`), for a cut copied elsewhere at once (a pool worker's share). Default false.
   */
  lendOutput: boolean;
}

export const CUT_DEFAULTS: Readonly<CutOptions> = { fields: 'all', tolerance: 1e-10, candidates: 'auto', planeFaceKeys: false, caseTables: true, lendOutput: false };

/**
 * In-plane faces of a cut (only with `planeFaceKeys`): the faces this cut added from the cell above
 * (`emitted[i]`, its triangles from `triStart[i]` to `triStart[i + 1]`, its vertices from `vertStart[i]` to
 * `vertStart[i + 1]`; the cells' triangles and vertices come before the first) and the faces cut by the cell below
 * whose cell above was not among the cells cut (`claimed`: a share's border or the mesh boundary; a face matched
 * within the cut is interior and has no key), as `facePositionKey`s. A face emitted by one cell share and claimed
 * by another is interior.
 */
export interface PlaneFaceKeys {
  readonly emitted: readonly string[];
  readonly triStart: Int32Array;
  readonly vertStart: Int32Array;
  readonly claimed: readonly string[];
}

/** A cut: a triangle set wound counter-clockwise about `normal`, plus each vertex's provenance. */
export interface PlaneCut extends TriangleSet {
  readonly origin: Vec3;
  /** Unit normal; fluxes through the cut are positive along it. */
  readonly normal: Vec3;
  /** Two global point ids per vertex (numbering of `pointStarts`); a point field's value is (1 − t)·f[a] + t·f[b]. a = b for a vertex at a node. */
  readonly vertexEdges: Int32Array;
  /** Parameter t per vertex (see `vertexEdges`). */
  readonly vertexT: Float64Array;
  /** True when the plane cuts no 3D cell (then there are no triangles). */
  readonly empty: boolean;
  readonly stats: CutStats;
  /** Only with the `planeFaceKeys` option. */
  readonly planeFaces?: PlaneFaceKeys;
}

export interface CutStats {
  /** Cells the candidate search returned, and which search ran. */
  candidateCells: number;
  candidateSource: 'tree' | 'scan';
  /** Cells that contributed triangles. */
  cutCells: number;
  /** Of the candidate cells, those cut through the case tables (the rest went through the general builder). Absent from merged pool cuts. */
  tableCells?: number;
  /** Boundary faces lying in the plane that were added from the cell above. */
  boundaryFaces: number;
  /** Chains of crossing segments that did not close (broken polyhedron face streams); dropped. */
  openChains: number;
  /** Absolute node-on-plane tolerance used (file's length unit). */
  tolerance: number;
  ms: number;
  /** Merged pool cuts only: each worker's share of the work, in worker order (its candidate cells, triangles and the ms its cut took there). */
  shares?: { candidateCells: number; triangles: number; ms: number }[];
}

// ---- per-cell scratch ----------------------------------------------------------------------------------
let cP = new Int32Array(64), cD = new Float64Array(64);          // local node → piece point id, distance
let fP = new Int32Array(64), fD = new Float64Array(64);          // one face: point ids, distances
let vA = new Int32Array(64), vB = new Int32Array(64), vT = new Float64Array(64); // crossing: edge ends (piece ids), t
let vX = new Float64Array(64), vY = new Float64Array(64), vZ = new Float64Array(64);
let sU = new Int32Array(64), sV = new Int32Array(64), sUsed = new Uint8Array(64);
let fX = new Int32Array(64), fS = new Float64Array(64), fE = new Uint8Array(64);                   // one face's crossings, their sort keys
let loop = new Int32Array(64);
let nCv = 0, nSeg = 0;

function ensureCell(n: number): void {
  if (n <= cP.length) return;
  const m = 2 * n;
  cP = new Int32Array(m); cD = new Float64Array(m); fP = new Int32Array(m); fD = new Float64Array(m);
  vA = new Int32Array(m); vB = new Int32Array(m); vT = new Float64Array(m);
  vX = new Float64Array(m); vY = new Float64Array(m); vZ = new Float64Array(m);
  sU = new Int32Array(m); sV = new Int32Array(m); sUsed = new Uint8Array(m); fX = new Int32Array(m); fS = new Float64Array(m); fE = new Uint8Array(m);
  loop = new Int32Array(m);
}

/** Bit mask of the local nodes of each face of FACE_TABLE (fixed types have at most 12 nodes). */
const FACE_MASK = (() => {
  const m = new Int32Array(FACE_TABLE.size.length);
  for (let f = 0; f < m.length; f++) for (let j = 0; j < FACE_TABLE.size[f]!; j++) m[f] |= 1 << FACE_TABLE.nodes[FACE_TABLE.first[f]! + j]!;
  return m;
})();

/** Copies the point ids of face f of the current cell (cP) into fP. */
function fillFace(f: number): void {
  const s0 = FACE_TABLE.first[f]!;
  for (let j = 0; j < FACE_TABLE.size[f]!; j++) fP[j] = cP[FACE_TABLE.nodes[s0 + j]!]!;
}

// ---- plane and current piece ---------------------------------------------------------------------------
let OX = 0, OY = 0, OZ = 0, NX = 0, NY = 0, NZ = 1, TOL = 0;
let pts: Float64Array = new Float64Array(0);
let pointBase = 0;
let openChains = 0;

/** Snapped signed distance of piece point p; the same expression as the candidate scan, so both agree bit for bit. */
function dist(p: number): number {
  const j = 3 * p;
  const s = NX * (pts[j]! - OX) + NY * (pts[j + 1]! - OY) + NZ * (pts[j + 2]! - OZ);
  return s <= TOL && s >= -TOL ? 0 : s;
}

/** Per-cell crossing on edge (below a, above b): index of the cell's crossing vertex, created once. */
function crossing(a: number, da: number, b: number, db: number): number {
  let lo: number, hi: number;
  if (db === 0) { lo = b; hi = b; } else if (a < b) { lo = a; hi = b; } else { lo = b; hi = a; }
  for (let i = 0; i < nCv; i++) if (vA[i] === lo && vB[i] === hi) return i;
  const i = nCv++;
  vA[i] = lo; vB[i] = hi;
  const jb = 3 * b;
  if (db === 0) {
    vT[i] = 0; vX[i] = pts[jb]!; vY[i] = pts[jb + 1]!; vZ[i] = pts[jb + 2]!;
  } else {
    const ja = 3 * a, den = db - da;
    vX[i] = (db * pts[ja]! - da * pts[jb]!) / den;
    vY[i] = (db * pts[ja + 1]! - da * pts[jb + 1]!) / den;
    vZ[i] = (db * pts[ja + 2]! - da * pts[jb + 2]!) / den;
    // t measured from lo to hi.
    vT[i] = lo === a ? -da / den : db / den;
  }
  return i;
}

/**
 * Segments of one face held in fP/fD[0..m-1]. Triangles and quads (warped ones included): one segment per
 * maximal run of nodes below the plane, between the run's two crossings — adjacent-edge pairing, the same
 * from both cells sharing the face. Larger faces with more than two crossings may be non-convex: their
 * crossings are sorted along the cut line and paired in order (even–odd), which is exact for any simple
 * planar face and also the same from both sides (the order does not depend on the traversal).
 */
function faceSegments(m: number): void {
  let nx = 0;
  for (let j = 0; j < m; j++) {
    const a = fP[j]!, da = fD[j]!, jn = j + 1 === m ? 0 : j + 1, b = fP[jn]!, db = fD[jn]!;
    if (da < 0 && db >= 0) { fX[nx] = crossing(a, da, b, db); fE[nx++] = 0; }
    else if (da >= 0 && db < 0) { fX[nx] = crossing(b, db, a, da); fE[nx++] = 1; }
  }
  if (nx > 2 && m > 4) { pairAlongLine(nx); return; }
  // Crossings alternate entry/exit around the face; each entry pairs with the next crossing (its run's exit).
  for (let i = 0; i < nx; i++) if (fE[i]) addSegment(fX[i]!, fX[i + 1 === nx ? 0 : i + 1]!);
}

/** Pairs the face's nx crossings (fX) in order along the line through them. */
function pairAlongLine(nx: number): void {
  // Canonical direction: from the crossing with the smallest edge key to the one farthest from it.
  let a = fX[0]!;
  for (let i = 1; i < nx; i++) { const x = fX[i]!; if (vA[x]! < vA[a]! || (vA[x] === vA[a] && vB[x]! < vB[a]!)) a = x; }
  let far = a, best = -1;
  for (let i = 0; i < nx; i++) {
    const x = fX[i]!, d = (vX[x]! - vX[a]!) ** 2 + (vY[x]! - vY[a]!) ** 2 + (vZ[x]! - vZ[a]!) ** 2;
    if (d > best) { best = d; far = x; }
  }
  const dx = vX[far]! - vX[a]!, dy = vY[far]! - vY[a]!, dz = vZ[far]! - vZ[a]!;
  for (let i = 0; i < nx; i++) { const x = fX[i]!; fS[i] = (vX[x]! - vX[a]!) * dx + (vY[x]! - vY[a]!) * dy + (vZ[x]! - vZ[a]!) * dz; }
  for (let i = 1; i < nx; i++) {
    const x = fX[i]!, s = fS[i]!;
    let j = i - 1;
    while (j >= 0 && fS[j]! > s) { fX[j + 1] = fX[j]!; fS[j + 1] = fS[j]!; j--; }
    fX[j + 1] = x; fS[j + 1] = s;
  }
  for (let i = 0; i + 1 < nx; i += 2) addSegment(fX[i]!, fX[i + 1]!);
}

function addSegment(u: number, v: number): void {
  if (u === v) return;
  sU[nSeg] = u; sV[nSeg] = v; sUsed[nSeg] = 0; nSeg++;
}

/** Chains the cell's segments into loops and emits each loop's triangles. */
function emitLoops(cell: number): boolean {
  let any = false;
  for (let s0 = 0; s0 < nSeg; s0++) {
    if (sUsed[s0]) continue;
    sUsed[s0] = 1;
    const start = sU[s0]!;
    let cur = sV[s0]!, m = 0, closed = true;
    loop[m++] = start;
    while (cur !== start) {
      let next = -1;
      for (let s = 0; s < nSeg; s++) {
        if (sUsed[s]) continue;
        if (sU[s] === cur) { next = sV[s]!; sUsed[s] = 1; break; }
        if (sV[s] === cur) { next = sU[s]!; sUsed[s] = 1; break; }
      }
      if (next < 0) { closed = false; break; }
      loop[m++] = cur;
      cur = next;
    }
    if (!closed) { openChains++; continue; }
    if (emitLoop(m, cell)) any = true;
  }
  return any;
}

/** Orients loop[0..m-1] (indices of cell crossings) about n, triangulates and writes it out. */
function emitLoop(m: number, cell: number): boolean {
  return writePolygon(vX, vY, vZ, vA, vB, vT, loop, m, NX, NY, NZ, cell, pointBase);
}

/** Cuts cell c of the current piece (global id g); returns whether it produced triangles. */
function cutCell(p: Piece, k: number, c: number, g: number): boolean {
  const t = p.cellTypes[c]!;
  const isPoly = t === CellType.POLYHEDRON;
  if (!isPoly && (t < CellType.TETRA || t > CellType.HEXAGONAL_PRISM)) return false;
  const conn = p.connectivity, pf = p.polyFaces;
  let a = p.offsets[c]!, b = p.offsets[c + 1]!, ids = conn;
  let fa = 0, fb = 0;
  if (isPoly) {
    if (!pf) return false;
    fa = pf.cellFaceStart[c]!; fb = pf.cellFaceStart[c + 1]!;
    if (a === b) { ids = pf.faceConnectivity; a = pf.faceOffsets[fa]!; b = pf.faceOffsets[fb]!; }
    ensureCell(pf.faceOffsets[fb]! - pf.faceOffsets[fa]! + (b - a) + 8);
  }
  let below = 0, zero = 0, above = 0, belowMask = 0, zeroMask = 0;
  for (let q = a, i = 0; q < b; q++, i++) {
    const id = ids[q]!, s = dist(id);
    cP[i] = id; cD[i] = s;
    if (s < 0) { below++; belowMask |= 1 << i; } else if (s === 0) { zero++; zeroMask |= 1 << i; } else above++;
  }
  if (below === 0) {
    // Above the plane: only an in-plane face with no cell below can matter (resolved after the loop).
    if (zero >= 3 && above > 0) planeFacesOf(p, k, c, g, t);
    return false;
  }
  if (zero + above === 0) return false;
  nCv = 0; nSeg = 0;
  if (isPoly) {
    const fo = pf!.faceOffsets, fc = pf!.faceConnectivity;
    for (let f = fa; f < fb; f++) {
      const s0 = fo[f]!, m = fo[f + 1]! - s0;
      let allZero = true;
      for (let j = 0; j < m; j++) { const id = fc[s0 + j]!, s = dist(id); fP[j] = id; fD[j] = s; if (s !== 0) allZero = false; }
      faceSegments(m);
      if (allZero && zero >= 3) recordPlaneFace(k, pts, g, fc, s0, m, true);
    }
  } else {
    const fs = FACE_TABLE.start[t]!, fe = FACE_TABLE.start[t + 1]!, fsize = FACE_TABLE.size, ffirst = FACE_TABLE.first, fnodes = FACE_TABLE.nodes;
    for (let f = fs; f < fe; f++) {
      const fm = FACE_MASK[f]!, fb = belowMask & fm;
      // A face wholly on one side has no crossing (the common case: skip it without touching its nodes).
      if (fb === 0 || fb === fm) {
        if (zero >= 3 && (zeroMask & fm) === fm) { fillFace(f); recordPlaneFace(k, pts, g, fP, 0, fsize[f]!, true); }
        continue;
      }
      const m = fsize[f]!, s0 = ffirst[f]!;
      for (let j = 0; j < m; j++) { const l = fnodes[s0 + j]!; fP[j] = cP[l]!; fD[j] = cD[l]!; }
      faceSegments(m);
    }
  }
  return emitLoops(g);
}

let runCut = 0, runTable = 0;

/**
 * Cuts the candidates cells[i0 …] of piece k (global ids g0 … gEnd − 1) up to the first of another piece, whose
 * index it returns; counts cells with triangles in `runCut` and cells cut by table in `runTable`. A function
 * of its own, with nothing after its loop but the counts, so the engine optimises the loop once and keeps it.
 */
function cutRun(piece: Piece, k: number, cells: Int32Array, i0: number, nCand: number, g0: number, gEnd: number, tables: boolean): number {
  const types = piece.cellTypes, off = piece.offsets, conn = piece.connectivity, base = pointBase;
  let i = i0, cut = 0, viaTable = 0;
  for (; i < nCand; i++) {
    const g = cells[i]!;
    if (g >= gEnd) break;
    const c = g - g0;
    const r = tables ? cutByTable(types, off, conn, c, k, g, base) : -1;
    viaTable += r < 0 ? 0 : 1;
    cut += (r < 0 ? cutCell(piece, k, c, g) : r === 1) ? 1 : 0;
  }
  runCut = cut; runTable = viaTable;
  return i;
}

/** Records the in-plane faces of an above-plane cell as candidates. */
function planeFacesOf(p: Piece, k: number, c: number, g: number, t: number): void {
  if (t === CellType.POLYHEDRON) {
    const pf = p.polyFaces!, fo = pf.faceOffsets, fc = pf.faceConnectivity;
    for (let f = pf.cellFaceStart[c]!; f < pf.cellFaceStart[c + 1]!; f++) {
      const s0 = fo[f]!, m = fo[f + 1]! - s0;
      let allZero = true;
      for (let j = 0; j < m && allZero; j++) if (dist(fc[s0 + j]!) !== 0) allZero = false;
      if (allZero) recordPlaneFace(k, pts, g, fc, s0, m, false);
    }
    return;
  }
  // cP/cD hold the cell's nodes and distances (filled by cutCell).
  for (let f = FACE_TABLE.start[t]!; f < FACE_TABLE.start[t + 1]!; f++) {
    const m = FACE_TABLE.size[f]!, s0 = FACE_TABLE.first[f]!;
    let allZero = true;
    for (let j = 0; j < m; j++) { const l = FACE_TABLE.nodes[s0 + j]!; fP[j] = cP[l]!; if (cD[l] !== 0) { allZero = false; break; } }
    if (allZero) recordPlaneFace(k, pts, g, fP, 0, m, false);
  }
}

/** Emits an unclaimed in-plane face: its nodes are the loop's vertices. */
function emitPlaneFace(ids: Int32Array, start: number, m: number, cell: number): boolean {
  ensureCell(m + 8);
  nCv = 0;
  for (let j = 0; j < m; j++) {
    const id = ids[start + j]!;
    // Faces of collapsed cells repeat nodes; keep each node once.
    if (nCv > 0 && vA[nCv - 1] === id) continue;
    const i = nCv++;
    vA[i] = id; vB[i] = id; vT[i] = 0;
    vX[i] = pts[3 * id]!; vY[i] = pts[3 * id + 1]!; vZ[i] = pts[3 * id + 2]!;
    loop[i] = i;
  }
  if (nCv > 1 && vA[nCv - 1] === vA[0]) nCv--;
  return emitLoop(nCv, cell);
}

/** Gives a cut made with `lendOutput` its buffers back (it must not be read after): the next cut writes into them instead of fresh memory. */
export function releaseCut(cut: PlaneCut): void { returnOutput(cut.positions); }

const scaleCache = new WeakMap<Dataset, number>();

/** Length scale of a dataset (bounds diagonal), cached per dataset. */
export function datasetScale(d: Dataset): number {
  let s = scaleCache.get(d);
  if (s === undefined) { s = boundsDiagonal(datasetBounds(d)); scaleCache.set(d, s); }
  return s;
}

/**
 * Does now the once-per-dataset set-up of the first cut (the length scale for the tolerance, the cell layout
 * of each piece for the scan), so that a worker taking on a dataset pays it with the load, not the first cut.
 */
export function prepareCut(dataset: Dataset): void {
  datasetScale(dataset);
  prepareScan(dataset);
}

/**
 * Cuts `dataset` with the plane through `origin` (length unit of the file) with normal `normal` (any
 * non-zero length; used as a unit vector). Returns the triangles wound counter-clockwise about the unit
 * normal, with the fields of `opts.fields` (point fields per vertex, cell fields per triangle). A plane that
 * misses every 3D cell gives `empty: true` and no triangles.
 */
export function cutPlane(dataset: Dataset, origin: Vec3, normal: Vec3, options: Partial<CutOptions> = {}): PlaneCut {
  const t0 = performance.now();
  const opts = { ...CUT_DEFAULTS, ...options };
  if (!origin.every(Number.isFinite)) throw new Error(`cutPlane: origin must be three finite numbers, got (${origin.join(', ')})`);
  const n = unitVector(normal, 'cutPlane: normal');
  OX = origin[0]; OY = origin[1]; OZ = origin[2]; NX = n[0]; NY = n[1]; NZ = n[2];
  const tol = opts.tolerance * datasetScale(dataset);
  TOL = tol;
  setTablePlane(OX, OY, OZ, NX, NY, NZ, tol);
  openChains = 0;
  resetPlaneFaces();
  const { cells: found, used } = candidateCells(dataset, OX, OY, OZ, NX, NY, NZ, tol, opts.candidates);
  // Ascending ids: the same triangle order whichever search ran, and connectivity read in memory order.
  const cells = used === 'tree' ? found.sort() : found;
  const nCand = cells.length;
  // One allocation up front: room for the largest polygon a plane cuts from a convex cell (six vertices, four
  // triangles) per candidate, so the buffers do not grow mid-cut (a path the warm-up never takes, whose first
  // run threw the optimised cut away); pages of it never written are never touched.
  resetOutput(6 * nCand, 4 * nCand);
  const starts = cellStarts(dataset), pStarts = pointStarts(dataset);
  const tables = opts.caseTables;
  let cutCells = 0, tableCells = 0;
  // Candidates ascend, so each piece's come as one run.
  for (let i = 0; i < nCand;) {
    const k = dataset.pieces.length === 1 ? 0 : pieceOfCell(starts, cells[i]!), piece = dataset.pieces[k]!;
    pts = piece.points; pointBase = pStarts[k]!; setTablePoints(pts);
    const end = cutRun(piece, k, cells, i, nCand, starts[k]!, starts[k]! + piece.cellTypes.length, tables);
    cutCells += runCut; tableCells += runTable;
    i = end;
  }
  const emitted: string[] = [], triStarts: number[] = [], vertStarts: number[] = [];
  const boundaryFaces = forEachUnclaimedFace(dataset.pieces, (kk, cell, ids, start, m) => {
    pts = dataset.pieces[kk]!.points; pointBase = pStarts[kk]!;
    if (opts.planeFaceKeys) { emitted.push(facePositionKey(pts, ids, start, m)); triStarts.push(triangleTotal()); vertStarts.push(vertexTotal()); }
    if (emitPlaneFace(ids, start, m, cell)) cutCells++;
  });
  triStarts.push(triangleTotal()); vertStarts.push(vertexTotal());
  const planeFaces = opts.planeFaceKeys
    ? { planeFaces: { emitted, triStart: Int32Array.from(triStarts), vertStart: Int32Array.from(vertStarts), claimed: claimedFaceKeys(dataset.pieces) } } : {};
  pts = new Float64Array(0);
  setTablePoints(pts);
  const geometry = takeOutput(opts.lendOutput);
  const fields = interpolateCutFields(dataset, geometry, opts.fields);
  return {
    ...geometry, fields, origin: [origin[0], origin[1], origin[2]], normal: n, empty: geometry.indices.length === 0,
    stats: { candidateCells: nCand, candidateSource: used, cutCells, tableCells, boundaryFaces, openChains, tolerance: tol, ms: performance.now() - t0 },
    ...planeFaces,
  };
}
