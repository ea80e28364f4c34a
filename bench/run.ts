/**
 * `npm run bench`: runs every `bench/*.bench.ts` in turn (or only those named on the command line,
 * e.g. `npm run bench -- load cut`) and prints one JSON document: machine facts, then each benchmark's
 * figures under its name. Times in ms, sizes in bytes, rates in MB/s (10^6 bytes per second).
 */
import { readdirSync } from 'node:fs';
import { cpus, totalmem } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const here = dirname(fileURLToPath(import.meta.url));
const only = process.argv.slice(2).filter((a) => !a.startsWith('-'));
const names = readdirSync(here).filter((f) => f.endsWith('.bench.ts')).map((f) => f.slice(0, -'.bench.ts'.length)).sort();
const unknown = only.filter((n) => !names.includes(n));
if (unknown.length) {
  process.stderr.write(`bench: unknown benchmark(s) ${unknown.join(', ')} (known: ${names.join(', ')})\n`);
  process.exit(2);
}

const result: Record<string, unknown> = {
  machine: { node: process.version, cpus: cpus().length, cpuModel: cpus()[0]?.model ?? 'unknown', memoryBytes: totalmem() },
  startedAt: new Date().toISOString(),
};
let failed = false;
for (const name of names) {
  if (only.length && !only.includes(name)) continue;
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
