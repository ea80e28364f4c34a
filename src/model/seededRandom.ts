/**
 * Seeded uniform random numbers in [0, 1) (the mulberry32 generator), for reproducible test meshes,
 * fuzz inputs and benchmark probes: the same seed gives the same sequence on every run and platform.
 */
export function seededRandom(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = Math.imul(a ^ (a >>> 15), a | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}
