#!/usr/bin/env node
// Writes src/derive/solveNine.ts: the 9×9 Cholesky factorisation and substitution of the quadratic
// gradient fit, unrolled into scalar locals (a loop version spends most of its time on loop control and
// index arithmetic at this size). Run `node bin/write-solve-nine.mjs` after changing this generator.
import { writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const N = 9;
const P = (i, j) => (i <= j ? i * N - (i * (i - 1)) / 2 + (j - i) : P(j, i)); // packed upper index
const lines = [];
const out = (s) => lines.push(s);

out(`/**
 * The 9×9 symmetric solve of the quadratic gradient fit (quadraticGradient.ts), unrolled into scalar
 * locals: a Cholesky factorisation M = L Lᵀ that drops an unknown whose pivot vanishes (its row and column
 * of L become zero and its solution zero), then forward and back substitution per right-hand side.
 * Written by bin/write-solve-nine.mjs — edit the generator, not this file.
 *
 * Packed layouts: \`M\` holds the upper triangle row by row (M_ij, i ≤ j, at i·9 − i(i−1)/2 + j − i; 45
 * values); \`L\` the factor in the same packed order, transposed (L_ji at the index of (i, j)); \`inv\` the 9
 * reciprocal pivots, 0 for a dropped unknown.
 */

/**
 * Factorises \`M\` into \`L\` and \`inv\`; an unknown j is dropped when its remaining pivot is not above
 * \`tolerance\`·M_jj (or M_jj is not positive). Returns the smallest remaining pivot relative to M_jj over
 * the kept unknowns (1 = perfectly conditioned), 0 when an unknown was dropped.
 */
export function factorNine(M: Float64Array, L: Float64Array, inv: Float64Array, tolerance: number): number {`);
for (let i = 0; i < N; i++) for (let j = i; j < N; j++) out(`  const m${i}${j} = M[${P(i, j)}]!;`);
out('  let worst = 1;');
// l_ij (i >= j) lower factor entries as locals
for (let j = 0; j < N; j++) {
  let s = `m${j}${j}`;
  for (let k = 0; k < j; k++) s += ` - l${j}${k} * l${j}${k}`;
  out(`  const s${j} = ${s};`);
  out(`  let i${j} = 0;`);
  out(`  if (s${j} > tolerance * m${j}${j} && m${j}${j} > 0) { if (s${j} < worst * m${j}${j}) worst = s${j} / m${j}${j}; i${j} = 1 / Math.sqrt(s${j}); } else worst = 0;`);
  for (let i = j + 1; i < N; i++) {
    let t = `m${j}${i}`;
    for (let k = 0; k < j; k++) t += ` - l${i}${k} * l${j}${k}`;
    out(`  const l${i}${j} = (${t}) * i${j};`);
  }
}
for (let j = 0; j < N; j++) for (let i = j + 1; i < N; i++) out(`  L[${P(j, i)}] = l${i}${j};`);
for (let j = 0; j < N; j++) out(`  inv[${j}] = i${j};`);
out('  return worst;');
out('}');
out('');
out(`/**
 * Solves L Lᵀ y = b for the right-hand side \`B[o .. o+8]\` with the factor from \`factorNine\`; writes the
 * first three unknowns (the gradient, in the fit's scaled units) to \`Y[o .. o+2]\`.
 */
export function gradientNine(L: Float64Array, inv: Float64Array, B: Float64Array, Y: Float64Array, o: number): void {`);
for (let j = 0; j < N; j++) for (let i = j + 1; i < N; i++) out(`  const l${i}${j} = L[${P(j, i)}]!;`);
for (let j = 0; j < N; j++) {
  let t = `B[o + ${j}]!`;
  for (let k = 0; k < j; k++) t += ` - l${j}${k} * z${k}`;
  out(`  const z${j} = (${t}) * inv[${j}]!;`);
}
for (let j = N - 1; j >= 0; j--) {
  let t = `z${j}`;
  for (let k = j + 1; k < N; k++) t += ` - l${k}${j} * y${k}`;
  out(`  const y${j} = (${t}) * inv[${j}]!;`);
}
out('  Y[o] = y0; Y[o + 1] = y1; Y[o + 2] = y2;');
out('}');

const here = dirname(fileURLToPath(import.meta.url));
writeFileSync(join(here, '..', 'src', 'derive', 'solveNine.ts'), lines.join('\n') + '\n');
