/**
 * Kinematic quantities from a velocity gradient, point by point over flat arrays.
 *
 * The gradient G is stored row by row, G[9i + 3a + b] = ∂u_a/∂x_b (1/s for m/s and m). With the strain
 * rate S = ½(G + Gᵀ) and the rotation rate Ω = ½(G − Gᵀ):
 *  - vorticity ω = ∇ × u = (∂w/∂y − ∂v/∂z, ∂u/∂z − ∂w/∂x, ∂v/∂x − ∂u/∂y) (1/s);
 *  - Q-criterion Q = ½(‖Ω‖² − ‖S‖²) = −½ G_ab G_ba (1/s²) — Hunt, Wray & Moin (1988), "Eddies, streams,
 *    and convergence zones in turbulent flows", CTR Report CTR-S88;
 *  - λ₂ = the middle eigenvalue of S² + Ω² (1/s²; a vortex core where λ₂ < 0) — Jeong & Hussain (1995),
 *    "On the identification of a vortex", J. Fluid Mech. 285, 69–94; eigenvalues of the symmetric 3×3
 *    matrix in closed form (Smith 1961, "Eigenvalues of a symmetric 3 × 3 matrix", Comm. ACM 4(4), 168);
 *  - helicity density h = u · ω (m/s²).
 */

/** Vorticity vectors (3 per point) from gradients (9 per point); into `out` from index `at` when given. */
export function vorticityOf(G: Float64Array, out: Float64Array = new Float64Array(G.length / 3), at = 0): Float64Array {
  const n = G.length / 9;
  for (let i = 0, o = at; i < n; i++, o += 3) {
    const g = 9 * i;
    out[o] = G[g + 7]! - G[g + 5]!;
    out[o + 1] = G[g + 2]! - G[g + 6]!;
    out[o + 2] = G[g + 3]! - G[g + 1]!;
  }
  return out;
}

/** Euclidean magnitude of each tuple of `nc` components. */
export function magnitudeOf(v: ArrayLike<number>, nc: number): Float64Array {
  const n = v.length / nc, out = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    let s = 0;
    for (let c = 0, b = i * nc; c < nc; c++) { const x = v[b + c]!; s += x * x; }
    out[i] = Math.sqrt(s);
  }
  return out;
}

/** Q-criterion per point (see the file comment); into `out` from index `at` when given. */
export function qCriterionOf(G: Float64Array, out: Float64Array = new Float64Array(G.length / 9), at = 0): Float64Array {
  const n = G.length / 9;
  for (let i = 0; i < n; i++) {
    const g = 9 * i;
    const g0 = G[g]!, g1 = G[g + 1]!, g2 = G[g + 2]!, g3 = G[g + 3]!, g4 = G[g + 4]!, g5 = G[g + 5]!;
    const g6 = G[g + 6]!, g7 = G[g + 7]!, g8 = G[g + 8]!;
    out[at + i] = -0.5 * (g0 * g0 + g4 * g4 + g8 * g8) - (g1 * g3 + g2 * g6 + g5 * g7);
  }
  return out;
}

/** λ₂ per point: the middle eigenvalue of S² + Ω² = ½(G G + Gᵀ Gᵀ). */
export function lambda2Of(G: Float64Array): Float64Array {
  const n = G.length / 9, out = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const g = 9 * i;
    const a = G[g]!, b = G[g + 1]!, c = G[g + 2]!, d = G[g + 3]!, e = G[g + 4]!, f = G[g + 5]!;
    const p = G[g + 6]!, q = G[g + 7]!, r = G[g + 8]!;
    // (G G)_ij and its transpose, summed and halved: A_ij = ½((GG)_ij + (GG)_ji)
    const s00 = a * a + b * d + c * p, s11 = d * b + e * e + f * q, s22 = p * c + q * f + r * r;
    const s01 = a * b + b * e + c * q, s10 = d * a + e * d + f * p;
    const s02 = a * c + b * f + c * r, s20 = p * a + q * d + r * p;
    const s12 = d * c + e * f + f * r, s21 = p * b + q * e + r * q;
    out[i] = middleEigenvalue(s00, s11, s22, 0.5 * (s01 + s10), 0.5 * (s02 + s20), 0.5 * (s12 + s21));
  }
  return out;
}

/**
 * Middle eigenvalue of the symmetric matrix [[a00,a01,a02],[a01,a11,a12],[a02,a12,a22]] by the
 * trigonometric closed form (Smith 1961).
 */
export function middleEigenvalue(a00: number, a11: number, a22: number, a01: number, a02: number, a12: number): number {
  const p1 = a01 * a01 + a02 * a02 + a12 * a12;
  const m = (a00 + a11 + a22) / 3;
  const b00 = a00 - m, b11 = a11 - m, b22 = a22 - m;
  const p2 = b00 * b00 + b11 * b11 + b22 * b22 + 2 * p1;
  if (!(p2 > 0)) return m;
  const pp = Math.sqrt(p2 / 6), ip = 1 / pp;
  const c00 = b00 * ip, c11 = b11 * ip, c22 = b22 * ip, c01 = a01 * ip, c02 = a02 * ip, c12 = a12 * ip;
  const det = c00 * (c11 * c22 - c12 * c12) - c01 * (c01 * c22 - c12 * c02) + c02 * (c01 * c12 - c11 * c02);
  const r = Math.min(1, Math.max(-1, det / 2));
  const phi = Math.acos(r) / 3;
  const e1 = m + 2 * pp * Math.cos(phi), e3 = m + 2 * pp * Math.cos(phi + (2 * Math.PI) / 3);
  return 3 * m - e1 - e3;
}

/** Helicity density u · ω per point. */
export function helicityOf(u: ArrayLike<number>, omega: Float64Array): Float64Array {
  const n = omega.length / 3, out = new Float64Array(n);
  for (let i = 0; i < n; i++) out[i] = u[3 * i]! * omega[3 * i]! + u[3 * i + 1]! * omega[3 * i + 1]! + u[3 * i + 2]! * omega[3 * i + 2]!;
  return out;
}
