/**
 * Face keys and an open-addressing face table in typed arrays (no strings, no object per face).
 *
 * Key of a face: its node ids (merged numbering) sorted ascending, as four int32 `k0..k3`:
 *  - triangle: the three ids, `k3 = −1`;
 *  - quadrilateral: the four ids;
 *  - n > 4 nodes: the three smallest ids and `k3 = −2 − h`, h a 30-bit hash of n and the remaining sorted ids.
 *    Two distinct faces of a valid mesh do not share three corners, so such keys are exact in practice.
 * The key does not depend on the node order, so a face seen from its two cells gets one key.
 *
 * Table layout: slot s holds `keys[4s..4s+3]` (k0 = −1 marks an empty slot) and two int32 values
 * `vals[2s], vals[2s+1]` (for boundary extraction: global cell and local face). Linear probing with
 * backward-shift deletion, so removed slots leave no tombstones; the table doubles when half full.
 */

/** Scratch for sorting a face's ids; grows when a longer face appears. */
let sortBuf = new Int32Array(64);

/**
 * Writes the key of the face with ids `ids[start .. start+n-1]` (already in merged numbering when `map` is
 * null, else mapped through `map[offset + id]`) into `out[0..3]`.
 */
export function faceKey(ids: ArrayLike<number>, start: number, n: number, map: Int32Array | null, offset: number, out: Int32Array): void {
  if (sortBuf.length < n) sortBuf = new Int32Array(2 * n);
  const s = sortBuf;
  for (let j = 0; j < n; j++) {
    const v = map ? map[offset + ids[start + j]!]! : ids[start + j]!;
    let i = j;
    while (i > 0 && s[i - 1]! > v) { s[i] = s[i - 1]!; i--; }
    s[i] = v;
  }
  out[0] = s[0]!; out[1] = n > 1 ? s[1]! : -1; out[2] = n > 2 ? s[2]! : -1;
  if (n <= 3) out[3] = -1;
  else if (n === 4) out[3] = s[3]!;
  else {
    let h = n;
    for (let j = 3; j < n; j++) { h = Math.imul(h ^ s[j]!, 0x9e3779b1); h ^= h >>> 16; }
    out[3] = -2 - (h & 0x3fffffff);
  }
}

/** Hash of a key (also used inline by boundary extraction; keep the two in step). */
export function keyHash(k0: number, k1: number, k2: number, k3: number): number {
  let h = Math.imul(k0, 0x9e3779b1) ^ Math.imul(k1, 0x85ebca77) ^ Math.imul(k2, 0xc2b2ae3d) ^ Math.imul(k3, 0x27d4eb2f);
  h ^= h >>> 15;
  h = Math.imul(h, 0x2c1b3c6d);
  h ^= h >>> 12;
  return h;
}

/** An open-addressing table from face keys to two int32 values. */
export class FaceTable {
  keys: Int32Array;
  vals: Int32Array;
  mask: number;
  live = 0;

  constructor(expected: number) {
    let size = 1024;
    while (size < 2 * expected) size *= 2;
    this.keys = new Int32Array(4 * size).fill(-1);
    this.vals = new Int32Array(2 * size);
    this.mask = size - 1;
  }

  /** Slot holding the key, or −1. */
  find(k0: number, k1: number, k2: number, k3: number): number {
    const keys = this.keys, mask = this.mask;
    for (let s = keyHash(k0, k1, k2, k3) & mask; ; s = (s + 1) & mask) {
      const b = 4 * s, e = keys[b]!;
      if (e === -1) return -1;
      if (e === k0 && keys[b + 1] === k1 && keys[b + 2] === k2 && keys[b + 3] === k3) return s;
    }
  }

  /** Inserts the key with values (v0, v1) unless present; returns the slot of the key (existing or new). */
  insert(k0: number, k1: number, k2: number, k3: number, v0: number, v1: number): number {
    if (2 * (this.live + 1) > this.mask + 1) this.grow();
    const keys = this.keys, mask = this.mask;
    for (let s = keyHash(k0, k1, k2, k3) & mask; ; s = (s + 1) & mask) {
      const b = 4 * s, e = keys[b]!;
      if (e === -1) {
        keys[b] = k0; keys[b + 1] = k1; keys[b + 2] = k2; keys[b + 3] = k3;
        this.vals[2 * s] = v0; this.vals[2 * s + 1] = v1;
        this.live++;
        return s;
      }
      if (e === k0 && keys[b + 1] === k1 && keys[b + 2] === k2 && keys[b + 3] === k3) return s;
    }
  }

  /**
   * Inserts the key, or removes it when present (a face seen a second time is interior).
   * Returns true when the key was inserted.
   */
  toggle(k0: number, k1: number, k2: number, k3: number, v0: number, v1: number): boolean {
    const keys = this.keys, mask = this.mask;
    for (let s = keyHash(k0, k1, k2, k3) & mask; ; s = (s + 1) & mask) {
      const b = 4 * s, e = keys[b]!;
      if (e === -1) {
        keys[b] = k0; keys[b + 1] = k1; keys[b + 2] = k2; keys[b + 3] = k3;
        this.vals[2 * s] = v0; this.vals[2 * s + 1] = v1;
        if (2 * ++this.live > mask + 1) this.grow();
        return true;
      }
      if (e === k0 && keys[b + 1] === k1 && keys[b + 2] === k2 && keys[b + 3] === k3) {
        this.removeSlot(s);
        return false;
      }
    }
  }

  /** Removes the entry in slot `s`, shifting later entries of its probe run back (no tombstones). */
  removeSlot(s: number): void {
    const keys = this.keys, vals = this.vals, mask = this.mask;
    let i = s;
    for (let j = (s + 1) & mask; ; j = (j + 1) & mask) {
      const b = 4 * j;
      if (keys[b] === -1) break;
      const home = keyHash(keys[b]!, keys[b + 1]!, keys[b + 2]!, keys[b + 3]!) & mask;
      // Entry j may move to i only if its home slot is not cyclically within (i, j].
      if (i <= j ? i < home && home <= j : i < home || home <= j) continue;
      const a = 4 * i;
      keys[a] = keys[b]!; keys[a + 1] = keys[b + 1]!; keys[a + 2] = keys[b + 2]!; keys[a + 3] = keys[b + 3]!;
      vals[2 * i] = vals[2 * j]!; vals[2 * i + 1] = vals[2 * j + 1]!;
      i = j;
    }
    keys[4 * i] = -1;
    this.live--;
  }

  private grow(): void {
    const oldKeys = this.keys, oldVals = this.vals, oldSize = this.mask + 1;
    const size = 2 * oldSize;
    this.keys = new Int32Array(4 * size).fill(-1);
    this.vals = new Int32Array(2 * size);
    this.mask = size - 1;
    const keys = this.keys, vals = this.vals, mask = this.mask;
    for (let o = 0; o < oldSize; o++) {
      const b = 4 * o;
      if (oldKeys[b] === -1) continue;
      let s = keyHash(oldKeys[b]!, oldKeys[b + 1]!, oldKeys[b + 2]!, oldKeys[b + 3]!) & mask;
      while (keys[4 * s] !== -1) s = (s + 1) & mask;
      keys.set(oldKeys.subarray(b, b + 4), 4 * s);
      vals[2 * s] = oldVals[2 * o]!; vals[2 * s + 1] = oldVals[2 * o + 1]!;
    }
  }
}
