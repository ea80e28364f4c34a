/**
 * Derived fields on the worker pool: the velocity gradient — the costly part of vorticity, Q-criterion, λ₂,
 * helicity — is computed by the pool's workers, each filling one contiguous range of nodes of a shared
 * result (`pointGradientRange`, src/derive/rangeGradient.ts), and handed to the gradient cache, so the
 * derived fields are then attached here by the single-thread code without computing it again. Every node's
 * value is the single-thread kernel's, bit for bit, for any number of workers.
 *
 * Point velocities only: a cell velocity's gradient (cell-centre fit) is left to the single-thread path.
 */
import type { DeriveOptions } from '../derive/derivedFields.ts';
import { gradientFieldFor } from '../derive/derivedFields.ts';
import { primeGradient } from '../derive/fieldGradient.ts';
import { pointGradientRange } from '../derive/rangeGradient.ts';
import type { Dataset } from '../model/dataset.ts';
import { findField } from '../model/piece.ts';
import type { ComputePool } from './pool.ts';

/** A worker's part of a gradient: nodes `from .. to-1` of piece `piece`'s point field `field`, into `out`. */
export interface GradientShare { piece: number; field: string; from: number; to: number; out: Float64Array }

/**
 * Runs one share on the dataset a worker holds (the worker side of `pool.pointGradient`). Returns null when
 * `out` is shared memory (the values are already in place), else the range's values (a platform without
 * shared memory posted a copy of `out`).
 */
export function gradientShare(d: Dataset, s: GradientShare): Float64Array | null {
  const p = d.pieces[s.piece];
  const f = p && findField(p, s.field, 'point');
  if (!p || !f) throw new Error(`worker pool: no point field "${s.field}" on piece ${s.piece} of ${d.source}`);
  pointGradientRange(p, f.values, f.components, s.from, s.to, s.out);
  const w = 3 * f.components;
  return s.out.buffer instanceof ArrayBuffer ? s.out.slice(w * s.from, w * s.to) : null;
}

/**
 * Computes on `pool` the velocity gradient that `withDerivedFields(pool.dataset, names, options)` needs and
 * primes the gradient cache with it; does nothing when no requested field needs a gradient or the velocity
 * is cell data. Returns the number of pieces whose gradient the workers computed.
 */
export async function primeDerivedGradients(pool: ComputePool, names: readonly string[], options: Partial<DeriveOptions> = {}): Promise<number> {
  const d = pool.dataset, info = gradientFieldFor(d, names, options);
  if (!info || info.association !== 'point') return 0;
  let done = 0;
  for (let k = 0; k < d.pieces.length; k++) {
    const f = findField(d.pieces[k]!, info.name, 'point')!;
    primeGradient(f.values, await pool.pointGradient(k, info.name));
    done++;
  }
  return done;
}
