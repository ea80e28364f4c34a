/**
 * The Blasius flat-plate boundary layer for tests: f''' + ½ f f'' = 0, f(0) = f'(0) = 0, f'(∞) = 1,
 * solved by shooting on f''(0) (classical fourth-order Runge–Kutta, secant iteration on f'(η_max) = 1).
 * u/U = f'(η), η = y·√(U/(νx)). Reference values: Blasius, docs/references.md §7 (f''(0) = 0.332057,
 * δ* / x·√Re_x = 1.7208, θ/x·√Re_x = 0.6641, H = 2.591).
 */

export interface BlasiusSolution {
  /** f''(0). */
  fpp0: number;
  /** Step and end of the table. */
  h: number;
  etaMax: number;
  /** f, f', f'' at η = i·h. */
  f: Float64Array;
  fp: Float64Array;
  fpp: Float64Array;
}

function integrate(fpp0: number, h: number, n: number, out?: { f: Float64Array; fp: Float64Array; fpp: Float64Array }): number {
  let f = 0, fp = 0, fpp = fpp0;
  const rhs = (a: number, c: number) => -0.5 * a * c;
  for (let i = 0; i < n; i++) {
    if (out) { out.f[i] = f; out.fp[i] = fp; out.fpp[i] = fpp; }
    const k1f = fp, k1p = fpp, k1q = rhs(f, fpp);
    const k2f = fp + 0.5 * h * k1p, k2p = fpp + 0.5 * h * k1q, k2q = rhs(f + 0.5 * h * k1f, fpp + 0.5 * h * k1q);
    const k3f = fp + 0.5 * h * k2p, k3p = fpp + 0.5 * h * k2q, k3q = rhs(f + 0.5 * h * k2f, fpp + 0.5 * h * k2q);
    const k4f = fp + h * k3p, k4p = fpp + h * k3q, k4q = rhs(f + h * k3f, fpp + h * k3q);
    f += (h / 6) * (k1f + 2 * k2f + 2 * k3f + k4f);
    fp += (h / 6) * (k1p + 2 * k2p + 2 * k3p + k4p);
    fpp += (h / 6) * (k1q + 2 * k2q + 2 * k3q + k4q);
  }
  if (out) { out.f[n] = f; out.fp[n] = fp; out.fpp[n] = fpp; }
  return fp;
}

/** Solves the Blasius equation on [0, etaMax] with step h. */
export function solveBlasius(etaMax = 15, h = 1e-3): BlasiusSolution {
  const n = Math.round(etaMax / h);
  let a = 0.3, b = 0.35, fa = integrate(a, h, n) - 1, fb = integrate(b, h, n) - 1;
  for (let it = 0; it < 50 && Math.abs(fb) > 1e-14; it++) {
    const c = b - fb * (b - a) / (fb - fa);
    a = b; fa = fb; b = c; fb = integrate(b, h, n) - 1;
  }
  const out = { f: new Float64Array(n + 1), fp: new Float64Array(n + 1), fpp: new Float64Array(n + 1) };
  integrate(b, h, n, out);
  return { fpp0: b, h, etaMax: n * h, ...out };
}

/** f'(η) from the table, cubic Hermite between table points (f'' is its derivative); 1 beyond the table. */
export function fPrime(sol: BlasiusSolution, eta: number): number {
  if (eta <= 0) return 0;
  if (eta >= sol.etaMax) return sol.fp[sol.fp.length - 1]!;
  const x = eta / sol.h, i = Math.min(Math.floor(x), sol.fp.length - 2), t = x - i;
  const p0 = sol.fp[i]!, p1 = sol.fp[i + 1]!, m0 = sol.fpp[i]! * sol.h, m1 = sol.fpp[i + 1]! * sol.h;
  const t2 = t * t, t3 = t2 * t;
  return (2 * t3 - 3 * t2 + 1) * p0 + (t3 - 2 * t2 + t) * m0 + (-2 * t3 + 3 * t2) * p1 + (t3 - t2) * m1;
}

/** f(η) from the table (linear between points; used only for the normal velocity). */
export function fValue(sol: BlasiusSolution, eta: number): number {
  if (eta <= 0) return 0;
  if (eta >= sol.etaMax) return sol.f[sol.f.length - 1]! + (eta - sol.etaMax);
  const x = eta / sol.h, i = Math.min(Math.floor(x), sol.f.length - 2), t = x - i;
  return (1 - t) * sol.f[i]! + t * sol.f[i + 1]!;
}
