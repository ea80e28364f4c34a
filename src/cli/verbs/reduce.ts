/**
 * `fieldtally reduce part-*.json --out dir/`: combines the partial-results documents of every task of one
 * piece set (`fieldtally partial`) and writes the report folder `fieldtally report <set> --probes set.json`
 * writes for the whole set: the parts are checked against each other (`src/pieces/assemble.ts`), their cells
 * assembled into one dataset in the whole set's order, and the probe set evaluated on it by the same path as
 * `report`. Options as `report`'s; exit code 3 when a probe failed (the report is still written).
 */
import { readFileSync } from 'node:fs';
import { basename } from 'node:path';
import { assembleParts } from '../../pieces/assemble.ts';
import { readPartial } from '../../pieces/readPartial.ts';
import { evaluateProbeSet } from '../../study/evaluate.ts';
import { readProbeSet, writeProbeSet } from '../../study/probeSetFile.ts';
import { reportFolder } from '../../study/reportFolder.ts';
import type { ReportPicture } from '../../study/reportHtml.ts';
import { CONVENTIONS, UNITS_STATEMENT, failureLines, resultsText, type FileEvaluation } from '../../study/resultTables.ts';
import { CAUTION } from '../../study/caution.ts';
import { parseArgs, str } from '../args.ts';
import { expandInputs } from '../fileGlob.ts';
import { pictureOptions } from '../pictureOptions.ts';
import { reportPicture } from '../reportPicture.ts';
import { writeReportFolder } from '../reportWriter.ts';
import { toolVersion } from '../studyInputs.ts';
import type { Verb } from '../verb.ts';
import { EXIT_PROBE_FAILED } from './report.ts';

const reduce: Verb = {
  summary: 'combine the `partial` results of every task of a piece set into the whole set\'s report folder',
  usage: [
    'fieldtally reduce <part.json|pattern>… --out dir/ [--title text] [--color field[:x|y|z|magnitude]] [--width px] [--height px] [--no-pictures]',
    '  Reads the partial-results files of every task of one piece set (see `fieldtally partial --help`), checks that',
    '  they belong together (same set file, same probe set, every task exactly once) and writes into dir/ the report',
    '  folder `fieldtally report <set> --probes set.json` writes for the whole set (report.html, results.json,',
    '  results.csv, results-long.csv, probe-set.json, the picture). Faces between pieces of different tasks are not',
    '  boundary; a line or point sample on a face between pieces takes the cell `report` takes.',
    '  Exit code 3 when any probe failed (the report is still written; the failures go to stderr).',
    `  ${UNITS_STATEMENT}`,
  ].join('\n'),
  options: { out: 'string', title: 'string', color: 'string', width: 'string', height: 'string', pictures: 'string', 'no-pictures': 'boolean' },
  async run(argv, io) {
    const args = parseArgs(argv, this.options, 'reduce');
    const out = str(args, 'out');
    if (!out) throw new Error('--out dir/ is required (the report folder to write)');
    if (args.positional.length === 0) throw new Error('give the partial-results files of every task (or a pattern such as "parts/part-*.json")');
    const files = expandInputs(args.positional);
    const { width, height, maxPictures } = pictureOptions(args);
    const picture = maxPictures >= 1;
    const parts = files.map((f) => {
      let text: string;
      try { text = readFileSync(f, 'utf8'); } catch (e) { throw new Error(`${f}: cannot be read (${(e as NodeJS.ErrnoException).code ?? (e as Error).message})`); }
      return readPartial(text, f);
    });
    const whole = assembleParts(parts);
    const { set } = readProbeSet(whole.probeSet.text, whole.probeSet.name);
    const evaluation = evaluateProbeSet(whole.dataset, set, { keepShapes: picture });
    const pictures: ReportPicture[] = picture ? [reportPicture(whole.dataset, evaluation, set.units, { width, height, color: str(args, 'color'), file: 'view-1.png' })] : [];
    for (const p of evaluation.probes) delete p.shapes;
    const evaluations: FileEvaluation[] = [{ file: whole.file, evaluation }];
    const title = str(args, 'title') ?? (set.title ? `${set.title} — fieldtally report` : `fieldtally report — ${basename(whole.file)}`);
    const written = writeReportFolder(out, reportFolder({
      title, tool: 'fieldtally', version: toolVersion(), createdAt: new Date().toISOString(), caution: CAUTION,
      probeSet: set, probeSetText: writeProbeSet(set), inputs: [...whole.inputs, whole.probeSet.input], files: evaluations, pictures, conventions: [...CONVENTIONS],
    }));
    io.out([...resultsText(evaluations), `${parts.length} partial result(s) of ${whole.dataset.source} combined; report written: ${written.length} files in ${out} (open report.html)`, '', UNITS_STATEMENT, `Caution: ${CAUTION}`].join('\n'));
    const failures = failureLines(evaluations);
    if (failures.length) {
      io.err([`${failures.length} probe evaluation${failures.length > 1 ? 's' : ''} failed:`, ...failures.map((f) => `  ${f}`)].join('\n'));
      return EXIT_PROBE_FAILED;
    }
    return 0;
  },
};
export default reduce;
