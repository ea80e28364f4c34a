/**
 * Two-sided quantiles of Student's t distribution, computed (not tabled) from the closed finite sums
 * for the probability A(t|ν) = P(|T| ≤ t) with integer degrees of freedom ν
 * (Abramowitz & Stegun 1964, Handbook of Mathematical Functions, eq. 26.7.3 for odd ν and 26.7.4 for even ν),
 * inverted by bisection. Pure: no DOM.
 */

/** Above this many degrees of freedom the sums are long and t differs from ν = ∞ by < 3e-5 relative. */
const MAX_DOF = 100_000;

/**
 * A(t|ν) = P(|T| ≤ t) for Student's t with ν ≥ 1 integer degrees of freedom (A&S 26.7.3/26.7.4),
 * with θ = atan(t/√ν).
 */
export function studentTwoSidedProbability(t: number, dof: number): number {
  if (!(t >= 0)) return 0;
  if (t === Infinity) return 1;
  const nu = Math.min(Math.floor(dof), MAX_DOF);
  const theta = Math.atan(t / Math.sqrt(nu));
  const c2 = Math.cos(theta) ** 2, s = Math.sin(theta);
  if (nu % 2 === 1) {
    // odd ν: (2/π)[θ + sinθ cosθ (1 + (2/3)cos²θ + (2·4)/(3·5)cos⁴θ + … up to cos^{ν−3}θ)]
    let term = 1, sum = nu > 1 ? 1 : 0;
    for (let k = 3; k <= nu - 2; k += 2) { term *= ((k - 1) / k) * c2; sum += term; }
    return (2 / Math.PI) * (theta + s * Math.cos(theta) * sum);
  }
  // even ν: sinθ (1 + (1/2)cos²θ + (1·3)/(2·4)cos⁴θ + … up to cos^{ν−2}θ)
  let term = 1, sum = 1;
  for (let k = 2; k <= nu - 2; k += 2) { term *= ((k - 1) / k) * c2; sum += term; }
  return s * sum;
}

/**
 * t such that P(|T| ≤ t) = `coverage` for Student's t with `dof` degrees of freedom (dof rounded down,
 * at least 1): e.g. `studentQuantile(0.95, 10)` = 2.228. Throws for coverage outside (0, 1) or dof < 1.
 */
export function studentQuantile(coverage: number, dof: number): number {
  if (!(coverage > 0 && coverage < 1)) throw new Error(`studentQuantile: coverage ${coverage} is not in (0, 1)`);
  if (!(dof >= 1)) throw new Error(`studentQuantile: ${dof} degrees of freedom; at least 1 expected`);
  let lo = 0, hi = 1;
  while (studentTwoSidedProbability(hi, dof) < coverage) hi *= 2;
  for (let i = 0; i < 200 && hi - lo > 1e-14 * hi; i++) {
    const mid = 0.5 * (lo + hi);
    if (studentTwoSidedProbability(mid, dof) < coverage) lo = mid; else hi = mid;
  }
  return 0.5 * (lo + hi);
}
