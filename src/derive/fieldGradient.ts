/**
 * The gradient of a field of one piece, at its own sites: a point field at the nodes (neighbours: nodes
 * sharing a cell), a cell field at the cell centroids (neighbours: cells sharing a node); an
 * ill-conditioned one-ring (boundary faces, edges, corners) is refitted over the two-ring by the kernel.
 * Results and stencils are cached per piece and values array (WeakMaps), so vorticity, Q and λ₂ share
 * one reconstruction. Pieces of a set are reconstructed one by one (a node on a piece's interface gets a
 * one-sided fit, still second order).
 */
import type { FieldArray } from '../model/fieldArray.ts';
import type { Piece } from '../model/piece.ts';
import { quadraticGradient } from './quadraticGradient.ts';
import { cellCentres, cellStencil, pointStencil, type Stencil } from './stencils.ts';

interface Sites { positions: Float64Array; stencil: Stencil }

const pointSites = new WeakMap<Piece, Sites>();
const cellSites = new WeakMap<Piece, Sites>();
const gradients = new WeakMap<object, Float64Array>();

/** Positions and one-ring stencil of a piece's nodes or cells, built once. */
export function sitesOf(p: Piece, association: 'point' | 'cell'): Sites {
  const cache = association === 'point' ? pointSites : cellSites;
  let s = cache.get(p);
  if (!s) {
    s = association === 'point'
      ? { positions: p.points, stencil: pointStencil(p) }
      : { positions: cellCentres(p), stencil: cellStencil(p) };
    cache.set(p, s);
  }
  return s;
}

/**
 * Gradient of field `f` (point or cell data of `p`) at every site: `3·components` values per site,
 * component c's ∂/∂x_j at `[(site·nc + c)·3 + j]` (field unit per length unit).
 */
export function fieldGradient(p: Piece, f: FieldArray): Float64Array {
  if (f.association === 'dataset') throw new Error(`gradient: field "${f.name}" is dataset-level data, not tied to points or cells`);
  let g = gradients.get(f.values);
  if (!g) {
    const s = sitesOf(p, f.association);
    g = quadraticGradient(s.positions, f.values, f.components, s.stencil);
    gradients.set(f.values, g);
  }
  return g;
}

/** Gradient of a point field at chosen nodes only (`nodes` local to `p`), same layout per node. */
export function pointGradientAt(p: Piece, f: FieldArray, nodes: Int32Array): Float64Array {
  const s = sitesOf(p, 'point');
  return quadraticGradient(s.positions, f.values, f.components, s.stencil, nodes);
}
