/**
 * Quadrature rules used by the surface integrals.
 *
 * - `TRI7`: the 7-point triangle rule of degree 3 — the three vertices (weight 3/60 each), the three edge
 *   midpoints (8/60) and the centroid (27/60). It integrates every polynomial of degree ≤ 3 exactly, so a
 *   product of three fields that are linear over the triangle (ρ · u·n · φ) is integrated exactly. The
 *   weights are given, from memory, in Zienkiewicz & Taylor, *The Finite Element Method*, vol. 1, table of
 *   triangle rules ("cubic, 7 points"); `tests/cut/quadrature.test.ts` re-derives exactness on all monomials.
 *   Its points are vertices, midpoints and the centroid, so values of linear fields there are plain means
 *   of vertex values.
 * - Gauss–Legendre rules on [−1, 1] (computed once by Newton's method on the Legendre recurrence).
 * - `circularSegmentRule`: points and weights over a circular segment, exact to rounding for polynomials
 *   of low degree (see the function).
 */

/** Barycentric coordinates (3 per point) and weights (summing to 1, multiply by the area) of the degree-3 rule. */
export const TRI7 = {
  bary: Float64Array.of(
    1, 0, 0, 0, 1, 0, 0, 0, 1,
    0.5, 0.5, 0, 0, 0.5, 0.5, 0.5, 0, 0.5,
    1 / 3, 1 / 3, 1 / 3,
  ),
  weight: Float64Array.of(3 / 60, 3 / 60, 3 / 60, 8 / 60, 8 / 60, 8 / 60, 27 / 60),
  points: 7,
} as const;

/** Gauss–Legendre nodes and weights for n points on [−1, 1]. */
export function gaussLegendre(n: number): { x: Float64Array; w: Float64Array } {
  const x = new Float64Array(n), w = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    let z = Math.cos(Math.PI * (i + 0.75) / (n + 0.5)), dp = 0;
    for (let it = 0; it < 100; it++) {
      let p0 = 1, p1 = z;
      for (let k = 2; k <= n; k++) { const p2 = ((2 * k - 1) * z * p1 - (k - 1) * p0) / k; p0 = p1; p1 = p2; }
      const pn = n === 1 ? z : p1, pm = n === 1 ? 1 : p0;
      dp = n * (z * pn - pm) / (z * z - 1);
      const dz = pn / dp;
      z -= dz;
      if (Math.abs(dz) < 1e-16) break;
    }
    x[i] = -z; w[i] = 2 / ((1 - z * z) * dp * dp);
  }
  return { x, w };
}

const GL8 = gaussLegendre(8);
const GL3 = gaussLegendre(3);

/** Largest angle sub-interval of the segment rule (radians). */
const SUB = Math.PI / 8;

/**
 * Quadrature over the circular segment of a circle of radius R whose arc has half-angle `halfAngle` (0 to π;
 * π is the whole disk): the points with s ∈ [R cos(halfAngle), R] and |t| ≤ √(R² − s²) in a frame (s along
 * the chord's normal towards the arc, t along the chord) centred on the circle's centre. The half-angle is
 * taken directly (not the chord distance) so thin segments keep full relative precision.
 *
 * With s = R cos φ, φ ∈ [0, halfAngle], a polynomial integrand of degree ≤ 5 in (s, t) becomes a smooth
 * trigonometric polynomial in φ: 3-point Gauss–Legendre across the chord is exact, and 8-point
 * Gauss–Legendre on sub-intervals of at most π/8 in φ is exact to rounding (error far below 1e-15 relative).
 * Appends points to `out` (s, t, weight per point; grown as needed) from index `n`; returns the new count.
 */
export function circularSegmentRule(R: number, halfAngle: number, out: { st: Float64Array; w: Float64Array }, n: number): number {
  const phi0 = Math.max(0, Math.min(Math.PI, halfAngle));
  const parts = Math.max(1, Math.ceil(phi0 / SUB)), h = phi0 / parts;
  const need = n + parts * GL8.x.length * GL3.x.length;
  if (out.w.length < need) {
    const st = new Float64Array(2 * 2 * need), w = new Float64Array(2 * need);
    st.set(out.st); w.set(out.w); out.st = st; out.w = w;
  }
  for (let p = 0; p < parts; p++) {
    for (let i = 0; i < GL8.x.length; i++) {
      const phi = h * (p + 0.5 * (GL8.x[i]! + 1)), wphi = 0.5 * h * GL8.w[i]!;
      const s = R * Math.cos(phi), half = R * Math.sin(phi);
      for (let j = 0; j < GL3.x.length; j++) {
        out.st[2 * n] = s; out.st[2 * n + 1] = half * GL3.x[j]!;
        out.w[n] = R * Math.sin(phi) * wphi * half * GL3.w[j]!;
        n++;
      }
    }
  }
  return n;
}
