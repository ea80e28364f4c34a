/**
 * `fieldtally partial <set> --probes set.json --task i --tasks n --out part-i.json`: one task of a piece set
 * spread over several processes or cluster nodes. Reads only task i's share of the set's leaf files
 * (contiguous, in file order; nested set files are read by every task to number the leaves), finds the cells
 * its probes need on them (`src/pieces/footprint.ts`) and writes them with the task's boundary faces, the
 * set's identity and the probe set into a partial-results document (`src/pieces/partialDoc.ts`).
 * `fieldtally reduce` combines the documents of all n tasks into the report folder `report` writes for the
 * whole set.
 */
import { writeFileSync } from 'node:fs';
import { basename } from 'node:path';
import { encodeTask } from '../../pieces/encodeTask.ts';
import { PARTIAL_FORMAT, PARTIAL_VERSION, type PartialDoc } from '../../pieces/partialDoc.ts';
import { parseArgs, str } from '../args.ts';
import { readShare } from '../pieceShare.ts';
import { readProbeSetFile, toolVersion } from '../studyInputs.ts';
import type { Verb } from '../verb.ts';

/** Largest number of tasks accepted (a guard against a typo such as --tasks 1e9). */
export const MAX_TASKS = 100000;

function wholeNumber(text: string | undefined, option: string, min: number, max: number): number {
  if (text === undefined) throw new Error(`--${option} is required`);
  const v = Number(text);
  if (text.trim() === '' || !Number.isInteger(v) || v < min || v > max) throw new Error(`--${option}: expected a whole number from ${min} to ${max}, got "${text}"`);
  return v;
}

const partial: Verb = {
  summary: 'evaluate one task\'s share of a piece set (.pvtu, .vtm) for `reduce` (cluster runs)',
  usage: [
    'fieldtally partial <set.pvtu|set.vtm> --probes set.json --task i --tasks n --out part-i.json',
    '  Task i (0 ≤ i < n) reads only its share of the set\'s leaf files (contiguous, in file order) and writes what',
    '  `fieldtally reduce part-*.json --out dir/` needs to write the report folder of the whole set: the cells the',
    '  probes reach on its pieces (planes, lines, points, the boundary), the set\'s identity and the probe set.',
    '  With a job array, pass the array index and size, e.g. --task $SLURM_ARRAY_TASK_ID --tasks $SLURM_ARRAY_TASK_COUNT.',
  ].join('\n'),
  options: { probes: 'string', task: 'string', tasks: 'string', out: 'string' },
  async run(argv, io) {
    const args = parseArgs(argv, this.options, 'partial');
    const probesPath = str(args, 'probes'), out = str(args, 'out');
    if (args.positional.length !== 1) throw new Error(`give exactly one piece set (.pvtu, .vtm …), got ${args.positional.length} file names`);
    if (!probesPath) throw new Error('--probes set.json is required (a probe-set file; see `fieldtally check-probes --help`)');
    if (!out) throw new Error('--out part.json is required (the partial-results file to write)');
    const tasks = wholeNumber(str(args, 'tasks'), 'tasks', 1, MAX_TASKS);
    const task = wholeNumber(str(args, 'task'), 'task', 0, tasks - 1);
    const file = args.positional[0]!;
    const ps = await readProbeSetFile(probesPath);
    const share = await readShare(file, task, tasks);
    const d = share.dataset;
    const { dataset, pieces } = encodeTask(d, ps.set);
    const doc: PartialDoc = {
      format: PARTIAL_FORMAT, version: PARTIAL_VERSION, tool: { name: 'fieldtally', version: toolVersion() }, createdAt: new Date().toISOString(),
      set: { file, source: basename(file), sha256: share.setSha256, leaves: share.leaves },
      task: { index: task, count: tasks, firstLeaf: share.firstLeaf, endLeaf: share.endLeaf },
      probeSet: { name: ps.input.name, sha256: ps.input.sha256, bytes: ps.input.bytes, role: ps.input.role, fromVersion: ps.fromVersion, text: ps.text },
      units: ps.set.units ?? null,
      inputs: share.inputs,
      dataset, pieces,
    };
    let text: string;
    try {
      text = JSON.stringify(doc) + '\n';
    } catch (e) {
      if (!(e instanceof RangeError)) throw e;
      const kept = pieces.reduce((n, p) => n + p.cellsKept, 0);
      throw new Error(`${basename(file)}: task ${task} of ${tasks} keeps ${kept} cells, too many for one JSON document (about 500 MB of text at most); split the set among more tasks`);
    }
    writeFileSync(out, text);
    const read = pieces.reduce((n, p) => n + p.cellsRead, 0), kept = pieces.reduce((n, p) => n + p.cellsKept, 0);
    const leaves = share.endLeaf > share.firstLeaf ? `leaf files ${share.firstLeaf + 1}–${share.endLeaf} of ${share.leaves} (${share.read.join(', ')})` : `no leaf file (the set has ${share.leaves} for ${tasks} tasks)`;
    io.out(`task ${task} of ${tasks}: ${leaves}; ${d.pieces.length} piece(s), ${kept} of ${read} cells reached by the ${ps.set.probes.length} probe(s) or on the boundary; wrote ${out} (${(text.length / 1048576).toFixed(2)} MiB)`);
    return 0;
  },
};
export default partial;
