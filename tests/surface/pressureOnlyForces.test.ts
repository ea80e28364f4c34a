import { describe, expect, it } from 'vitest';
import type { Dataset } from '../../src/model/dataset.ts';
import { datasetOf, field, hexGrid, pointFieldFrom, tetGrid, withFields } from '../../src/model/meshBuild.ts';
import type { Piece } from '../../src/model/piece.ts';
import { boundaryFaces } from '../../src/surface/boundaryFaces.ts';
import { forceTotals, type Vec3 } from '../../src/surface/forces.ts';
import { surfaceLoads, type LoadOptions } from '../../src/surface/surfaceLoads.ts';

/** Force totals over every boundary face of `d` with the given load options. */
function totalOver(d: Dataset, load: Partial<LoadOptions>, momentPoint: Vec3 = [0, 0, 0]) {
  const faces = boundaryFaces(d);
  const all = Int32Array.from({ length: faces.count }, (_, i) => i);
  const loads = surfaceLoads(d, faces, all, load);
  return { faces, loads, result: forceTotals(d, faces, loads, { momentPoint }) };
}

/** A tetrahedral box through a twisting map and a hexahedral one beside it: triangles and quads, two pieces. */
function twoBodies(): Piece[] {
  const tets = tetGrid(5, 4, 3, (u, v, w) => [u + 0.1 * v * w, v + 0.05 * u, w * (1 + 0.2 * u)]);
  const hexes = hexGrid(4, 3, 5, (u, v, w) => [3 + 2 * u + 0.1 * w * v, v + 0.05 * u * w, 3 * w + 0.1 * u]);
  const p = (x: number, y: number, z: number, o: Float64Array) => { o[0] = 3 + x * y - 2 * z * z + 0.5 * x; };
  const s = (x: number, y: number, z: number, o: Float64Array) => { o[0] = y; o[1] = x * z; o[2] = 0.5 - x; };
  return [tets, hexes].map((q) => withFields(q, [pointFieldFrom(q, 'p', 1, p), pointFieldFrom(q, 'wss', 3, s)]));
}

describe('pressure-only force totals (no viscous part: triangles without traction work, point pressure read in place)', () => {
  // Reference: the general face loop of forces.ts, which integrates the same pressure beside a traction. The
  // pressure-only loop (surfaces of triangles) must give its very bits for the pressure force, the pressure
  // moment and the area; other surfaces take the general loop with the corner pressures gathered when read.
  it('equal, bit for bit, the pressure parts of the general loop: triangles, quads, two pieces, p_ref and ρ', () => {
    const [tets, hexes] = twoBodies();
    for (const d of [datasetOf([tets!]), datasetOf([hexes!]), datasetOf([tets!, hexes!])]) for (const extra of [{}, { pRef: 1.75 }, { kinematic: true, rho: 998.2 }] as Partial<LoadOptions>[]) {
      const r: Vec3 = [0.3, -0.2, 0.1];
      const general = totalOver(d, { pressure: 'p', wallShear: 'wss', ...extra }, r);
      const only = totalOver(d, { pressure: 'p', viscous: 'none', ...extra }, r);
      expect(general.loads.traction).not.toBeNull();
      expect(only.loads.traction).toBeNull();
      expect(only.loads.pointPressure).not.toBeNull();
      expect(only.result.pressureForce).toEqual(general.result.pressureForce);
      expect(only.result.pressureMoment).toEqual(general.result.pressureMoment);
      expect(only.result.area).toBe(general.result.area);
      expect(only.result.force).toEqual(general.result.pressureForce);
      expect(only.result.viscousForce).toBeNull();
      // The corner pressures are gathered when read, and are the values the loop read in place.
      expect(Array.from(only.loads.pressure)).toEqual(Array.from(general.loads.pressure));
    }
  });

  it('all-triangle surfaces take the triangle loop and give the per-face totals added in order', () => {
    const q = tetGrid(6, 5, 4, (u, v, w) => [u + 0.1 * v * w, v + 0.05 * u, w * (1 + 0.2 * u)]);
    const d = datasetOf([withFields(q, [pointFieldFrom(q, 'p', 1, (x, y, z, o) => { o[0] = 3 + x * y - 2 * z * z; })])]);
    const { faces, result } = totalOver(d, { viscous: 'none' }, [0.3, -0.2, 0.1]);
    expect(faces.offsets[faces.count]).toBe(3 * faces.count);
    const fp = [0, 0, 0], mp = [0, 0, 0];
    let area = 0;
    for (let f = 0; f < faces.count; f++) {
      const one = forceTotals(d, faces, surfaceLoads(d, faces, Int32Array.of(f), { viscous: 'none' }), { momentPoint: [0.3, -0.2, 0.1] });
      for (let a = 0; a < 3; a++) { fp[a] += one.pressureForce[a]; mp[a] += one.pressureMoment[a]; }
      area += one.area;
    }
    expect(result.pressureForce).toEqual(fp);
    expect(result.pressureMoment).toEqual(mp);
    expect(result.area).toBe(area);
    // Σ|dF| = Σ |mean corner p| × triangle area, computed here from the faces' area vectors
    const P = d.pieces[0]!.pointData[0]!.values;
    let gross = 0;
    for (let f = 0; f < faces.count; f++) {
      const a = faces.offsets[f]!, pm = (P[faces.nodes[a]!]! + P[faces.nodes[a + 1]!]! + P[faces.nodes[a + 2]!]!) / 3;
      gross += Math.abs(pm) * Math.hypot(faces.areaVector[3 * f]!, faces.areaVector[3 * f + 1]!, faces.areaVector[3 * f + 2]!);
    }
    expect(result.grossForce).toBeGreaterThan(0);
    expect(Math.abs(result.grossForce / gross - 1)).toBeLessThan(1e-12);
  });

  it('uniform pressure on a closed surface gives no net force and no moment', () => {
    // Reference: a closed surface's area vectors sum to zero (divergence theorem with a constant field).
    for (const q of [hexGrid(4, 3, 5, (u, v, w) => [2 * u, v, 3 * w]), tetGrid(3, 4, 2)]) {
      const d = datasetOf([withFields(q, [field('p', 'point', 1, new Float64Array(q.points.length / 3).fill(101325))])]);
      const { result } = totalOver(d, { viscous: 'none' }, [0.5, 0.5, 0.5]);
      for (const v of result.force) expect(Math.abs(v)).toBeLessThan(1e-9);
      for (const v of result.moment) expect(Math.abs(v)).toBeLessThan(1e-9);
      // nothing cancels in Σ|dF|: a uniform p over the whole area, p·A (the triangle loop and the fan alike)
      expect(Math.abs(result.grossForce / (101325 * result.area) - 1)).toBeLessThan(1e-12);
    }
  });

  it('hydrostatic pressure in a closed box: the fluid presses its container down with its weight ρgV, moment V(x̄ − r)×∇p', () => {
    // Reference: hydrostatics, p = p0 − ρgz; by the divergence theorem ∮ p n dA = V∇p = (0, 0, −ρgV) and
    // ∮ (x − r) × p n dA = V(x̄ − r) × ∇p, both integrated exactly by the triangle rules (linear p on planar faces).
    const rho = 1000, g = 9.81, r: Vec3 = [0.4, -1, 0.25];
    const q = hexGrid(4, 3, 6, (u, v, w) => [2 * u, v, 3 * w]);
    const d = datasetOf([withFields(q, [pointFieldFrom(q, 'p', 1, (_x, _y, z, o) => { o[0] = 101325 - rho * g * z; })])]);
    const { result } = totalOver(d, { viscous: 'none' }, r);
    const V = 2 * 1 * 3, grad: Vec3 = [0, 0, -rho * g], c: Vec3 = [1, 0.5, 1.5];
    const M: Vec3 = [(c[1] - r[1]) * grad[2] - (c[2] - r[2]) * grad[1], (c[2] - r[2]) * grad[0] - (c[0] - r[0]) * grad[2], (c[0] - r[0]) * grad[1] - (c[1] - r[1]) * grad[0]];
    expect(result.force[2]).toBeCloseTo(-rho * g * V, 7);
    expect(Math.abs(result.force[0])).toBeLessThan(1e-7);
    expect(Math.abs(result.force[1])).toBeLessThan(1e-7);
    for (let k = 0; k < 3; k++) expect(result.moment[k]).toBeCloseTo(V * M[k]!, 7);
    expect(result.area).toBeCloseTo(2 * (2 * 1 + 2 * 3 + 1 * 3), 12);
    expect(result.viscousForce).toBeNull();
  });

  it('a Float32 pressure array is read in place as the gather reads it', () => {
    const q = tetGrid(3, 3, 3);
    const p32 = Float32Array.from(pointFieldFrom(q, 'p', 1, (x, y, z, o) => { o[0] = 1 / 3 + x - 2 * y + z; }).values);
    const d = datasetOf([withFields(q, [field('p', 'point', 1, p32), pointFieldFrom(q, 'wss', 3, (x, _y, _z, o) => { o[0] = x; o[1] = 0; o[2] = 1; })])]);
    const general = totalOver(d, { wallShear: 'wss' }).result, only = totalOver(d, { viscous: 'none' }).result;
    expect(only.pressureForce).toEqual(general.pressureForce);
    expect(only.pressureMoment).toEqual(general.pressureMoment);
  });
});
