/**
 * Growth benchmark: boundary extraction and the cell-tree build on 1M and 10M hexahedra (100 × 100 × 100 and
 * 100 × 100 × 1000 lattices built in memory), timed in CPU time (process.cpuUsage, so a busy machine inflates
 * it less than wall time), each the best of `RUNS` runs. Goal (issue 12): every stage's cost at 10M within
 * 12× its cost at 1M — no hash table, sort or garbage that outgrows the caches. The 10M mesh needs about
 * 1.5 GB. Alone: `node --max-old-space-size=8000 bin/run-ts.mjs bench/growth.bench.ts`.
 */
import { buildCellTree } from '../src/locate/cellTree.ts';
import { datasetOf, hexGrid } from '../src/model/meshBuild.ts';
import { boundaryFaces } from '../src/surface/boundaryFaces.ts';

const RUNS = 2;
const GOAL_RATIO = 12;

const cpuMs = (): number => { const u = process.cpuUsage(); return (u.user + u.system) / 1000; };

function best(f: () => unknown): number {
  let b = Infinity;
  for (let i = 0; i < RUNS; i++) {
    const t = cpuMs();
    f();
    b = Math.min(b, cpuMs() - t);
  }
  return Math.round(b);
}

function stages(nz: number): { boundaryCpuMs: number; treeCpuMs: number; boundaryFaces: number } {
  const d = datasetOf([hexGrid(100, 100, nz)], `${nz / 10}M hexahedra`);
  let faces = 0;
  const boundaryCpuMs = best(() => { faces = boundaryFaces(d).count; });
  const treeCpuMs = best(() => buildCellTree(d));
  return { boundaryCpuMs, treeCpuMs, boundaryFaces: faces };
}

export async function run(): Promise<Record<string, unknown>> {
  const small = stages(100);
  const large = stages(1000);
  const ratio = (a: number, b: number) => Math.round((b / a) * 100) / 100;
  return {
    runs: RUNS, goalRatio: GOAL_RATIO,
    '1M': small, '10M': large,
    ratio: { boundary: ratio(small.boundaryCpuMs, large.boundaryCpuMs), tree: ratio(small.treeCpuMs, large.treeCpuMs) },
  };
}

const isMain = import.meta.url === `file://${process.argv[1]}`;
if (isMain) console.log(JSON.stringify(await run(), null, 2));
