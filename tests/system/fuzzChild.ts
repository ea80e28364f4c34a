/**
 * The fuzz test's child process: runs `fieldtally info --json` on each file of a job list, in turn, the
 * way the command line does (memory limit, one-line error), and prints one JSON line per file with the
 * time it took, the exit code, the error line and the counts of what loaded. Bundled by the fuzz test
 * and run with plain node under an address-space cap, so that a crash, hang or out-of-memory shows as
 * the child dying or going quiet on a known file.
 */
import { readFileSync } from 'node:fs';
import info from '../../src/cli/verbs/info.ts';
import { oneLineMessage } from '../../src/io/messageText.ts';
import { defaultMemoryLimit, setMemoryLimit } from '../../src/cli/memoryLimit.ts';

interface Report { points: number; cells: number; pieces: number; pointData: unknown[]; cellData: unknown[]; fieldData: unknown[] }

const files = JSON.parse(readFileSync(process.argv[2]!, 'utf8')) as string[];
const from = Number(process.argv[3] ?? 0);
setMemoryLimit(defaultMemoryLimit());
for (let i = from; i < files.length; i++) {
  process.stdout.write(JSON.stringify({ start: i }) + '\n');
  let out = '', err = '';
  const t0 = performance.now();
  let code: number;
  try {
    code = await info.run([files[i]!, '--json'], { out: (t) => { out += t; }, err: (t) => { err += t; } });
  } catch (e) {
    err = `fieldtally info: ${oneLineMessage(e)}`;
    code = 1;
  }
  const ms = performance.now() - t0;
  let counts: { points: number; cells: number; pieces: number; arrays: number } | undefined;
  if (code === 0) {
    const r = JSON.parse(out) as Report;
    counts = { points: r.points, cells: r.cells, pieces: r.pieces, arrays: r.pointData.length + r.cellData.length + r.fieldData.length };
  }
  process.stdout.write(JSON.stringify({ done: i, ms, code, err, counts }) + '\n');
}
