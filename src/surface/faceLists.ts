/**
 * Unmatched faces of boundary extraction, listed under their smallest node: the faces met once so far, each
 * found again through `head[k0]` (k0 = the smallest id of its key, see `faceKey` in faceTable.ts) and a short
 * chain of entries, with no hashing. A face met a second time is interior and leaves its list; what stays at
 * the end is the boundary.
 *
 * Why lists and not a hash table: a cell's nodes are numbered near the cells before it in any file written in a
 * sensible order, so `head` is read almost in sequence and the chains are a few entries long (a node is the
 * smallest of at most a dozen faces of a hexahedral mesh); freed entries are reused first, so the entries in use
 * stay about the front between cells seen and not yet seen plus the boundary found so far. A hash table spreads
 * the same faces over a table that must be kept small by retiring final faces, and paid more per face
 * (1M hexahedra: ~270 ms against ~110 ms here, `npm run bench -- surface`).
 *
 * Layout: entry e holds `E[6e .. 6e+5]` = next entry in its list (−1 ends it), k1, k2, k3 of the key, and the two
 * values (for boundary extraction: global cell, local face; cell −1 marks a free entry). `head` has one int32 per
 * merged point (−1: no list).
 */

/** Int32 slots per entry: next, k1, k2, k3, value 0, value 1. */
const STRIDE = 6;

export class FaceLists {
  /** First entry of each node's list, −1 when none. */
  readonly head: Int32Array;
  /** Entries, `STRIDE` int32 each (see the file comment). */
  entries: Int32Array;
  /** Entries handed out so far (free ones included). */
  used = 0;
  /** Faces listed now. */
  live = 0;
  /** First free entry, −1 when none. */
  private free = -1;

  /** `nodes`: merged point count (keys' k0 lie in 0 … nodes − 1); `expected`: entries to start with. */
  constructor(nodes: number, expected: number) {
    this.head = new Int32Array(nodes).fill(-1);
    this.entries = new Int32Array(STRIDE * Math.max(1024, expected));
  }

  /**
   * Lists the face with key (k0, k1, k2, k3) and values (v0, v1), or, when it is listed already, removes it (a
   * face seen a second time is interior). Returns true when the face was listed.
   */
  toggle(k0: number, k1: number, k2: number, k3: number, v0: number, v1: number): boolean {
    const E = this.entries, head = this.head;
    let prev = -1;
    for (let e = head[k0]!; e !== -1;) {
      const b = STRIDE * e;
      if (E[b + 1] === k1 && E[b + 2] === k2 && E[b + 3] === k3) {
        if (prev === -1) head[k0] = E[b]!; else E[STRIDE * prev] = E[b]!;
        E[b] = this.free; E[b + 4] = -1;
        this.free = e;
        this.live--;
        return false;
      }
      prev = e;
      e = E[b]!;
    }
    let e = this.free;
    if (e !== -1) this.free = E[STRIDE * e]!;
    else {
      if (this.used * STRIDE === E.length) this.grow();
      e = this.used++;
    }
    const F = this.entries, b = STRIDE * e;
    F[b] = head[k0]!; F[b + 1] = k1; F[b + 2] = k2; F[b + 3] = k3; F[b + 4] = v0; F[b + 5] = v1;
    head[k0] = e;
    this.live++;
    return true;
  }

  /** Writes `v0 × slots + v1` of every listed face into `out` from `at`; returns the index after the last. */
  valueKeys(slots: number, out: Float64Array, at: number): number {
    const E = this.entries;
    for (let e = 0; e < this.used; e++) {
      const b = STRIDE * e;
      if (E[b + 4]! >= 0) out[at++] = E[b + 4]! * slots + E[b + 5]!;
    }
    return at;
  }

  private grow(): void {
    const next = new Int32Array(2 * this.entries.length);
    next.set(this.entries);
    this.entries = next;
  }
}
