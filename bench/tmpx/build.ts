import { datasetOf, hexGrid, pointFieldFrom, withFields } from '../../src/model/meshBuild.ts';
import { openNodePool } from '../../src/parallel/nodePool.ts';
import { primeDerivedGradients } from '../../src/parallel/deriveShares.ts';
import { loadValues, makeSharedKernelMesh } from '../../src/derive/sharedKernelMesh.ts';
import { DERIVED_FIELDS } from '../../src/derive/derivedFields.ts';
import { readFileSync } from 'node:fs';
import { loadavg } from 'node:os';
const tcpu = () => { const [a] = readFileSync('/proc/thread-self/schedstat', 'utf8').split(' '); return Number(a) / 1e6; };
const flow = (p: ReturnType<typeof hexGrid>) => withFields(p, [
  pointFieldFrom(p, 'velocity', 3, (x, y, z, o) => { o[0] = Math.sin(3 * y) * z; o[1] = Math.cos(2 * x); o[2] = x * y; }),
]);
const names = ['vorticity', 'q-criterion'];
for (let r = 0; r < 3; r++) for (const mode of ['old', 'new']) {
  const pool = await openNodePool(datasetOf([flow(hexGrid(100, 100, 100))], 'm'), 2);
  const w0 = await pool.memory();
  await new Promise((res) => setTimeout(res, 1500)); // warm-up over
  const t0 = performance.now(), h0 = tcpu();
  let build = 0;
  if (mode === 'old') {
    const p = pool.dataset.pieces[0]!, f = p.pointData[0]!;
    const m = makeSharedKernelMesh(p, 2)!;
    await pool.attachKernelMesh(m.ref); loadValues(m, f.values, 3);
    build = performance.now() - t0;
    await pool.pointDerived(0, 'velocity', names.map((name) => ({ name: name as 'vorticity', components: DERIVED_FIELDS[name as 'vorticity'].components })), m.ref.id);
  } else await primeDerivedGradients(pool, names);
  const ms = performance.now() - t0, host = tcpu() - h0, w = (await pool.memory()).map((m, i) => Math.round(m!.cpuMs! - w0[i]!.cpuMs!));
  await pool.close();
  console.log(JSON.stringify({ mode, ms: Math.round(ms), buildMs: Math.round(build), hostCpu: Math.round(host), workers: w, load: loadavg()[0] }));
}
