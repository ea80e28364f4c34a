/**
 * Corner velocity gradients of the second-order wall traction (`cornerGradients` in `wallTraction.ts`)
 * through a plan kept with the mesh: which wall nodes are fitted, which corner reads which node, and the
 * quadratic fit at each node as a linear operator (`src/derive/gradientOperator.ts`) — all of it geometry.
 * The steps of a series on one mesh share one boundary-face object (`surfaceCache.ts`, keyed by
 * `meshKey`), so a force total or wall quantity at every step pays for the stencils and the fits once and
 * then three multiply-adds per neighbour and velocity component; results equal the uncached kernel's to
 * rounding. Plans are kept per boundary-face object and face selection (a few per mesh), and checked
 * against each piece's geometry arrays on every use, so a changed mesh gets a new plan.
 *
 * An operator stores about 28 bytes per neighbour of every wall node; a wall whose plan would exceed
 * `wallPlanAllowance` is fitted by the kernel at every call instead (remembered, so it is not retried).
 */
import type { Dataset } from '../model/dataset.ts';
import type { FieldArray } from '../model/fieldArray.ts';
import { sameBytes } from '../model/sameBytes.ts';
import { applyGradientOperator, gradientOperator, type GradientOperator } from '../derive/gradientOperator.ts';
import { pointStencilAround } from '../derive/localStencil.ts';
import type { BoundaryFaces } from './boundaryFaces.ts';
import { hasPrimedGradient, pointGradientAt } from '../derive/fieldGradient.ts';
import { cornersFromNodes, wallNodes, type WallNodes } from './wallTraction.ts';

/**
 * How large a plan may be (bytes) for one face selection: `shareOfGeometry` times the bytes of the mesh's
 * geometry arrays (points, cell types, offsets, connectivity of the pieces it touches), but at least
 * `minBytes` and at most `maxBytes`. Larger walls use the kernel at every call, so a one-off force total on
 * a large file does not leave a large plan behind.
 */
export const WALL_PLAN_LIMITS = { shareOfGeometry: 0.5, minBytes: 16 * 1024 * 1024, maxBytes: 64 * 1024 * 1024 };

/** The plan size allowed beside pieces whose geometry arrays hold `geometryBytes` (see `WALL_PLAN_LIMITS`). */
export function wallPlanAllowance(geometryBytes: number): number {
  const l = WALL_PLAN_LIMITS;
  return Math.min(l.maxBytes, Math.max(l.minBytes, l.shareOfGeometry * geometryBytes));
}
/** Neighbours per wall node assumed when estimating a plan's size before building it (a hexahedral node's 5 × 5 × 3 two-ring). */
const NEIGHBOURS_ESTIMATE = 75;
/** Plans kept per boundary-face object (different face selections of one mesh). */
const PLANS_PER_MESH = 4;

interface PiecePlan {
  /** The geometry the operator was built on. */
  points: Float64Array;
  connectivity: Int32Array;
  offsets: Int32Array;
  op: GradientOperator;
}

interface Plan {
  selection: Int32Array;
  /** Per piece: its operator, or null when no selected face is on it. */
  pieces: (PiecePlan | null)[];
  /** The selection's wall nodes per piece (each operator's targets) and the node each corner reads. */
  nodes: WallNodes;
  /** False when the plan would be too large (kernel at every call). */
  cached: boolean;
  bytes: number;
}

const plans = new WeakMap<BoundaryFaces, Plan[]>();

function fits(plan: Plan, d: Dataset): boolean {
  if (plan.pieces.length !== d.pieces.length) return false;
  return plan.pieces.every((pp, k) => {
    const p = d.pieces[k]!;
    return pp === null || (pp.points === p.points && pp.connectivity === p.connectivity && pp.offsets === p.offsets);
  });
}

function build(d: Dataset, faces: BoundaryFaces, selection: Int32Array, offsets: Int32Array): Plan {
  const nodes = wallNodes(d, faces, selection, offsets), targets = nodes.perPiece;
  const pieces: (PiecePlan | null)[] = d.pieces.map(() => null);
  const nodesTotal = targets.reduce((n, t) => n + t.length, 0);
  const plan: Plan = { selection: selection.slice(), pieces, nodes, cached: false, bytes: 0 };
  let geometryBytes = 0;
  d.pieces.forEach((p, k) => { if (targets[k]!.length) geometryBytes += p.points.byteLength + p.cellTypes.byteLength + p.offsets.byteLength + p.connectivity.byteLength; });
  const allowed = wallPlanAllowance(geometryBytes);
  if (nodesTotal * NEIGHBOURS_ESTIMATE * 28 > allowed) return plan;
  let bytes = nodes.cornerRow.byteLength + nodes.facePiece.byteLength + plan.selection.byteLength + targets.reduce((n, t) => n + t.byteLength, 0);
  for (let k = 0; k < d.pieces.length; k++) {
    if (targets[k]!.length === 0) continue;
    const p = d.pieces[k]!;
    const op = gradientOperator(p.points, pointStencilAround(p, targets[k]!), targets[k]!);
    bytes += op.bytes;
    if (bytes > allowed) return { ...plan, pieces: d.pieces.map(() => null) };
    pieces[k] = { points: p.points, connectivity: p.connectivity, offsets: p.offsets, op };
  }
  return { ...plan, cached: true, bytes };
}

function planFor(d: Dataset, faces: BoundaryFaces, selection: Int32Array, offsets: Int32Array): Plan {
  let list = plans.get(faces);
  if (!list) { list = []; plans.set(faces, list); }
  const i = list.findIndex((p) => sameBytes(p.selection, selection) && fits(p, d));
  if (i >= 0) return list[i]!;
  const plan = build(d, faces, selection, offsets);
  list.unshift(plan);
  if (list.length > PLANS_PER_MESH) list.length = PLANS_PER_MESH;
  return plan;
}

/**
 * The velocity gradients at the corners of the selected faces, as `cornerGradients` (9 per corner, ∂u_i/∂x_j
 * at `9·corner + 3i + j`, velocity unit per length unit; `offsets` the selection's corner offsets), from the
 * mesh's cached plan (see the file comment).
 */
export function wallCornerGradients(d: Dataset, faces: BoundaryFaces, selection: Int32Array, offsets: Int32Array,
  vel: readonly (FieldArray | undefined)[]): Float64Array {
  const g = wallNodeGradients(d, faces, selection, offsets, vel);
  return cornersFromNodes(g.nodes, offsets, g.byPiece);
}

/**
 * The velocity gradient at each wall node of the selected faces (9 per node, ∂u_i/∂x_j at `9·row + 3i + j` of
 * `byPiece[k]` for the node `nodes.perPiece[k][row]`; velocity unit per length unit), each node once: from the
 * mesh's cached plan when it has one, else by the kernel (`pointGradientAt`: over the wall nodes' own rows,
 * or values primed by the worker pool). `wallCornerGradients` without the per-corner copy (`nodeTraction`
 * reads these directly).
 */
export function wallNodeGradients(d: Dataset, faces: BoundaryFaces, selection: Int32Array, offsets: Int32Array,
  vel: readonly (FieldArray | undefined)[]): { nodes: WallNodes; byPiece: (Float64Array | null)[] } {
  const primed = vel.some((v) => v && hasPrimedGradient(v.values));
  const plan = primed ? null : planFor(d, faces, selection, offsets);
  if (!plan || !plan.cached || vel.some((v, k) => plan.pieces[k] && (!v || v.components !== 3 || v.association !== 'point'))) {
    const nodes = plan ? plan.nodes : wallNodes(d, faces, selection, offsets);
    return { nodes, byPiece: nodes.perPiece.map((n, k) => (n.length ? pointGradientAt(d.pieces[k]!, vel[k]!, n) : null)) };
  }
  return { nodes: plan.nodes, byPiece: plan.pieces.map((pp, k) => (pp ? applyGradientOperator(pp.op, vel[k]!.values, 3) : null)) };
}

/** Bytes held by the plans cached for `faces` (for benchmarks and memory accounting). */
export function wallPlanBytes(faces: BoundaryFaces): number {
  return (plans.get(faces) ?? []).reduce((n, p) => n + p.bytes, 0);
}
