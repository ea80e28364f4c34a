/**
 * The 9×9 symmetric solve of the quadratic gradient fit (quadraticGradient.ts), unrolled into scalar
 * locals: a Cholesky factorisation M = L Lᵀ that drops an unknown whose pivot vanishes (its row and column
 * of L become zero and its solution zero), then forward and back substitution per right-hand side.
 * Written by bin/write-solve-nine.mjs — edit the generator, not this file.
 *
 * Packed layouts: `M` holds the upper triangle row by row (M_ij, i ≤ j, at i·9 − i(i−1)/2 + j − i; 45
 * values); `L` the factor in the same packed order, transposed (L_ji at the index of (i, j)); `inv` the 9
 * reciprocal pivots, 0 for a dropped unknown.
 */

/**
 * Factorises `M` into `L` and `inv`; an unknown j is dropped when its remaining pivot is not above
 * `tolerance`·M_jj (or M_jj is not positive). Returns the smallest remaining pivot relative to M_jj over
 * the kept unknowns (1 = perfectly conditioned), 0 when an unknown was dropped.
 */
export function factorNine(M: Float64Array, L: Float64Array, inv: Float64Array, tolerance: number): number {
  const m00 = M[0]!;
  const m01 = M[1]!;
  const m02 = M[2]!;
  const m03 = M[3]!;
  const m04 = M[4]!;
  const m05 = M[5]!;
  const m06 = M[6]!;
  const m07 = M[7]!;
  const m08 = M[8]!;
  const m11 = M[9]!;
  const m12 = M[10]!;
  const m13 = M[11]!;
  const m14 = M[12]!;
  const m15 = M[13]!;
  const m16 = M[14]!;
  const m17 = M[15]!;
  const m18 = M[16]!;
  const m22 = M[17]!;
  const m23 = M[18]!;
  const m24 = M[19]!;
  const m25 = M[20]!;
  const m26 = M[21]!;
  const m27 = M[22]!;
  const m28 = M[23]!;
  const m33 = M[24]!;
  const m34 = M[25]!;
  const m35 = M[26]!;
  const m36 = M[27]!;
  const m37 = M[28]!;
  const m38 = M[29]!;
  const m44 = M[30]!;
  const m45 = M[31]!;
  const m46 = M[32]!;
  const m47 = M[33]!;
  const m48 = M[34]!;
  const m55 = M[35]!;
  const m56 = M[36]!;
  const m57 = M[37]!;
  const m58 = M[38]!;
  const m66 = M[39]!;
  const m67 = M[40]!;
  const m68 = M[41]!;
  const m77 = M[42]!;
  const m78 = M[43]!;
  const m88 = M[44]!;
  let worst = 1;
  const s0 = m00;
  let i0 = 0;
  if (s0 > tolerance * m00 && m00 > 0) { if (s0 < worst * m00) worst = s0 / m00; i0 = 1 / Math.sqrt(s0); } else worst = 0;
  const l10 = (m01) * i0;
  const l20 = (m02) * i0;
  const l30 = (m03) * i0;
  const l40 = (m04) * i0;
  const l50 = (m05) * i0;
  const l60 = (m06) * i0;
  const l70 = (m07) * i0;
  const l80 = (m08) * i0;
  const s1 = m11 - l10 * l10;
  let i1 = 0;
  if (s1 > tolerance * m11 && m11 > 0) { if (s1 < worst * m11) worst = s1 / m11; i1 = 1 / Math.sqrt(s1); } else worst = 0;
  const l21 = (m12 - l20 * l10) * i1;
  const l31 = (m13 - l30 * l10) * i1;
  const l41 = (m14 - l40 * l10) * i1;
  const l51 = (m15 - l50 * l10) * i1;
  const l61 = (m16 - l60 * l10) * i1;
  const l71 = (m17 - l70 * l10) * i1;
  const l81 = (m18 - l80 * l10) * i1;
  const s2 = m22 - l20 * l20 - l21 * l21;
  let i2 = 0;
  if (s2 > tolerance * m22 && m22 > 0) { if (s2 < worst * m22) worst = s2 / m22; i2 = 1 / Math.sqrt(s2); } else worst = 0;
  const l32 = (m23 - l30 * l20 - l31 * l21) * i2;
  const l42 = (m24 - l40 * l20 - l41 * l21) * i2;
  const l52 = (m25 - l50 * l20 - l51 * l21) * i2;
  const l62 = (m26 - l60 * l20 - l61 * l21) * i2;
  const l72 = (m27 - l70 * l20 - l71 * l21) * i2;
  const l82 = (m28 - l80 * l20 - l81 * l21) * i2;
  const s3 = m33 - l30 * l30 - l31 * l31 - l32 * l32;
  let i3 = 0;
  if (s3 > tolerance * m33 && m33 > 0) { if (s3 < worst * m33) worst = s3 / m33; i3 = 1 / Math.sqrt(s3); } else worst = 0;
  const l43 = (m34 - l40 * l30 - l41 * l31 - l42 * l32) * i3;
  const l53 = (m35 - l50 * l30 - l51 * l31 - l52 * l32) * i3;
  const l63 = (m36 - l60 * l30 - l61 * l31 - l62 * l32) * i3;
  const l73 = (m37 - l70 * l30 - l71 * l31 - l72 * l32) * i3;
  const l83 = (m38 - l80 * l30 - l81 * l31 - l82 * l32) * i3;
  const s4 = m44 - l40 * l40 - l41 * l41 - l42 * l42 - l43 * l43;
  let i4 = 0;
  if (s4 > tolerance * m44 && m44 > 0) { if (s4 < worst * m44) worst = s4 / m44; i4 = 1 / Math.sqrt(s4); } else worst = 0;
  const l54 = (m45 - l50 * l40 - l51 * l41 - l52 * l42 - l53 * l43) * i4;
  const l64 = (m46 - l60 * l40 - l61 * l41 - l62 * l42 - l63 * l43) * i4;
  const l74 = (m47 - l70 * l40 - l71 * l41 - l72 * l42 - l73 * l43) * i4;
  const l84 = (m48 - l80 * l40 - l81 * l41 - l82 * l42 - l83 * l43) * i4;
  const s5 = m55 - l50 * l50 - l51 * l51 - l52 * l52 - l53 * l53 - l54 * l54;
  let i5 = 0;
  if (s5 > tolerance * m55 && m55 > 0) { if (s5 < worst * m55) worst = s5 / m55; i5 = 1 / Math.sqrt(s5); } else worst = 0;
  const l65 = (m56 - l60 * l50 - l61 * l51 - l62 * l52 - l63 * l53 - l64 * l54) * i5;
  const l75 = (m57 - l70 * l50 - l71 * l51 - l72 * l52 - l73 * l53 - l74 * l54) * i5;
  const l85 = (m58 - l80 * l50 - l81 * l51 - l82 * l52 - l83 * l53 - l84 * l54) * i5;
  const s6 = m66 - l60 * l60 - l61 * l61 - l62 * l62 - l63 * l63 - l64 * l64 - l65 * l65;
  let i6 = 0;
  if (s6 > tolerance * m66 && m66 > 0) { if (s6 < worst * m66) worst = s6 / m66; i6 = 1 / Math.sqrt(s6); } else worst = 0;
  const l76 = (m67 - l70 * l60 - l71 * l61 - l72 * l62 - l73 * l63 - l74 * l64 - l75 * l65) * i6;
  const l86 = (m68 - l80 * l60 - l81 * l61 - l82 * l62 - l83 * l63 - l84 * l64 - l85 * l65) * i6;
  const s7 = m77 - l70 * l70 - l71 * l71 - l72 * l72 - l73 * l73 - l74 * l74 - l75 * l75 - l76 * l76;
  let i7 = 0;
  if (s7 > tolerance * m77 && m77 > 0) { if (s7 < worst * m77) worst = s7 / m77; i7 = 1 / Math.sqrt(s7); } else worst = 0;
  const l87 = (m78 - l80 * l70 - l81 * l71 - l82 * l72 - l83 * l73 - l84 * l74 - l85 * l75 - l86 * l76) * i7;
  const s8 = m88 - l80 * l80 - l81 * l81 - l82 * l82 - l83 * l83 - l84 * l84 - l85 * l85 - l86 * l86 - l87 * l87;
  let i8 = 0;
  if (s8 > tolerance * m88 && m88 > 0) { if (s8 < worst * m88) worst = s8 / m88; i8 = 1 / Math.sqrt(s8); } else worst = 0;
  L[1] = l10;
  L[2] = l20;
  L[3] = l30;
  L[4] = l40;
  L[5] = l50;
  L[6] = l60;
  L[7] = l70;
  L[8] = l80;
  L[10] = l21;
  L[11] = l31;
  L[12] = l41;
  L[13] = l51;
  L[14] = l61;
  L[15] = l71;
  L[16] = l81;
  L[18] = l32;
  L[19] = l42;
  L[20] = l52;
  L[21] = l62;
  L[22] = l72;
  L[23] = l82;
  L[25] = l43;
  L[26] = l53;
  L[27] = l63;
  L[28] = l73;
  L[29] = l83;
  L[31] = l54;
  L[32] = l64;
  L[33] = l74;
  L[34] = l84;
  L[36] = l65;
  L[37] = l75;
  L[38] = l85;
  L[40] = l76;
  L[41] = l86;
  L[43] = l87;
  inv[0] = i0;
  inv[1] = i1;
  inv[2] = i2;
  inv[3] = i3;
  inv[4] = i4;
  inv[5] = i5;
  inv[6] = i6;
  inv[7] = i7;
  inv[8] = i8;
  return worst;
}

/**
 * Solves L Lᵀ y = b for the right-hand side `B[o .. o+8]` with the factor from `factorNine`; writes the
 * first three unknowns (the gradient, in the fit's scaled units) to `Y[o .. o+2]`.
 */
export function gradientNine(L: Float64Array, inv: Float64Array, B: Float64Array, Y: Float64Array, o: number): void {
  const l10 = L[1]!;
  const l20 = L[2]!;
  const l30 = L[3]!;
  const l40 = L[4]!;
  const l50 = L[5]!;
  const l60 = L[6]!;
  const l70 = L[7]!;
  const l80 = L[8]!;
  const l21 = L[10]!;
  const l31 = L[11]!;
  const l41 = L[12]!;
  const l51 = L[13]!;
  const l61 = L[14]!;
  const l71 = L[15]!;
  const l81 = L[16]!;
  const l32 = L[18]!;
  const l42 = L[19]!;
  const l52 = L[20]!;
  const l62 = L[21]!;
  const l72 = L[22]!;
  const l82 = L[23]!;
  const l43 = L[25]!;
  const l53 = L[26]!;
  const l63 = L[27]!;
  const l73 = L[28]!;
  const l83 = L[29]!;
  const l54 = L[31]!;
  const l64 = L[32]!;
  const l74 = L[33]!;
  const l84 = L[34]!;
  const l65 = L[36]!;
  const l75 = L[37]!;
  const l85 = L[38]!;
  const l76 = L[40]!;
  const l86 = L[41]!;
  const l87 = L[43]!;
  const z0 = (B[o + 0]!) * inv[0]!;
  const z1 = (B[o + 1]! - l10 * z0) * inv[1]!;
  const z2 = (B[o + 2]! - l20 * z0 - l21 * z1) * inv[2]!;
  const z3 = (B[o + 3]! - l30 * z0 - l31 * z1 - l32 * z2) * inv[3]!;
  const z4 = (B[o + 4]! - l40 * z0 - l41 * z1 - l42 * z2 - l43 * z3) * inv[4]!;
  const z5 = (B[o + 5]! - l50 * z0 - l51 * z1 - l52 * z2 - l53 * z3 - l54 * z4) * inv[5]!;
  const z6 = (B[o + 6]! - l60 * z0 - l61 * z1 - l62 * z2 - l63 * z3 - l64 * z4 - l65 * z5) * inv[6]!;
  const z7 = (B[o + 7]! - l70 * z0 - l71 * z1 - l72 * z2 - l73 * z3 - l74 * z4 - l75 * z5 - l76 * z6) * inv[7]!;
  const z8 = (B[o + 8]! - l80 * z0 - l81 * z1 - l82 * z2 - l83 * z3 - l84 * z4 - l85 * z5 - l86 * z6 - l87 * z7) * inv[8]!;
  const y8 = (z8) * inv[8]!;
  const y7 = (z7 - l87 * y8) * inv[7]!;
  const y6 = (z6 - l76 * y7 - l86 * y8) * inv[6]!;
  const y5 = (z5 - l65 * y6 - l75 * y7 - l85 * y8) * inv[5]!;
  const y4 = (z4 - l54 * y5 - l64 * y6 - l74 * y7 - l84 * y8) * inv[4]!;
  const y3 = (z3 - l43 * y4 - l53 * y5 - l63 * y6 - l73 * y7 - l83 * y8) * inv[3]!;
  const y2 = (z2 - l32 * y3 - l42 * y4 - l52 * y5 - l62 * y6 - l72 * y7 - l82 * y8) * inv[2]!;
  const y1 = (z1 - l21 * y2 - l31 * y3 - l41 * y4 - l51 * y5 - l61 * y6 - l71 * y7 - l81 * y8) * inv[1]!;
  const y0 = (z0 - l10 * y1 - l20 * y2 - l30 * y3 - l40 * y4 - l50 * y5 - l60 * y6 - l70 * y7 - l80 * y8) * inv[0]!;
  Y[o] = y0; Y[o + 1] = y1; Y[o + 2] = y2;
}
