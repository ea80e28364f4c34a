/**
 * Iso-surface benchmark, meshes built in memory: a sphere r = 0.3 about the centre of the unit cube on
 *  - 1M hexahedra (100³ lattice), coloured by a second point field;
 *  - 1.02M tetrahedra (56 × 56 × 54 lattice, six per cube).
 * Each: extraction, welding, measures (pieces, closedness, volume) and the colour field, one value; then five
 * values at once. Reports wall and CPU time (process.cpuUsage) of a cold run and the best of three; the machine
 * is shared, so CPU time is the steadier figure. No goal is set by the issue; the figures are for comparison.
 */
import { isoSurfaces } from '../src/iso/isoSurface.ts';
import { datasetOf, hexGrid, pointFieldFrom, tetGrid, withFields } from '../src/model/meshBuild.ts';
import type { Piece } from '../src/model/piece.ts';

function timed(fn: () => void): { ms: number; cpuMs: number } {
  const c0 = process.cpuUsage(), t0 = performance.now();
  fn();
  const c = process.cpuUsage(c0);
  return { ms: performance.now() - t0, cpuMs: (c.user + c.system) / 1000 };
}

function bestOf(n: number, fn: () => void): { ms: number; cpuMs: number } {
  let best = { ms: Infinity, cpuMs: Infinity };
  for (let i = 0; i < n; i++) { const t = timed(fn); if (t.cpuMs < best.cpuMs) best = t; }
  return best;
}

const fields = (p: Piece) => withFields(p, [
  pointFieldFrom(p, 'r', 1, (x, y, z, o) => { o[0] = Math.hypot(x - 0.5, y - 0.5, z - 0.5); }),
  pointFieldFrom(p, 'x', 1, (x, _y, _z, o) => { o[0] = x; }),
]);

export async function run(): Promise<Record<string, unknown>> {
  const out: Record<string, unknown> = {};
  for (const [name, piece] of [['hex-1M', hexGrid(100, 100, 100)], ['tet-1M', tetGrid(56, 56, 54)]] as const) {
    const d = datasetOf([fields(piece)], name);
    let triangles = 0, area = 0, volume: number | null = null;
    const cold = timed(() => { const [s] = isoSurfaces(d, { field: 'r', values: [0.3], colourBy: 'x' }); triangles = s!.indices.length / 3; area = s!.area; volume = s!.volume; });
    const warm = bestOf(3, () => { isoSurfaces(d, { field: 'r', values: [0.3], colourBy: 'x' }); });
    const five = timed(() => { isoSurfaces(d, { field: 'r', values: [0.1, 0.2, 0.3, 0.4, 0.45] }); });
    out[name] = { cells: piece.cellTypes.length, triangles, area, volume, cold, bestOfThree: warm, fiveValues: five };
  }
  return out;
}
