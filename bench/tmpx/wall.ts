import { datasetOf, hexGrid, pointFieldFrom, withFields } from '../../src/model/meshBuild.ts';
import type { Dataset } from '../../src/model/dataset.ts';
import { getBoundaryFaces, getSurfaceGroups } from '../../src/surface/surfaceCache.ts';
import { facesOfGroups } from '../../src/surface/surfaceGroups.ts';
import { wallQuantities } from '../../src/surface/wallQuantities.ts';
import { primeWallGradients } from '../../src/parallel/deriveShares.ts';
import { readFileSync } from 'node:fs';
import { wallNodes } from '../../src/surface/wallTraction.ts';
const tcpu = () => Number(readFileSync('/proc/thread-self/schedstat', 'utf8').split(' ')[0]) / 1e6;
const flow = (p: ReturnType<typeof hexGrid>) => withFields(p, [
  pointFieldFrom(p, 'velocity', 3, (x, y, z, o) => { o[0] = Math.sin(3 * y) * z; o[1] = Math.cos(2 * x); o[2] = x * y; }),
  pointFieldFrom(p, 'p', 1, (x, _y, _z, o) => { o[0] = 1 - x; }),
]);
const opts = { density: 1, viscosity: 1e-3, speed: 1 };
const out: Record<string, number[]> = { hit: [], evicted: [] };
for (let r = 0; r < Number(process.argv[2] ?? 6); r++) {
  const d: Dataset = datasetOf([flow(hexGrid(224, 224, 1, (u, v, w) => [u, v, 0.01 * w]))], 'slab');
  const faces = getBoundaryFaces(d), groups = getSurfaceGroups(d);
  const sel = facesOfGroups(groups, groups.groups.map((g, i) => ({ g, i })).filter(({ g }) => g.faces > 10_000).map(({ i }) => i));
  await primeWallGradients(null, d, faces, sel, opts);
  const mode = r % 2 ? 'evicted' : 'hit';
  if (mode === 'evicted') wallNodes(d, faces, sel.subarray(0, 1), new Int32Array([0, 4]));
  const c0 = tcpu();
  wallQuantities(d, faces, sel, opts);
  out[mode]!.push(Math.round(tcpu() - c0));
}
console.log('host part ms CPU', JSON.stringify(out));
