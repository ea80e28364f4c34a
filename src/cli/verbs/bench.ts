/**
 * `fieldtally bench <file> [--json] [--stages a,b]`: times the stages of this tool on one file — load,
 * then every compute stage in `src/cli/benchStages` — and reports the peak resident memory.
 */
import { readdirSync } from 'node:fs';
import { stat } from 'node:fs/promises';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { loadDatasetFile } from '../../io/nodeFiles.ts';
import { warmUpCutKernels } from '../../cut/warmUp.ts';
import { checkWorkerCount } from '../../parallel/pool.ts';
import { poolSize } from '../../parallel/nodePool.ts';
import { startReadPool } from '../../parallel/readPool.ts';
import { totalCells, totalPoints, type Dataset } from '../../model/dataset.ts';
import { parseArgs, str } from '../args.ts';
import type { BenchStage } from '../benchStages/stage.ts';
import type { Verb } from '../verb.ts';
import { READ_PARTS_MIN_FILE_BYTES } from '../workerOption.ts';

const STAGE_DIR = join(dirname(fileURLToPath(import.meta.url)), '..', 'benchStages');

/** Stage names written in by the bundler (`bin/build-cli.mjs`); from source, the folder is listed. */
declare const FIELDTALLY_BENCH_STAGES: readonly string[] | undefined;

async function stages(): Promise<BenchStage[]> {
  const names = typeof FIELDTALLY_BENCH_STAGES !== 'undefined' ? FIELDTALLY_BENCH_STAGES
    : readdirSync(STAGE_DIR).filter((f) => f.endsWith('.ts') && f !== 'stage.ts').map((f) => f.slice(0, -3));
  const list = await Promise.all(names.map(async (n) => ((await import(`../benchStages/${n}.ts`)) as { default: BenchStage }).default));
  return list.sort((a, b) => a.order - b.order);
}

/** Bytes of the decoded arrays of a dataset (points, topology, fields). */
export function decodedBytes(d: Dataset): number {
  let n = 0;
  for (const p of d.pieces) {
    n += p.points.byteLength + p.cellTypes.byteLength + p.offsets.byteLength + p.connectivity.byteLength;
    if (p.polyFaces) n += p.polyFaces.cellFaceStart.byteLength + p.polyFaces.faceOffsets.byteLength + p.polyFaces.faceConnectivity.byteLength;
    for (const f of [...p.pointData, ...p.cellData]) n += f.values.byteLength;
  }
  return n;
}

const bench: Verb = {
  summary: 'time each stage of the tool on a file and report peak memory (JSON)',
  usage: 'fieldtally bench <file> [--json] [--stages load,cut,…] [--read-threads N]\n  Times load and every compute stage; prints JSON (always) with times in ms, sizes in bytes, rates in MB/s (10^6 bytes).\n'
    + '  --read-threads N      threads reading the large raw arrays of the file in parts, as the --workers verbs load it (default: FIELDTALLY_WORKERS, else one per core, for files of 256 MiB or more; else 1: read on this thread)',
  options: { json: 'boolean', stages: 'string', 'read-threads': 'string' },
  async run(argv, io) {
    const args = parseArgs(argv, this.options, 'bench');
    const file = args.positional[0];
    if (!file || args.positional.length > 1) throw new Error('expected one result file: fieldtally bench <file> [--json]');
    const only = str(args, 'stages')?.split(',').map((s) => s.trim());
    const fileBytes = (await stat(file)).size;
    const asked = str(args, 'read-threads');
    // As loadForCompute: parts for large files only (DEVELOPERS.md, "Loading at scale").
    const threads = asked !== undefined ? checkWorkerCount(asked, '--read-threads') : fileBytes >= READ_PARTS_MIN_FILE_BYTES ? poolSize() : 1;
    // The cut kernels warm up first, as the app's compute worker does when it starts (before a file is chosen);
    // reported apart. Beside a one-thread load it only moved time from the first cut into the load.
    const w0 = process.cpuUsage(), wt = performance.now();
    await warmUpCutKernels();
    const warmCpu = process.cpuUsage(w0), warmMs = performance.now() - wt;
    const rssBefore = process.memoryUsage().rss;
    const c0 = process.cpuUsage(), t0 = performance.now();
    // Started with the clock running: starting them is part of loading this way.
    const readers = threads > 1 ? startReadPool(threads) : undefined;
    let dataset: Dataset, loadMs: number, loadCpu: NodeJS.CpuUsage;
    try {
      dataset = await loadDatasetFile(file, readers ? { readParts: readers.readParts } : {});
      loadMs = performance.now() - t0; loadCpu = process.cpuUsage(c0);
    } finally {
      await readers?.close();
    }
    const decoded = decodedBytes(dataset);
    const out: Record<string, unknown> = {
      file, fileBytes, points: totalPoints(dataset), cells: totalCells(dataset),
      warmUp: { ms: round(warmMs), cpuMs: round((warmCpu.user + warmCpu.system) / 1000) },
      load: {
        ms: round(loadMs), cpuMs: round((loadCpu.user + loadCpu.system) / 1000), fileMBps: round(fileBytes / 1e3 / loadMs), decodedBytes: decoded,
        decodedMBps: round(decoded / 1e3 / loadMs), readThreads: threads, arraysReadInParts: readers?.done.arrays ?? 0,
        partsReadOnLoadingThread: readers?.done.partsHere ?? 0, partsRead: readers?.done.parts ?? 0,
      },
    };
    for (const s of await stages()) {
      if (only && !only.includes(s.name)) continue;
      out[s.name] = await s.run(dataset);
    }
    const peak = process.resourceUsage().maxRSS * 1024;
    out.memory = {
      peakRssBytes: peak, rssBeforeLoadBytes: rssBefore,
      peakOverDecoded: round((peak - rssBefore) / Math.max(1, decoded)),
      note: 'peakOverDecoded = (peak RSS − RSS before load) / decoded array bytes',
    };
    io.out(JSON.stringify(out, null, 2));
    return 0;
  },
};

function round(v: number): number { return Math.round(v * 100) / 100; }
export default bench;
