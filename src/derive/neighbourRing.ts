/**
 * The two-ring of a site for the quadratic gradient fit (quadraticGradient.ts, pairedFit.ts): its one-ring
 * neighbours and theirs, gathered into module scratch, repeats and the site itself left out by stamps.
 */

let ring = new Int32Array(256);
let stamp = new Int32Array(0);

/** Readies the two-ring marks for a pass over sites of a set of `nSites`; call before a run of fits. */
export function beginSites(nSites: number): void {
  if (stamp.length < nSites) stamp = new Int32Array(nSites);
  stamp.fill(-1, 0, nSites);
}

/** The entries the last `twoRing` gathered (its first `twoRing(…)` values; the array is reused). */
export function ringIds(): Int32Array {
  return ring;
}

/**
 * Gathers the two-ring of site `i` (without `i`) into the scratch (`ringIds`); returns its length. `mark` is
 * unique per call since the last `beginSites`. Order: each one-ring neighbour j, then the new entries of j's
 * row, j by j (room made before the walk, so the inner loop only tests and writes).
 */
export function twoRing(so: Int32Array, sid: Int32Array, i: number, mark: number): number {
  const a = so[i]!, b = so[i + 1]!;
  let most = 0;
  for (let s = a; s < b; s++) { const j = sid[s]!; most += so[j + 1]! - so[j]! + 1; }
  if (most > ring.length) ring = new Int32Array(Math.max(most, 2 * ring.length));
  const r = ring, st = stamp;
  let m = 0;
  st[i] = mark;
  for (let s = a; s < b; s++) {
    const j = sid[s]!;
    if (st[j] !== mark) { st[j] = mark; r[m++] = j; }
    for (let t = so[j]!, e = so[j + 1]!; t < e; t++) {
      const q = sid[t]!;
      if (st[q] !== mark) { st[q] = mark; r[m++] = q; }
    }
  }
  return m;
}
