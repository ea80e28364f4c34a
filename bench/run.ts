/**
 * `npm run bench`: runs the light benchmarks (every `bench/*.bench.ts` not listed in `HEAVY` of
 * `bench/benchSets.ts`) in turn, or those named on the command line (e.g. `npm run bench -- load cut`;
 * `heavy` stands for every heavy one, `all` for every benchmark), and prints one JSON document: machine
 * facts, the benchmarks left out and why, then each benchmark's figures under its name. Times in ms, sizes
 * in bytes, rates in MB/s (10^6 bytes per second).
 */
import { readdirSync } from 'node:fs';
import { cpus, totalmem } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { HEAVY, SET_WORDS, chooseBenchmarks } from './benchSets.ts';

const here = dirname(fileURLToPath(import.meta.url));
const args = process.argv.slice(2).filter((a) => !a.startsWith('-'));
const names = readdirSync(here).filter((f) => f.endsWith('.bench.ts')).map((f) => f.slice(0, -'.bench.ts'.length)).sort();
const choice = chooseBenchmarks(names, args);
if (choice.unknown.length) {
  process.stderr.write(`bench: unknown benchmark(s) ${choice.unknown.join(', ')} (known: ${names.join(', ')}; sets: ${SET_WORDS.join(', ')})\n`);
  process.exit(2);
}
if (args.length === 0) {
  process.stderr.write(`bench: the light set; the heavy ones run when named: ${Object.keys(HEAVY).join(', ')} (or "heavy", "all")\n`);
}

const result: Record<string, unknown> = {
  machine: { node: process.version, cpus: cpus().length, cpuModel: cpus()[0]?.model ?? 'unknown', memoryBytes: totalmem() },
  startedAt: new Date().toISOString(),
  leftOut: choice.leftOut,
};
let failed = false;
for (const name of choice.run) {
  process.stderr.write(`bench: ${name} …\n`);
  const t0 = performance.now();
  try {
    const mod = (await import(join(here, `${name}.bench.ts`))) as { run: () => Promise<Record<string, unknown>> };
    result[name] = await mod.run();
  } catch (e) {
    failed = true;
    result[name] = { error: e instanceof Error ? e.message : String(e) };
  }
  process.stderr.write(`bench: ${name} done in ${((performance.now() - t0) / 1000).toFixed(1)} s\n`);
}
process.stdout.write(JSON.stringify(result, null, 2) + '\n');
process.exitCode = failed ? 1 : 0;
