/**
 * Quality figures of a set of boundary faces: wetted area, closure and orientation consistency.
 *
 * For a closed surface ∮ n dA = 0, so |Σ A_f| / Σ |A_f| measures how far a group is from closed (rounding
 * level, ~1e-15, for a closed one). Edge counts say why a surface is not closed, so the caller reports it rather
 * than hiding it: an open edge is used by one face of the set; a non-manifold edge by three or more; an
 * inconsistent edge by two faces that traverse it in the same direction (their normals disagree).
 */
import type { BoundaryFaces } from './boundaryFaces.ts';
import { faceEdges } from './faceEdges.ts';

export interface SurfaceQuality {
  faces: number;
  /** Wetted area Σ|A_f| (length unit²). */
  area: number;
  /** ∮ n dA = Σ A_f (length unit²), outward from the fluid. */
  netAreaVector: [number, number, number];
  /** |Σ A_f| / Σ |A_f| (dimensionless); ~1e-15 for a closed surface. NaN for an empty set. */
  closure: number;
  edges: number;
  openEdges: number;
  nonManifoldEdges: number;
  inconsistentEdges: number;
  /** True when every edge is used by exactly two faces traversing it in opposite directions. */
  closed: boolean;
  /** True when no edge is traversed twice in the same direction. */
  consistentlyOriented: boolean;
}

/** Quality figures of the faces in `selection` (boundary face numbers), or of all boundary faces. */
export function surfaceQuality(faces: BoundaryFaces, selection?: ArrayLike<number>): SurfaceQuality {
  const n = selection ? selection.length : faces.count;
  const av = faces.areaVector;
  let area = 0, sx = 0, sy = 0, sz = 0;
  for (let i = 0; i < n; i++) {
    const f = selection ? selection[i]! : i;
    const x = av[3 * f]!, y = av[3 * f + 1]!, z = av[3 * f + 2]!;
    sx += x; sy += y; sz += z;
    area += Math.sqrt(x * x + y * y + z * z);
  }
  const e = faceEdges(faces, selection);
  let open = 0, nonManifold = 0, inconsistent = 0;
  for (let i = 0; i < e.count; i++) {
    const u = e.uses[i]!;
    if (u === 1) open++;
    else if (u > 2) nonManifold++;
    else if (e.forward[i] !== 1) inconsistent++;
  }
  return {
    faces: n, area, netAreaVector: [sx, sy, sz], closure: n === 0 ? NaN : Math.hypot(sx, sy, sz) / area,
    edges: e.count, openEdges: open, nonManifoldEdges: nonManifold, inconsistentEdges: inconsistent,
    closed: n > 0 && open === 0 && nonManifold === 0 && inconsistent === 0,
    consistentlyOriented: inconsistent === 0,
  };
}

/** Edge counts of a surface, as `surfaceQuality` gives them (or the worker passes them on). */
export type EdgeCounts = Pick<SurfaceQuality, 'closed' | 'openEdges' | 'nonManifoldEdges' | 'inconsistentEdges'>;

/**
 * The note for a force total on a surface that is not closed (`surface not closed (12 open edges): …`), or
 * undefined for a closed one. An open surface is often intended (a wall meeting a symmetry plane or an
 * outlet), but its force total then covers the chosen faces only, so the reader is told.
 */
export function openSurfaceNote(q: EdgeCounts): string | undefined {
  if (q.closed) return undefined;
  const parts: [number, string][] = [[q.openEdges, 'open'], [q.nonManifoldEdges, 'non-manifold'], [q.inconsistentEdges, 'with disagreeing normals']];
  const why = parts.filter(([n]) => n > 0).map(([n, what]) => `${n} ${what} edge${n === 1 ? '' : 's'}`).join(', ');
  return `surface not closed (${why || 'no faces'}): the total covers the chosen faces only`;
}
