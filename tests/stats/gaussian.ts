/** Seeded standard normal numbers for the statistics tests (Box–Muller on the project's seeded generator). */
import { seededRandom } from '../../src/model/seededRandom.ts';

export function seededNormal(seed: number): () => number {
  const u = seededRandom(seed);
  let spare: number | null = null;
  return () => {
    if (spare !== null) { const s = spare; spare = null; return s; }
    const r = Math.sqrt(-2 * Math.log(1 - u())), a = 2 * Math.PI * u();
    spare = r * Math.sin(a);
    return r * Math.cos(a);
  };
}

/** AR(1) x_n = φx_{n−1} + e_n, e ~ N(0, s²), started in its stationary distribution. */
export function ar1(n: number, phi: number, s: number, seed: number): Float64Array {
  const g = seededNormal(seed);
  const x = new Float64Array(n);
  x[0] = (s / Math.sqrt(1 - phi * phi)) * g();
  for (let i = 1; i < n; i++) x[i] = phi * x[i - 1]! + s * g();
  return x;
}

/** Strictly increasing times with steps h·(1 ± jitter) (uniform jitter), from t0. */
export function jitteredTimes(n: number, h: number, jitter: number, seed: number, t0 = 0): Float64Array {
  const r = seededRandomFrom(seed);
  const t = new Float64Array(n);
  t[0] = t0;
  for (let i = 1; i < n; i++) t[i] = t[i - 1]! + h * (1 + jitter * (2 * r() - 1));
  return t;
}

function seededRandomFrom(seed: number): () => number {
  return seededRandom(seed ^ 0x5bd1e995);
}
