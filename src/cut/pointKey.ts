/**
 * Exact point identity in typed arrays: two points are the same when their coordinates are equal bit for
 * bit (−0 and +0 count as equal). The cut computes each crossing from the edge's two end points with a
 * formula that is symmetric in them (see `cutPlane.ts`), so the same mesh edge yields the same bits in
 * every cell and every piece that holds it; this index turns those positions into small integer ids.
 *
 * Layout: open addressing over a power-of-two table `slot → id + 1` (0 = empty); coordinates of id `i`
 * at `xyz[3i .. 3i+2]`.
 */

const f64 = new Float64Array(1);
const u32 = new Uint32Array(f64.buffer);

/** A 32-bit hash of the bits of (x, y, z). */
export function hashPoint(x: number, y: number, z: number): number {
  let h = 0x811c9dc5;
  f64[0] = x + 0; h = Math.imul(h ^ u32[0]!, 0x01000193); h = Math.imul(h ^ u32[1]!, 0x01000193);
  f64[0] = y + 0; h = Math.imul(h ^ u32[0]!, 0x01000193); h = Math.imul(h ^ u32[1]!, 0x01000193);
  f64[0] = z + 0; h = Math.imul(h ^ u32[0]!, 0x01000193); h = Math.imul(h ^ u32[1]!, 0x01000193);
  h ^= h >>> 16; h = Math.imul(h, 0x85ebca6b); h ^= h >>> 13;
  return h >>> 0;
}

/** Maps exact positions to dense ids 0, 1, 2, … in order of first appearance. */
export class ExactPointIndex {
  private table: Int32Array;
  private mask: number;
  private xyz: Float64Array;
  /** Number of distinct points so far. */
  count = 0;

  /** @param capacity expected number of distinct points (the table grows past it when needed) */
  constructor(capacity: number) {
    let size = 64;
    while (size < 2 * capacity) size *= 2;
    this.table = new Int32Array(size);
    this.mask = size - 1;
    this.xyz = new Float64Array(3 * Math.max(16, capacity));
  }

  /** Id of the point (x, y, z), adding it if new. */
  idOf(x: number, y: number, z: number): number {
    x += 0; y += 0; z += 0;
    let s = hashPoint(x, y, z) & this.mask;
    const t = this.table, xyz = this.xyz;
    for (;;) {
      const e = t[s]!;
      if (e === 0) break;
      const i = 3 * (e - 1);
      if (xyz[i] === x && xyz[i + 1] === y && xyz[i + 2] === z) return e - 1;
      s = (s + 1) & this.mask;
    }
    const id = this.count++;
    if (3 * this.count > xyz.length) { const b = new Float64Array(2 * xyz.length); b.set(xyz); this.xyz = b; }
    this.xyz[3 * id] = x; this.xyz[3 * id + 1] = y; this.xyz[3 * id + 2] = z;
    t[s] = id + 1;
    if (2 * this.count > t.length) this.rehash();
    return id;
  }

  private rehash(): void {
    const size = 2 * this.table.length, t = new Int32Array(size), mask = size - 1, xyz = this.xyz;
    for (let id = 0; id < this.count; id++) {
      let s = hashPoint(xyz[3 * id]!, xyz[3 * id + 1]!, xyz[3 * id + 2]!) & mask;
      while (t[s] !== 0) s = (s + 1) & mask;
      t[s] = id + 1;
    }
    this.table = t;
    this.mask = mask;
  }
}
