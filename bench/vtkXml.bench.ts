/**
 * Throughput of the VTK XML reader per encoding, on a hexahedral grid written in memory by the project's
 * own writer (`writeVtu`): MB/s of file bytes and of decoded array bytes, best of a few runs. Also the
 * raw base64 decoder. Goals: appended raw ≥ 500 MB/s of file, zlib ≥ 200 MB/s of decoded data,
 * ASCII ≥ 60 MB/s of file.
 */
import { decodeBase64 } from '../src/io/base64.ts';
import { readVtkXml } from '../src/io/vtkXml.ts';
import { writeVtu, type VtuEncoding } from '../src/io/writeVtu.ts';
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

/** Best wall-clock and process CPU seconds over `runs` (CPU time is less disturbed by a busy machine). */
async function best(runs: number, fn: () => Promise<unknown> | unknown): Promise<{ wall: number; cpu: number }> {
  let wall = Infinity, cpu = Infinity;
  for (let i = 0; i < runs; i++) {
    const c0 = process.cpuUsage(), t0 = performance.now();
    await fn();
    const c = process.cpuUsage(c0);
    wall = Math.min(wall, performance.now() - t0);
    cpu = Math.min(cpu, (c.user + c.system) / 1000);
  }
  return { wall: wall / 1000, cpu: cpu / 1000 };
}

export async function run(): Promise<Record<string, unknown>> {
  const n = Number(process.env.FIELDTALLY_BENCH_N ?? 60);
  const grid = hexGrid(n, n, n);
  const p = pointFieldFrom(grid, 'p', 1, (x, y, z, out) => { out[0] = x * x - y + 0.5 * z; });
  const u = pointFieldFrom(grid, 'U', 3, (x, y, z, out) => { out[0] = y; out[1] = -x; out[2] = z * z; });
  const d = datasetOf([withFields(grid, [p, u])]);
  const out: Record<string, unknown> = { grid: `${n}³ hexahedra`, cells: grid.cellTypes.length, points: grid.points.length / 3 };
  const encodings: VtuEncoding[] = ['appended-raw', 'zlib', 'base64', 'appended-base64', 'zlib-base64', 'ascii'];
  for (const encoding of encodings) {
    const bytes = writeVtu(d, { encoding });
    let decoded = 0;
    const t = await best(encoding === 'ascii' ? 3 : 6, async () => { decoded = decodedBytes(await readVtkXml('bench.vtu', bytes)); });
    out[encoding] = {
      fileMB: +(bytes.length / 1e6).toFixed(1),
      decodedMB: +(decoded / 1e6).toFixed(1),
      seconds: +t.wall.toFixed(4),
      fileMBps: Math.round(bytes.length / 1e6 / t.wall),
      decodedMBps: Math.round(decoded / 1e6 / t.wall),
      cpuFileMBps: Math.round(bytes.length / 1e6 / t.cpu),
      cpuDecodedMBps: Math.round(decoded / 1e6 / t.cpu),
    };
  }
  const raw = new Uint8Array(64 * 2 ** 20);
  for (let i = 0; i < raw.length; i++) raw[i] = (i * 2654435761) >>> 24;
  const text = new Uint8Array(Buffer.from(raw).toString('base64').split('').map((c) => c.charCodeAt(0)));
  const t = await best(3, () => decodeBase64(text, 0, text.length, 'bench'));
  out.base64Decode = { textMB: +(text.length / 1e6).toFixed(1), textMBps: Math.round(text.length / 1e6 / t.wall), cpuTextMBps: Math.round(text.length / 1e6 / t.cpu) };
  return out;
}

if (import.meta.url === `file://${process.argv[1]}`) {
  console.log(JSON.stringify(await run(), null, 2));
}
