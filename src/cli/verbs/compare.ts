/**
 * `fieldtally compare <baseline> <variant> --probes set.json [--json | --csv]`: the same probe set on two
 * result files, side by side with absolute and relative differences. Exit code 3 when any probe failed on
 * either file (listed on stderr).
 */
import { basename } from 'node:path';
import { compareEvaluations, comparisonCsv, comparisonText } from '../../study/compare.ts';
import { evaluateProbeSet } from '../../study/evaluate.ts';
import { UNITS_STATEMENT } from '../../study/resultTables.ts';
import { CAUTION } from '../../study/caution.ts';
import { compareSeries } from '../../series/seriesMeans.ts';
import { resolveReference } from '../../study/outcome.ts';
import { parseArgs, str } from '../args.ts';
import { looksLikeSeries } from '../seriesInputs.ts';
import { studySeries } from '../seriesStudy.ts';
import { SERIES_WORKER_HELP, WORKER_OPTIONS } from '../workerOption.ts';
import { loadInput, readProbeSetFile, toolVersion } from '../studyInputs.ts';
import type { Verb } from '../verb.ts';
import { EXIT_PROBE_FAILED } from './report.ts';

const compare: Verb = {
  summary: 'the same probe set on a baseline and a variant: both values, absolute and relative differences',
  usage: [
    'fieldtally compare <baseline> <variant> --probes set.json [--json | --csv]',
    '  Evaluates every probe on both files and prints per quantity: baseline, variant, difference = variant − baseline',
    '  (in the quantity\'s unit) and relative difference = difference / |baseline|. A quantity missing on one side, or a',
    '  probe that failed there, is listed with a note, never as a zero difference. Exit code 3 when any probe failed.',
    '  Two series (a .pvd or a folder each, see `fieldtally history`) compare their time means over the statistics window',
    '  (from the detected end of the initial transient), each with its 95 % half-width, and say whether the difference',
    '  exceeds the two half-widths combined in quadrature.',
    SERIES_WORKER_HELP + ' (series only)',
    `  ${UNITS_STATEMENT}`,
  ].join('\n'),
  options: { probes: 'string', json: 'boolean', csv: 'boolean', ...WORKER_OPTIONS },
  async run(argv, io) {
    const args = parseArgs(argv, this.options, 'compare');
    const probesPath = str(args, 'probes');
    if (!probesPath) throw new Error('--probes set.json is required');
    if (args.positional.length !== 2) throw new Error(`expected two result files, baseline then variant; got ${args.positional.length}`);
    if (args.options.json && args.options.csv) throw new Error('choose one of --json and --csv');
    const [basePath, varPath] = args.positional as [string, string];
    const ps = await readProbeSetFile(probesPath);
    if (looksLikeSeries(basePath) || looksLikeSeries(varPath)) {
      if (!looksLikeSeries(basePath) || !looksLikeSeries(varPath)) throw new Error(`compare a series with a series: ${looksLikeSeries(basePath) ? varPath : basePath} is a single result file (give a .pvd or a folder of numbered files)`);
      const b = await studySeries(basePath, ps.set, false, str(args, 'workers')), v = await studySeries(varPath, ps.set, false, str(args, 'workers'));
      const c = compareSeries(b, v, resolveReference(ps.set.reference), ps.set.units?.length ?? 'm');
      const note = 'time means over each series\' statistics window; ± = 95 % half-width of the mean; "exceeds" = |difference| > √(h_b² + h_v²) (common practice)';
      if (args.options.json) {
        io.out(JSON.stringify({
          tool: 'fieldtally', version: toolVersion(), probeSet: basename(probesPath), baseline: c.baseline, variant: c.variant, series: true, note,
          timeSources: { baseline: b.table.timeSource, variant: v.table.timeSource },
          rows: c.rows, failures: [...c.failures, ...b.table.failures, ...v.table.failures], units: UNITS_STATEMENT, caution: CAUTION,
        }, null, 2));
      } else if (args.options.csv) {
        io.out([`# ${note}`, comparisonCsv(c, CAUTION).trimEnd(), '# half-widths (95 %): probe,quantity,baseline,variant,exceeds',
          ...c.rows.map((r) => `# ${r.probe},${r.key},${r.baselineHalfWidth95 ?? ''},${r.variantHalfWidth95 ?? ''},${r.exceedsUncertainty ?? ''}`)].join('\n'));
      } else {
        const text = comparisonText(c);
        const byLine = c.rows.map((r) => `  ${r.probe}.${r.key}: ± ${r.baselineHalfWidth95 === null ? '—' : r.baselineHalfWidth95.toPrecision(3)} / ± ${r.variantHalfWidth95 === null ? '—' : r.variantHalfWidth95.toPrecision(3)}${r.exceedsUncertainty === null ? '' : r.exceedsUncertainty ? ' — difference exceeds the uncertainty of the means' : ' — difference within the uncertainty of the means'}`);
        io.out([...text, '', note, ...byLine, '', UNITS_STATEMENT, `Caution: ${CAUTION}`].join('\n'));
      }
      const failures = [...c.failures, ...b.table.failures, ...v.table.failures];
      if (failures.length) { io.err([`${failures.length} probe evaluation${failures.length > 1 ? 's' : ''} failed:`, ...failures.map((f) => `  ${f}`)].join('\n')); return EXIT_PROBE_FAILED; }
      return 0;
    }
    const base = await loadInput(basePath), vari = await loadInput(varPath);
    const c = compareEvaluations(evaluateProbeSet(base.dataset, ps.set), evaluateProbeSet(vari.dataset, ps.set), { baseline: basePath, variant: varPath });
    if (args.options.json) {
      io.out(JSON.stringify({
        tool: 'fieldtally', version: toolVersion(), probeSet: basename(probesPath), baseline: c.baseline, variant: c.variant,
        definitions: { difference: 'variant − baseline, in the unit of the quantity', relative: '(variant − baseline) / |baseline|, a fraction' },
        rows: c.rows, failures: c.failures, inputs: [...base.inputs, ...vari.inputs, ps.input], units: UNITS_STATEMENT, caution: CAUTION,
      }, null, 2));
    } else if (args.options.csv) io.out(comparisonCsv(c, CAUTION));
    else io.out([...comparisonText(c), '', UNITS_STATEMENT, `Caution: ${CAUTION}`].join('\n'));
    if (c.failures.length) {
      io.err([`${c.failures.length} probe evaluation${c.failures.length > 1 ? 's' : ''} failed:`, ...c.failures.map((f) => `  ${f}`)].join('\n'));
      return EXIT_PROBE_FAILED;
    }
    return 0;
  },
};
export default compare;
