/**
 * Smooth point fields on a piece for the gradient kernel comparisons (tests/derive/fusedGradient.test.ts,
 * momentKernel.test.ts, tests/system/momentKernelCases.ts): a velocity-like vector u and a scalar s, neither a
 * quadratic, so every fit term is exercised.
 */
import type { Piece } from '../../src/model/piece.ts';

export function smoothFields(p: Piece): { u: Float64Array; s: Float64Array } {
  const np = p.points.length / 3, u = new Float64Array(3 * np), s = new Float64Array(np);
  for (let i = 0; i < np; i++) {
    const x = p.points[3 * i]!, y = p.points[3 * i + 1]!, z = p.points[3 * i + 2]!;
    u[3 * i] = Math.sin(3 * y) * z; u[3 * i + 1] = Math.cos(2 * x) + y * y; u[3 * i + 2] = x * y * z;
    s[i] = Math.exp(x) * y + z * z * z;
  }
  return { u, s };
}
