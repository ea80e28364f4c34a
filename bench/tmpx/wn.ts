import { datasetOf, hexGrid } from '../../src/model/meshBuild.ts';
import { getBoundaryFaces, getSurfaceGroups } from '../../src/surface/surfaceCache.ts';
import { facesOfGroups } from '../../src/surface/surfaceGroups.ts';
import { wallNodes } from '../../src/surface/wallTraction.ts';
import { readFileSync } from 'node:fs';
const tcpu = () => Number(readFileSync('/proc/thread-self/schedstat', 'utf8').split(' ')[0]) / 1e6;
const d = datasetOf([hexGrid(224, 224, 1, (u, v, w) => [u, v, 0.01 * w])], 'slab');
const faces = getBoundaryFaces(d), groups = getSurfaceGroups(d);
const sel = facesOfGroups(groups, groups.groups.map((g, i) => ({ g, i })).filter(({ g }) => g.faces > 10_000).map(({ i }) => i));
const off = new Int32Array(sel.length + 1);
for (let k = 0; k < sel.length; k++) off[k + 1] = off[k]! + faces.offsets[sel[k]! + 1]! - faces.offsets[sel[k]!]!;
const miss: number[] = [], hit: number[] = [];
for (let r = 0; r < 15; r++) {
  wallNodes(d, faces, sel.subarray(0, 1), new Int32Array([0, 4]));
  let c = tcpu(); wallNodes(d, faces, sel, off); miss.push(+(tcpu() - c).toFixed(1));
  c = tcpu(); wallNodes(d, faces, sel, off); hit.push(+(tcpu() - c).toFixed(1));
}
console.log(JSON.stringify({ miss, hit }));
