/**
 * The gradient of a field of one piece, at its own sites: a point field at the nodes (neighbours: nodes
 * sharing a cell), a cell field at the cell centroids (neighbours: cells sharing a node); an
 * ill-conditioned one-ring (boundary faces, edges, corners) is refitted over the two-ring by the kernel.
 * Pieces of a set are reconstructed one by one (a node on a piece's interface gets a one-sided fit, still
 * second order).
 *
 * A point field of 1 or 3 components is fitted by the moment kernel over its own copy of the mesh (kernelMesh.ts,
 * kept for the last mesh: a later step on the same geometry copies only its values); other fields over rows.
 *
 * Caches: the sites (positions and stencil) depend on the geometry only and are kept per mesh — keyed by the piece's points, offsets and connectivity arrays, so the steps of a
 * series that share those arrays (src/series/meshReuse.ts) share them; a gradient is kept per values array
 * (WeakMap), so vorticity, Q and λ₂ share one reconstruction.
 */
import type { FieldArray } from '../model/fieldArray.ts';
import type { Piece } from '../model/piece.ts';
import { sameBytes } from '../model/sameBytes.ts';
import { gradientInto, quadraticGradient } from './quadraticGradient.ts';
import { cellCentres, cellStencil, pointStencil, type Stencil } from './stencils.ts';
import { pointStencilAround } from './localStencil.ts';
import { momentKernel } from './momentKernel.ts';
import { meshAtInto, meshInto } from './pairedFit.ts';
import { isHeld } from './kernelMesh.ts';

/** Positions (xyz per site, length unit) and one-ring stencil of a piece's nodes or cells. */
export interface Sites { positions: Float64Array; stencil: Stencil }

interface GeometryEntry {
  points: Float64Array;
  offsets: Int32Array;
  point?: Sites;
  cell?: Sites;
  /** The rows `pointGradientAt` built for its last node list (a wall asked again, or at the next step). */
  around?: { nodes: Int32Array; stencil: Stencil };
}

/** Rows built for a node list are kept with the mesh when their ids and offsets number at most this (4 bytes each). */
const KEPT_AROUND_ENTRIES = 8 * 1024 * 1024;

/** Entries by connectivity array (several when meshes share it but differ in points or offsets). */
const byConnectivity = new WeakMap<Int32Array, GeometryEntry[]>();
const gradients = new WeakMap<object, Float64Array>();
function geometryOf(p: Piece): GeometryEntry {
  let list = byConnectivity.get(p.connectivity);
  if (!list) { list = []; byConnectivity.set(p.connectivity, list); }
  let e = list.find((x) => x.points === p.points && x.offsets === p.offsets);
  if (!e) { e = { points: p.points, offsets: p.offsets }; list.push(e); }
  return e;
}

/** Positions and one-ring stencil of a piece's nodes or cells, built once per mesh. */
export function sitesOf(p: Piece, association: 'point' | 'cell'): Sites {
  const e = geometryOf(p);
  if (association === 'point') return (e.point ??= { positions: p.points, stencil: pointStencil(p) });
  return (e.cell ??= { positions: cellCentres(p), stencil: cellStencil(p) });
}

/**
 * Gradient of field `f` (point or cell data of `p`) at every site: `3·components` values per site,
 * component c's ∂/∂x_j at `[(site·nc + c)·3 + j]` (field unit per length unit).
 */
export function fieldGradient(p: Piece, f: FieldArray): Float64Array {
  if (f.association === 'dataset') throw new Error(`gradient: field "${f.name}" is dataset-level data, not tied to points or cells`);
  let g = gradients.get(f.values);
  if (!g) {
    g = (f.association === 'point' ? heldGradient(p, f) : null) ?? undefined;
    if (!g) {
      const s = sitesOf(p, f.association);
      g = quadraticGradient(s.positions, f.values, f.components, s.stencil);
    }
    gradients.set(f.values, g);
  }
  return g;
}

/**
 * A point field's gradient at every node on the moment kernel walking its own copy of the mesh (kernelMesh.ts:
 * no rows built here; the same values as over `sitesOf`'s rows), or null where the kernel cannot (no WebAssembly
 * SIMD, components other than 1 or 3, a mesh too large to hold).
 */
function heldGradient(p: Piece, f: FieldArray): Float64Array | null {
  const nc = f.components, K = nc === 1 || nc === 3 ? momentKernel() : null;
  if (!K) return null;
  const np = p.points.length / 3, g = new Float64Array(3 * nc * np);
  return meshInto(K, g, 0, p, f.values, nc, 0, np, undefined) ? g : null;
}

/**
 * Gradient of a point field at chosen nodes only (`nodes` local to `p`), same layout per node: the direct fit
 * over the mesh's cached stencil, or — on a mesh whose stencil is not built — over the rows of those nodes
 * and their neighbours only (`pointStencilAround`, the same rows, so the same values; kept with the mesh for
 * the same node list next time, when not larger than KEPT_AROUND_ENTRIES); or the values primed
 * for those nodes by `primeGradientAt`. A wall fitted at every step of a series keeps its fit as a linear operator
 * instead (src/surface/wallGradientCache.ts).
 */
export function pointGradientAt(p: Piece, f: FieldArray, nodes: Int32Array): Float64Array {
  const primed = primedAt.get(f.values);
  if (primed && sameBytes(primed.nodes, nodes)) return primed.g.slice();
  const out = new Float64Array(3 * f.components * nodes.length);
  const e = geometryOf(p);
  if (!e.point && heldAt(p, f, nodes, out)) return out;
  // a mesh without cached rows: only the chosen nodes' rows and their neighbours' (the same rows); no
  // whole-mesh structure is built for a wall request
  let stencil = e.point?.stencil;
  if (!stencil) {
    if (e.around && sameBytes(e.around.nodes, nodes)) stencil = e.around.stencil;
    else {
      stencil = pointStencilAround(p, nodes);
      e.around = stencil.ids.length + stencil.offsets.length <= KEPT_AROUND_ENTRIES ? { nodes: nodes.slice(), stencil } : undefined;
    }
  }
  gradientInto(out, 0, p.points, f.values, f.components, stencil, nodes, 0, nodes.length);
  return out;
}

/**
 * A node list is fitted on the kernel's copy of the mesh (kernelMesh.ts) when the kernel holds that mesh already,
 * or when the mesh has at most this many nodes per listed node: holding it (positions, connectivity, the node →
 * cells rows made by the kernel) then costs less than building the list's rows and their neighbours' in
 * JavaScript. Measured on the wall bench's slab (101k nodes, all listed): see DEVELOPERS.md, "Derived fields".
 */
export const HOLD_FOR_LIST_RATIO = 8;

/** `pointGradientAt` on the held mesh (`out` in the list's layout); false when the kernel cannot or should not. */
function heldAt(p: Piece, f: FieldArray, nodes: Int32Array, out: Float64Array): boolean {
  const nc = f.components, K = nc === 1 || nc === 3 ? momentKernel() : null;
  if (!K || nodes.length === 0) return false;
  if (!isHeld(p) && p.points.length / 3 > HOLD_FOR_LIST_RATIO * nodes.length) return false;
  return meshAtInto(K, out, p, f.values, nc, nodes);
}

/** Gradients at chosen nodes computed elsewhere (the worker pool), by values array: `primeGradientAt`. */
const primedAt = new WeakMap<object, { nodes: Int32Array; g: Float64Array }>();

/**
 * Hands `pointGradientAt` the gradient at `nodes` of the point field whose values array is `values`, computed
 * elsewhere (the worker pool's shares of a wall, src/parallel/deriveShares.ts) in its layout; a later
 * `pointGradientAt` of that field at the same nodes returns a copy of it instead of fitting again. One entry
 * per values array (the last one primed).
 */
export function primeGradientAt(values: object, nodes: Int32Array, g: Float64Array): void {
  primedAt.set(values, { nodes: nodes.slice(), g });
}

/**
 * Hands the gradient cache a gradient computed elsewhere (the worker pool's shares, src/parallel/deriveShares.ts)
 * for the point or cell field whose values array is `values`: `g` in the layout of `fieldGradient`, which then
 * returns it instead of computing it again.
 */
export function primeGradient(values: object, g: Float64Array): void {
  gradients.set(values, g);
}

/** True when `primeGradientAt` has handed over a gradient for the values array `values`. */
export function hasPrimedGradient(values: object): boolean {
  return primedAt.has(values);
}
