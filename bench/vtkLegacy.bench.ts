/**
 * Throughput of the legacy .vtk reader for file versions 4.2 and 5.1, ASCII and BINARY, on a hexahedral
 * grid with a scalar and a vector point field written in memory by the project's legacy writer
 * (`writeLegacyVtk`): MB/s of file bytes and of decoded array bytes, best of a few runs, plus the first
 * (cold) run. Goals: ASCII ≥ 60 MB/s of file; binary far more.
 */
import { readLegacyVtk } from '../src/io/vtkLegacy.ts';
import { writeLegacyVtk } from '../src/io/writeLegacy.ts';
import type { Dataset } from '../src/model/dataset.ts';
import { datasetOf, hexGrid, pointFieldFrom, withFields } from '../src/model/meshBuild.ts';

/** Bytes of every typed array the reader returns. */
function decodedBytes(d: Dataset): number {
  let n = 0;
  for (const p of d.pieces) {
    n += p.points.byteLength + p.connectivity.byteLength + p.offsets.byteLength + p.cellTypes.byteLength;
    for (const f of [...p.pointData, ...p.cellData]) n += f.values.byteLength;
  }
  return n;
}

export async function run(): Promise<Record<string, unknown>> {
  const n = Number(process.env.FIELDTALLY_BENCH_N ?? 60);
  const grid = hexGrid(n, n, n);
  const p = pointFieldFrom(grid, 'p', 1, (x, y, z, out) => { out[0] = x * x - y + 0.5 * z; });
  const u = pointFieldFrom(grid, 'U', 3, (x, y, z, out) => { out[0] = y; out[1] = -x; out[2] = z * z; });
  const d = datasetOf([withFields(grid, [p, u])]);
  const out: Record<string, unknown> = { grid: `${n}³ hexahedra`, cells: grid.cellTypes.length, points: grid.points.length / 3 };
  for (const version of ['4.2', '5.1'] as const) {
    for (const binary of [false, true]) {
      const bytes = writeLegacyVtk(d, { version, binary });
      let decoded = 0, best = Infinity, first = 0;
      const runs = binary ? 5 : 3;
      for (let i = 0; i < runs; i++) {
        const t0 = performance.now();
        decoded = decodedBytes(await readLegacyVtk('bench.vtk', bytes));
        const s = (performance.now() - t0) / 1000;
        if (i === 0) first = s;
        best = Math.min(best, s);
      }
      out[`v${version} ${binary ? 'binary' : 'ascii'}`] = {
        fileMB: +(bytes.length / 1e6).toFixed(1),
        decodedMB: +(decoded / 1e6).toFixed(1),
        seconds: +best.toFixed(4),
        fileMBps: Math.round(bytes.length / 1e6 / best),
        decodedMBps: Math.round(decoded / 1e6 / best),
        coldFileMBps: Math.round(bytes.length / 1e6 / first),
      };
    }
  }
  return out;
}

if (import.meta.url === `file://${process.argv[1]}`) {
  console.log(JSON.stringify(await run(), null, 2));
}
