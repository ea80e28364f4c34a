/**
 * The point-field gradient of `fieldGradient.ts` for one contiguous range of nodes, written into the
 * caller's array: the unit of work when the nodes of a piece are split over compute workers
 * (src/parallel/deriveShares.ts), each filling its own slice of one shared result.
 *
 * A range needs its nodes' one-rings and, for the nodes whose fit widens to the two-ring, their neighbours'
 * rows too: `pointStencilOfRange` (localStencil.ts) gives exactly those rows of the whole piece's stencil, in the same order, so
 * every node's fit — and its result, bit for bit — is the one the whole-piece gradient gives, whichever
 * range (and worker) computes it.
 */
import type { NumericArray } from '../model/fieldArray.ts';
import type { Piece } from '../model/piece.ts';
import { pointStencilOfRange } from './localStencil.ts';
import { gradientInto } from './quadraticGradient.ts';
import { momentKernel } from './momentKernel.ts';
import { meshInto } from './pairedFit.ts';

/**
 * Writes the gradient of a point field (`values`, `nc` components per node of `p`) at nodes `from .. to-1`
 * into `out` at the whole-piece layout of `fieldGradient` (node i's component c, direction j at
 * `(i·nc + c)·3 + j`; field unit per length unit). `out` holds `3·nc` values per node of the piece.
 */
export function pointGradientRange(p: Piece, values: NumericArray, nc: number, from: number, to: number, out: Float64Array): void {
  const np = p.points.length / 3;
  if (!(from >= 0 && to <= np && from <= to)) throw new Error(`gradient: node range ${from}..${to} is outside the piece's ${np} nodes`);
  if (out.length !== 3 * nc * np) throw new Error(`gradient: result holds ${out.length} values, expected ${3 * nc * np} (${np} nodes × ${3 * nc})`);
  pointGradientRangeInto(p, values, nc, from, to, out, 3 * nc * from);
}

/**
 * `pointGradientRange` written to `out` from index `at` on (node `from` first), so a caller may keep only its
 * range (`at` = 0, `out` holding `3·nc·(to − from)` values). The range is not checked.
 */
export function pointGradientRangeInto(p: Piece, values: NumericArray, nc: number, from: number, to: number, out: Float64Array, at: number): void {
  if (from === to) return;
  // the kernel walks the rings in its copy of the mesh (kernelMesh.ts): no rows built here
  const K = (nc === 1 || nc === 3) ? momentKernel() : null;
  if (K && meshInto(K, out, at, p, values, nc, from, to, undefined)) return;
  const stencil = pointStencilOfRange(p, from, to);
  gradientInto(out, at, p.points, values, nc, stencil, undefined, from, to);
}

/** Splits `n` nodes into `parts` contiguous ranges of near-equal size (`parts + 1` bounds, first 0, last n). */
export function nodeRanges(n: number, parts: number): Int32Array {
  const k = Math.max(1, Math.min(parts, n || 1)), bounds = new Int32Array(k + 1);
  for (let i = 0; i <= k; i++) bounds[i] = Math.round((i * n) / k);
  return bounds;
}
