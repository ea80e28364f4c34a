/**
 * fieldtally's second-order velocity gradient against VTK 9.1's gradient filter (vtkGradientFilter, a
 * first-order reference: the mean of the linear cell gradients around a node) and against the exact
 * solutions of two sample fields, at the nodes recorded by tests/reference/gradient_reference.py:
 *  - pipe-medium.vtu: Hagen–Poiseuille, u_z = 2V(1 − r²/R²) (REFERENCES §1: Hagen 1839, Poiseuille 1840), a
 *    quadratic the least-squares fit reproduces: ∂u_z/∂x = −4Vx/R²;
 *  - sphere-stokes.vtu: creeping flow past a sphere (Stokes 1851, Trans. Camb. Phil. Soc. 9; the velocity
 *    form as in src/samples/sphereFlow.ts), exact gradient by central differences of the exact velocity.
 * Checks: on both files fieldtally is closer to the exact gradient than VTK, and VTK's vorticity and
 * Q-criterion equal what its own gradient gives through our formulas (same definitions).
 */
import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { withDerivedFields } from '../../src/derive/derivedFields.ts';
import { qCriterionOf, vorticityOf } from '../../src/derive/flowQuantities.ts';
import { readDataset } from '../../src/io/readDataset.ts';
import { findField } from '../../src/model/piece.ts';
import { pipeExact } from '../../src/samples/pipe.ts';
import { sphereVelocity, STOKES_DEFAULTS } from '../../src/samples/sphere.ts';

interface RefNode { id: number; x: number[]; gradient: number[]; vorticity: number[]; q: number }
interface RefDoc { vtk: string; cases: { name: string; file: string; nodes: RefNode[] }[] }

const ROOT = resolve(__dirname, '../..');
const ref = JSON.parse(readFileSync(resolve(ROOT, 'tests/reference/expected/gradient/gradient_reference.json'), 'utf8')) as RefDoc;

function exactGradient(name: string, x: number[]): number[] {
  if (name === 'pipe-medium') {
    const e = pipeExact();
    return [0, 0, 0, 0, 0, 0, (-4 * e.V * x[0]!) / (e.R * e.R), (-4 * e.V * x[1]!) / (e.R * e.R), 0];
  }
  const f = { flow: 'stokes' as const, ...STOKES_DEFAULTS }, h = 1e-4 * f.radius, a = [0, 0, 0], b = [0, 0, 0], g: number[] = new Array(9).fill(0);
  for (let j = 0; j < 3; j++) {
    const p = [...x], m = [...x];
    p[j]! += h; m[j]! -= h;
    sphereVelocity(f, p[0]!, p[1]!, p[2]!, a); sphereVelocity(f, m[0]!, m[1]!, m[2]!, b);
    for (let i = 0; i < 3; i++) g[3 * i + j] = (a[i]! - b[i]!) / (2 * h);
  }
  return g;
}

describe('velocity gradient against VTK\'s gradient filter and the exact solution', () => {
  for (const c of ref.cases) {
    it(`${c.name}: fieldtally's RMS gradient error is below VTK's`, async () => {
      const d = await readDataset(c.file.split('/').pop()!, new Uint8Array(readFileSync(resolve(ROOT, c.file))));
      const p = withDerivedFields(d, ['velocity-gradient']).pieces[0]!;
      const G = findField(p, 'velocity-gradient', 'point')!.values;
      let ours = 0, vtk = 0, scale = 0;
      for (const n of c.nodes) {
        expect(p.points[3 * n.id]).toBe(n.x[0]);
        const ex = exactGradient(c.name, n.x);
        for (let k = 0; k < 9; k++) {
          ours += (G[9 * n.id + k]! - ex[k]!) ** 2; vtk += (n.gradient[k]! - ex[k]!) ** 2; scale += ex[k]! ** 2;
        }
      }
      const rOurs = Math.sqrt(ours / scale), rVtk = Math.sqrt(vtk / scale);
      expect(rOurs, `${c.name}: ours ${rOurs}, VTK ${rVtk}`).toBeLessThan(rVtk);
      // the pipe's quadratic profile is reproduced to rounding; the Stokes field to the mesh's second-order error
      expect(rOurs).toBeLessThan(c.name === 'pipe-medium' ? 1e-9 : 0.05);
      expect(rVtk).toBeGreaterThan(c.name === 'pipe-medium' ? 1e-3 : 0.01);
    });

    it(`${c.name}: VTK's vorticity and Q-criterion match our formulas applied to VTK's gradient`, () => {
      const G = Float64Array.from(c.nodes.flatMap((n) => n.gradient));
      const w = vorticityOf(G), q = qCriterionOf(G);
      c.nodes.forEach((n, i) => {
        const s = Math.hypot(...n.gradient) || 1;
        for (let k = 0; k < 3; k++) expect(Math.abs(w[3 * i + k]! - n.vorticity[k]!)).toBeLessThan(1e-12 * s);
        expect(Math.abs(q[i]! - n.q)).toBeLessThan(1e-12 * s * s);
      });
    });
  }
});
