/**
 * `fieldtally history <series> --probes set.json [--from t0] [--to t1] [--csv | --json | --out dir/]`:
 * every probe of a set at every step of a series (a `.pvd`, a folder, a pattern or several numbered
 * files), streamed step by step with the mesh reused. Prints the statistics of each quantity by default,
 * the history table with `--csv`, the table with statistics and spectra with `--json`, and writes a report
 * folder with plots with `--out`. Exit code 3 when a probe failed at some step (output still written).
 */
import { basename } from 'node:path';
import { summarizeTable } from '../../series/historyStats.ts';
import { historyReport } from '../../series/historyReport.ts';
import { historyCsv, historyPreamble } from '../../series/historyTable.ts';
import { historyJson } from '../../series/historyStats.ts';
import { evaluateSeriesOnWorkers } from '../../parallel/seriesPool.ts';
import { stepsInWindow } from '../../series/seriesIndex.ts';
import { resolveReference } from '../../study/outcome.ts';
import { writeProbeSet } from '../../study/probeSetFile.ts';
import { UNITS_STATEMENT, sig6, type TableContext } from '../../study/resultTables.ts';
import { CAUTION } from '../../study/caution.ts';
import { parseArgs, parseNumber, str } from '../args.ts';
import { writeReportFolder } from '../reportWriter.ts';
import { nodeSeriesFiles, openSeriesInput } from '../seriesInputs.ts';
import { readProbeSetFile, toolVersion } from '../studyInputs.ts';
import type { Verb } from '../verb.ts';
import { SERIES_WORKER_HELP, seriesWorkerCount, WORKER_OPTIONS } from '../workerOption.ts';
import { EXIT_PROBE_FAILED } from './report.ts';

const history: Verb = {
  summary: 'a probe set at every step of a series: history table, window statistics, spectra, report folder',
  usage: [
    'fieldtally history <series> --probes set.json [--from t0] [--to t1] [--csv | --json | --out dir/] [--workers N]',
    '  <series>: a .pvd collection file; a folder (its .pvd, else its numbered result files); a pattern such as',
    '  "run/flow_*.vtu"; or several numbered files (flow.0001.vtu, flow_0002.vtu, flow0003.vtk … ordered by number).',
    '  Times come from the collection, else each file\'s TimeValue field data, else the step index — the output says which.',
    '  --from/--to   window of times (inclusive) to read and to take statistics over; the statistics window starts at',
    '                the detected end of the initial transient (MSER-5) unless --from is given',
    '  --csv         the history table: time, step file and one column per quantity named as in results.csv',
    '  --json        the table plus, per quantity, window statistics (mean, std, rms fluctuation, min/max, uncertainty',
    '                of the mean with its method, transient end) and the dominant frequency with its Strouhal number',
    '  --out dir/    report folder: report.html, history.csv/.json, statistics.csv, spectra.csv, plots (SVG)',
    SERIES_WORKER_HELP,
    '  Exit code 3 when a probe failed at some step.',
    `  ${UNITS_STATEMENT}`,
  ].join('\n'),
  options: { probes: 'string', from: 'string', to: 'string', csv: 'boolean', json: 'boolean', out: 'string', ...WORKER_OPTIONS },
  async run(argv, io) {
    const args = parseArgs(argv, this.options, 'history');
    const probesPath = str(args, 'probes');
    if (!probesPath) throw new Error('--probes set.json is required (a probe-set file; see `fieldtally check-probes --help`)');
    const modes = [args.options.csv, args.options.json, str(args, 'out')].filter(Boolean).length;
    if (modes > 1) throw new Error('choose one of --csv, --json and --out');
    const from = str(args, 'from') === undefined ? undefined : parseNumber(str(args, 'from')!, 'from');
    const to = str(args, 'to') === undefined ? undefined : parseNumber(str(args, 'to')!, 'to');
    const ps = await readProbeSetFile(probesPath);
    if (ps.fromVersion < ps.set.version) io.err(`note: ${basename(probesPath)} is a version ${ps.fromVersion} probe set; it was upgraded on reading`);
    const index = await openSeriesInput(args.positional);
    const workers = seriesWorkerCount(str(args, 'workers'), stepsInWindow(index, from, to).length);
    const table = await evaluateSeriesOnWorkers(index, nodeSeriesFiles, ps.set, { workers, ...(from !== undefined ? { from } : {}), ...(to !== undefined ? { to } : {}) });
    const ctx: TableContext = { tool: 'fieldtally', version: toolVersion(), createdAt: new Date().toISOString(), caution: CAUTION, ...(ps.set.title ? { probeSet: ps.set.title } : {}) };
    const reference = resolveReference(ps.set.reference);
    const summaries = args.options.csv ? [] : summarizeTable(table, { ...(from !== undefined ? { from } : {}), ...(to !== undefined ? { to } : {}), reference });
    const out = str(args, 'out');
    if (args.options.csv) io.out(historyCsv(table, ctx));
    else if (args.options.json) io.out(historyJson(table, summaries, ctx));
    else if (out) {
      const title = ps.set.title ? `${ps.set.title} — fieldtally history of ${index.name}` : `fieldtally history — ${index.name}`;
      const written = writeReportFolder(out, historyReport(table, summaries, { ...ctx, title }, writeProbeSet(ps.set)));
      io.out([...historyPreamble(table, ctx).slice(0, 3), `report written: ${written.length} files in ${out} (open report.html)`, `Caution: ${CAUTION}`].join('\n'));
    } else {
      const lines = historyPreamble(table, ctx).slice(0, 3);
      for (const s of summaries) {
        const m = s.summary;
        if (!m) { lines.push(`  ${s.column.name}: ${s.error}`); continue; }
        const sp = m.spectrum;
        lines.push(`  ${s.column.name}: mean ${sig6(m.stats.mean)} ± ${sig6(m.stats.meanUncertainty.halfWidth95)} (95 %), rms fluctuation ${sig6(m.stats.rmsFluctuation)}, `
          + `min ${sig6(m.stats.min)}, max ${sig6(m.stats.max)} over ${sig6(m.stats.from)} … ${sig6(m.stats.to)} ${table.timeUnit}`
          + (sp ? `; dominant frequency ${sig6(sp.frequency)} ${table.timeUnit === 's' ? 'Hz' : '1/step'}${m.strouhal !== null ? `, St ${sig6(m.strouhal)}` : ''}` : ''));
      }
      lines.push('', UNITS_STATEMENT, `Caution: ${CAUTION}`);
      io.out(lines.join('\n'));
    }
    if (table.failures.length) {
      io.err([`${table.failures.length} probe evaluation${table.failures.length > 1 ? 's' : ''} failed:`, ...table.failures.slice(0, 20).map((f) => `  ${f}`)].join('\n'));
      return EXIT_PROBE_FAILED;
    }
    return 0;
  },
};
export default history;
