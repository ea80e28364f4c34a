/**
 * `fieldtally report <file|pattern>… --probes set.json --out dir/`: evaluates a probe set on one or more
 * result files and writes a self-contained report folder (report.html, results.json, results.csv with one
 * row per file, results-long.csv, probe-set.json, a picture per file). Exit code 3 when any probe failed
 * (the report is still written, the failures listed on stderr).
 */
import { basename } from 'node:path';
import { evaluateProbeSet } from '../../study/evaluate.ts';
import { resolveReference } from '../../study/outcome.ts';
import { writeProbeSet } from '../../study/probeSetFile.ts';
import { reportFolder } from '../../study/reportFolder.ts';
import type { InputFileInfo, ReportPicture } from '../../study/reportHtml.ts';
import { CONVENTIONS, UNITS_STATEMENT, failureLines, resultsText, type FileEvaluation } from '../../study/resultTables.ts';
import { CAUTION } from '../../study/caution.ts';
import { parseArgs, str } from '../args.ts';
import { expandInputs } from '../fileGlob.ts';
import { pictureOptions } from '../pictureOptions.ts';
import { reportPicture } from '../reportPicture.ts';
import { checkReportFolder, writeReportFolder } from '../reportWriter.ts';
import { loadInput, readProbeSetFile, toolVersion } from '../studyInputs.ts';
import { historyCsv } from '../../series/historyTable.ts';
import { statisticsCsv } from '../../series/historyStats.ts';
import { meanEvaluation } from '../../series/seriesMeans.ts';
import { looksLikeSeries } from '../seriesInputs.ts';
import { studySeries } from '../seriesStudy.ts';
import { SERIES_WORKER_HELP, WORKER_OPTIONS } from '../workerOption.ts';
import { openNodePool, poolSize } from '../../parallel/nodePool.ts';
import type { Verb } from '../verb.ts';
import type { Dataset } from '../../model/dataset.ts';
import type { ProbeSet } from '../../study/probeSet.ts';

/** Exit code when the report was written but some probe failed. */
export const EXIT_PROBE_FAILED = 3;

/** Pictures made at most (one per file, in order). */

const report: Verb = {
  summary: 'evaluate a probe set on one or more result files and write a report folder (HTML, CSV, JSON, pictures)',
  usage: [
    'fieldtally report <file|pattern>… --probes set.json --out dir/ [--title text] [--color field[:x|y|z|magnitude]]',
    '                  [--width px] [--height px] [--pictures n] [--no-pictures]',
    '  Evaluates every probe of the probe set on each result file and writes into dir/:',
    '    report.html        self-contained page: pictures with pins, summary (a row per file), every number, the probe set,',
    '                       the inputs with sizes and SHA-256 checksums, time, tool version, units, conventions and the caution',
    '    results.json       every number at full precision with its unit; results.csv one row per file;',
    '    results-long.csv   one row per file, probe and quantity; probe-set.json; view-<n>.png pictures',
    '  Patterns (* ? [..] {a,b} **) are expanded here too, so they may be quoted. Several files make a sweep: one table row each.',
    '  A series (a .pvd or a folder, see `fieldtally history`) gives one row of time means over its statistics window, and',
    '  series-<n>-history.csv and series-<n>-statistics.csv (mean ± 95 % half-width, rms, min/max) beside them; no picture.',
    '  --color       field to colour the surfaces by (default: a pressure field, else the first field)',
    '  --width/--height  picture size in pixels (default 1200 × 800); --pictures n: pictures for the first n files (default 12)',
    SERIES_WORKER_HELP + ' (series);',
    '                        on single files only when given: N compute workers evaluate the probes (the same numbers as one)',
    '  Exit code 3 when any probe failed (the report is still written; the failures go to stderr).',
    `  ${UNITS_STATEMENT}`,
  ].join('\n'),
  options: { probes: 'string', out: 'string', title: 'string', color: 'string', width: 'string', height: 'string', pictures: 'string', 'no-pictures': 'boolean', ...WORKER_OPTIONS },
  async run(argv, io) {
    const args = parseArgs(argv, this.options, 'report');
    const probesPath = str(args, 'probes'), out = str(args, 'out');
    if (!probesPath) throw new Error('--probes set.json is required (a probe-set file; see `fieldtally check-probes --help`)');
    if (!out) throw new Error('--out dir/ is required (the report folder to write)');
    if (args.positional.length === 0) throw new Error('give at least one result file (or a pattern such as "runs/*.vtu")');
    const files = expandInputs(args.positional);
    const { width, height, maxPictures } = pictureOptions(args);
    checkReportFolder(out, { inputs: [probesPath, ...files] });
    const ps = await readProbeSetFile(probesPath);
    if (ps.fromVersion < ps.set.version) io.err(`note: ${basename(probesPath)} is a version ${ps.fromVersion} probe set; it was upgraded on reading (fieldtally check-probes ${basename(probesPath)} --upgrade new.json writes the current version)`);
    const inputs: InputFileInfo[] = [];
    const evaluations: FileEvaluation[] = [];
    const pictures: ReportPicture[] = [];
    const seriesFiles: Record<string, Uint8Array> = {};
    for (const [i, file] of files.entries()) {
      if (looksLikeSeries(file)) {
        const st = await studySeries(file, ps.set, true, str(args, 'workers'));
        inputs.push(...st.inputs);
        const ctx = { tool: 'fieldtally', version: toolVersion(), createdAt: new Date().toISOString(), caution: CAUTION, ...(ps.set.title ? { probeSet: ps.set.title } : {}) };
        seriesFiles[`series-${i + 1}-history.csv`] = new TextEncoder().encode(historyCsv(st.table, ctx));
        seriesFiles[`series-${i + 1}-statistics.csv`] = new TextEncoder().encode(statisticsCsv(st.table, st.summaries, ctx));
        const evaluation = meanEvaluation(st.table, st.summaries, file, resolveReference(ps.set.reference), ps.set.units?.length ?? 'm');
        for (const f of st.table.failures) evaluation.probes[0]?.notes.push(`failed at a step: ${f}`);
        evaluations.push({ file: `${file} (time means)`, evaluation });
        continue;
      }
      const { dataset, inputs: read } = await loadInput(file);
      inputs.push(...read);
      const picture = i < maxPictures;
      const workers = str(args, 'workers') === undefined ? 1 : poolSize(str(args, 'workers'));
      const evaluation = workers > 1 ? await evaluateOnPool(dataset, ps.set, workers, picture) : evaluateProbeSet(dataset, ps.set, { keepShapes: picture });
      if (picture) pictures.push(reportPicture(dataset, evaluation, ps.set.units, { width, height, color: str(args, 'color'), file: `view-${i + 1}.png` }));
      for (const p of evaluation.probes) delete p.shapes;
      evaluations.push({ file, evaluation });
    }
    inputs.push(ps.input);
    const title = str(args, 'title') ?? (ps.set.title ? `${ps.set.title} — fieldtally report` : `fieldtally report — ${files.length === 1 ? basename(files[0]!) : `${files.length} result files`}`);
    const written = writeReportFolder(out, { ...seriesFiles, ...reportFolder({
      title, tool: 'fieldtally', version: toolVersion(), createdAt: new Date().toISOString(), caution: CAUTION,
      probeSet: ps.set, probeSetText: writeProbeSet(ps.set), inputs, files: evaluations, pictures, conventions: [...CONVENTIONS],
    }) }, { inputs: [probesPath, ...files] });
    io.out([...resultsText(evaluations), `report written: ${written.length} files in ${out} (open report.html)`, '', UNITS_STATEMENT, `Caution: ${CAUTION}`].join('\n'));
    const failures = failureLines(evaluations);
    if (failures.length) {
      io.err([`${failures.length} probe evaluation${failures.length > 1 ? 's' : ''} failed:`, ...failures.map((f) => `  ${f}`)].join('\n'));
      return EXIT_PROBE_FAILED;
    }
    return 0;
  },
};
/** The probes dealt out to `workers` compute workers (src/parallel/probeSetShares.ts); the pool ends after. */
async function evaluateOnPool(dataset: Dataset, set: ProbeSet, workers: number, keepShapes: boolean) {
  const pool = await openNodePool(dataset, workers);
  try { return await pool.evaluateProbeSet(set, { keepShapes }); } finally { await pool.close(); }
}

export default report;
