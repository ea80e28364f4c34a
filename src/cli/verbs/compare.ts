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
import { parseArgs, str } from '../args.ts';
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
    `  ${UNITS_STATEMENT}`,
  ].join('\n'),
  options: { probes: 'string', json: 'boolean', csv: 'boolean' },
  async run(argv, io) {
    const args = parseArgs(argv, this.options, 'compare');
    const probesPath = str(args, 'probes');
    if (!probesPath) throw new Error('--probes set.json is required');
    if (args.positional.length !== 2) throw new Error(`expected two result files, baseline then variant; got ${args.positional.length}`);
    if (args.options.json && args.options.csv) throw new Error('choose one of --json and --csv');
    const [basePath, varPath] = args.positional as [string, string];
    const ps = await readProbeSetFile(probesPath);
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
