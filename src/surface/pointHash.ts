/**
 * A spatial hash of points for "is there already a point within `tol` of here?" queries, in typed arrays.
 *
 * Layout: space is cut into cubes of edge `h ≥ tol` from an origin; a cube (ix, iy, iz) hashes to a bucket of
 * `head`; points of a bucket are chained through `next`. Bucket collisions between different cubes are harmless
 * because every candidate is checked by distance. A query looks at the 27 cubes around the point, so any
 * stored point within `tol` is found. Coordinates are in the dataset's length unit.
 */

export class PointHash {
  private readonly head: Int32Array;
  private readonly next: Int32Array;
  private readonly ids: Int32Array;
  private readonly xyz: Float64Array;
  private readonly mask: number;
  private readonly inv: number;
  private readonly tol2: number;
  private count = 0;

  /**
   * @param capacity most points that will be inserted
   * @param origin  [x, y, z] of the lattice origin (use the bounds' minimum, so cube indices stay small)
   * @param tol     match distance (length unit); must be > 0
   */
  constructor(capacity: number, private readonly origin: readonly [number, number, number], tol: number) {
    let size = 1024;
    while (size < 2 * capacity) size *= 2;
    this.head = new Int32Array(size).fill(-1);
    this.mask = size - 1;
    this.next = new Int32Array(capacity);
    this.ids = new Int32Array(capacity);
    this.xyz = new Float64Array(3 * capacity);
    this.inv = 1 / tol;
    this.tol2 = tol * tol;
  }

  private bucket(ix: number, iy: number, iz: number): number {
    let h = Math.imul(ix | 0, 0x9e3779b1) ^ Math.imul(iy | 0, 0x85ebca77) ^ Math.imul(iz | 0, 0xc2b2ae3d);
    h ^= h >>> 15;
    h = Math.imul(h, 0x2c1b3c6d);
    h ^= h >>> 12;
    return h & this.mask;
  }

  /** Stores a point with an id (any integer the caller chooses). */
  insert(x: number, y: number, z: number, id: number): void {
    const i = this.count++;
    this.xyz[3 * i] = x; this.xyz[3 * i + 1] = y; this.xyz[3 * i + 2] = z;
    this.ids[i] = id;
    const b = this.bucket(Math.floor((x - this.origin[0]) * this.inv), Math.floor((y - this.origin[1]) * this.inv),
      Math.floor((z - this.origin[2]) * this.inv));
    this.next[i] = this.head[b]!;
    this.head[b] = i;
  }

  /**
   * Id of the nearest stored point within `tol` of (x, y, z) whose id is below `idLimit`, or −1.
   * (`idLimit` lets a caller match only points inserted for earlier pieces.)
   */
  nearest(x: number, y: number, z: number, idLimit = 2147483647): number {
    const cx = Math.floor((x - this.origin[0]) * this.inv), cy = Math.floor((y - this.origin[1]) * this.inv);
    const cz = Math.floor((z - this.origin[2]) * this.inv);
    const xyz = this.xyz, ids = this.ids, next = this.next;
    let best = -1, bestD = this.tol2;
    for (let dz = -1; dz <= 1; dz++) for (let dy = -1; dy <= 1; dy++) for (let dx = -1; dx <= 1; dx++) {
      for (let i = this.head[this.bucket(cx + dx, cy + dy, cz + dz)]!; i >= 0; i = next[i]!) {
        if (ids[i]! >= idLimit) continue;
        const ex = xyz[3 * i]! - x, ey = xyz[3 * i + 1]! - y, ez = xyz[3 * i + 2]! - z;
        const d = ex * ex + ey * ey + ez * ez;
        if (d <= bestD && (best < 0 || d < bestD || ids[i]! < best)) { best = ids[i]!; bestD = d; }
      }
    }
    return best;
  }
}
