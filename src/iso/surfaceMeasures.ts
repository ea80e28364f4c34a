/**
 * Measures of a welded triangle surface: area, connected pieces, closedness and enclosed volume.
 *
 * Input layout: `positions` xyz interleaved (length unit L), `indices` three vertex numbers per triangle,
 * no triangle repeating a vertex. A piece is a set of triangles connected through shared vertices. A piece is
 * closed when every edge is used by exactly two of its triangles, in opposite directions (consistently
 * oriented); then its enclosed volume is the divergence-theorem sum V = Σ (a − o)·((b − o) × (c − o))/6 over
 * its triangles (o: the piece's bounding-box centre, for round-off), positive when the normals point out of
 * the enclosed region. Anything else is open: `boundaryEdges` counts edges used once, `badEdges` edges used
 * more than twice or twice in the same direction.
 */

/** Measures of one connected piece. */
export interface SurfacePiece {
  readonly triangles: number;
  /** Area (L²). */
  readonly area: number;
  readonly closed: boolean;
  readonly boundaryEdges: number;
  readonly badEdges: number;
  /** Signed enclosed volume (L³) when closed, else null. */
  readonly signedVolume: number | null;
  /** Axis-aligned bounds `[xmin, xmax, ymin, ymax, zmin, zmax]` (L). */
  readonly bounds: readonly [number, number, number, number, number, number];
}

/** Measures of a whole surface. */
export interface SurfaceMeasures {
  /** Total area (L²). */
  readonly area: number;
  /** Piece number of each triangle (pieces ordered by their first triangle). */
  readonly pieceOf: Int32Array;
  readonly pieces: readonly SurfacePiece[];
}

function find(parent: Int32Array, i: number): number {
  while (parent[i] !== i) { parent[i] = parent[parent[i]!]!; i = parent[i]!; }
  return i;
}

/** Area of each triangle (L²). */
export function triangleAreas(positions: Float64Array, indices: Uint32Array): Float64Array {
  const nt = indices.length / 3, out = new Float64Array(nt);
  for (let t = 0; t < nt; t++) {
    const a = 3 * indices[3 * t]!, b = 3 * indices[3 * t + 1]!, c = 3 * indices[3 * t + 2]!;
    const ux = positions[b]! - positions[a]!, uy = positions[b + 1]! - positions[a + 1]!, uz = positions[b + 2]! - positions[a + 2]!;
    const vx = positions[c]! - positions[a]!, vy = positions[c + 1]! - positions[a + 1]!, vz = positions[c + 2]! - positions[a + 2]!;
    out[t] = 0.5 * Math.hypot(uy * vz - uz * vy, uz * vx - ux * vz, ux * vy - uy * vx);
  }
  return out;
}

/** Area, pieces, closedness and volume of a welded triangle surface (see the file comment). */
export function measureSurface(positions: Float64Array, indices: Uint32Array): SurfaceMeasures {
  const nt = indices.length / 3, nv = positions.length / 3;
  const areas = triangleAreas(positions, indices);
  const parent = new Int32Array(nv);
  for (let i = 0; i < nv; i++) parent[i] = i;
  for (let t = 0; t < nt; t++) {
    const a = find(parent, indices[3 * t]!);
    for (let j = 1; j < 3; j++) { const b = find(parent, indices[3 * t + j]!); if (b !== a) parent[b] = a; }
  }
  const rootPiece = new Int32Array(nv).fill(-1), pieceOf = new Int32Array(nt);
  let np = 0;
  for (let t = 0; t < nt; t++) {
    const r = find(parent, indices[3 * t]!);
    if (rootPiece[r]! < 0) rootPiece[r] = np++;
    pieceOf[t] = rootPiece[r]!;
  }
  // Edges as sortable keys: 2·(lo·nv + hi) + (1 when the triangle runs hi → lo).
  const keys = new Float64Array(3 * nt);
  for (let t = 0; t < nt; t++) for (let j = 0; j < 3; j++) {
    const a = indices[3 * t + j]!, b = indices[3 * t + (j + 1) % 3]!;
    keys[3 * t + j] = a < b ? 2 * (a * nv + b) : 2 * (b * nv + a) + 1;
  }
  keys.sort();
  const boundary = new Int32Array(np), bad = new Int32Array(np);
  for (let i = 0; i < keys.length;) {
    const e = Math.floor(keys[i]! / 2);
    let j = i, forward = 0;
    while (j < keys.length && Math.floor(keys[j]! / 2) === e) { if (keys[j]! % 2 === 0) forward++; j++; }
    const p = rootPiece[find(parent, Math.floor(e / nv))]!;
    const uses = j - i;
    if (uses === 1) boundary[p]++; else if (uses !== 2 || forward !== 1) bad[p]++;
    i = j;
  }
  const tris = new Int32Array(np), area = new Float64Array(np), bounds = new Float64Array(6 * np);
  for (let p = 0; p < np; p++) { bounds[6 * p] = bounds[6 * p + 2] = bounds[6 * p + 4] = Infinity; bounds[6 * p + 1] = bounds[6 * p + 3] = bounds[6 * p + 5] = -Infinity; }
  let total = 0;
  for (let t = 0; t < nt; t++) {
    const p = pieceOf[t]!;
    tris[p]++; area[p] += areas[t]!; total += areas[t]!;
    for (let j = 0; j < 3; j++) {
      const v = 3 * indices[3 * t + j]!;
      for (let k = 0; k < 3; k++) {
        const x = positions[v + k]!;
        if (x < bounds[6 * p + 2 * k]!) bounds[6 * p + 2 * k] = x;
        if (x > bounds[6 * p + 2 * k + 1]!) bounds[6 * p + 2 * k + 1] = x;
      }
    }
  }
  const vol = new Float64Array(np);
  for (let t = 0; t < nt; t++) {
    const p = pieceOf[t]!, b6 = 6 * p;
    const ox = 0.5 * (bounds[b6]! + bounds[b6 + 1]!), oy = 0.5 * (bounds[b6 + 2]! + bounds[b6 + 3]!), oz = 0.5 * (bounds[b6 + 4]! + bounds[b6 + 5]!);
    const a = 3 * indices[3 * t]!, b = 3 * indices[3 * t + 1]!, c = 3 * indices[3 * t + 2]!;
    const ax = positions[a]! - ox, ay = positions[a + 1]! - oy, az = positions[a + 2]! - oz;
    const bx = positions[b]! - ox, by = positions[b + 1]! - oy, bz = positions[b + 2]! - oz;
    const cx = positions[c]! - ox, cy = positions[c + 1]! - oy, cz = positions[c + 2]! - oz;
    vol[p] += (ax * (by * cz - bz * cy) + ay * (bz * cx - bx * cz) + az * (bx * cy - by * cx)) / 6;
  }
  const pieces: SurfacePiece[] = [];
  for (let p = 0; p < np; p++) {
    const closed = boundary[p] === 0 && bad[p] === 0;
    const b = bounds.subarray(6 * p, 6 * p + 6);
    pieces.push({
      triangles: tris[p]!, area: area[p]!, closed, boundaryEdges: boundary[p]!, badEdges: bad[p]!,
      signedVolume: closed ? vol[p]! : null, bounds: [b[0]!, b[1]!, b[2]!, b[3]!, b[4]!, b[5]!],
    });
  }
  return { area: total, pieceOf, pieces };
}
