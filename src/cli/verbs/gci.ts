/**
 * `fieldtally gci <coarse> <medium> <fine> --probes set.json [--json | --csv] [--only id,id.key]`: the
 * grid-convergence estimate of Celik et al. (2008) for every quantity of a probe set on three meshes of
 * one case. Exit code 3 when any probe failed on any mesh.
 */
import { evaluateProbeSet } from '../../study/evaluate.ts';
import { gridStudy, gridStudyJson, gridStudyText, meshSize, type GridLevel } from '../../study/gridStudy.ts';
import { siFactors } from '../../study/siDataset.ts';
import { CAUTION } from '../../study/caution.ts';
import { parseArgs, str } from '../args.ts';
import { loadInput, readProbeSetFile, toolVersion } from '../studyInputs.ts';
import type { Verb } from '../verb.ts';
import { EXIT_PROBE_FAILED } from './report.ts';

const cell = (s: string): string => (/[",\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s);
const n = (v: number | null | undefined): string => (v === null || v === undefined ? '' : String(v));

const gci: Verb = {
  summary: 'grid-convergence estimate (Celik et al. 2008) of every probe quantity from three meshes',
  usage: [
    'fieldtally gci <coarse> <medium> <fine> --probes set.json [--json | --csv] [--only id,id.key,…]',
    '  Evaluates the probe set on three meshes of one case (any order: they are sorted by cell size) and reports per',
    '  quantity the apparent order p, the extrapolated value, the approximate and extrapolated relative errors and the',
    '  fine-grid convergence index GCI = 1.25·e_a/(r^p − 1), after Celik et al., J. Fluids Eng. 130 (2008) 078001.',
    '  The mesh size is h = (total volume / number of cells)^(1/3) of the 3D cells, in m. Oscillatory or divergent',
    '  behaviour is reported as such, with no order or GCI. Refinement ratios below 1.3 are flagged.',
    '  --only    limit to probes (id) or quantities (id.key)',
    '  Exit code 3 when any probe failed on any mesh.',
  ].join('\n'),
  options: { probes: 'string', json: 'boolean', csv: 'boolean', only: 'string' },
  async run(argv, io) {
    const args = parseArgs(argv, this.options, 'gci');
    const probesPath = str(args, 'probes');
    if (!probesPath) throw new Error('--probes set.json is required');
    if (args.positional.length !== 3) throw new Error(`expected three result files (coarse, medium, fine); got ${args.positional.length}`);
    if (args.options.json && args.options.csv) throw new Error('choose one of --json and --csv');
    const ps = await readProbeSetFile(probesPath);
    const k = siFactors(ps.set.units).length;
    const levels: GridLevel[] = [];
    for (const file of args.positional) {
      const { dataset } = await loadInput(file);
      levels.push({ file, size: meshSize(dataset, k), evaluation: evaluateProbeSet(dataset, ps.set) });
    }
    const only = str(args, 'only')?.split(',').map((s) => s.trim()).filter(Boolean);
    const s = gridStudy(levels, only);
    if (only && s.quantities.length === 0) throw new Error(`--only ${only.join(',')}: matches no probe or quantity`);
    if (args.options.json) io.out(JSON.stringify({ tool: 'fieldtally', version: toolVersion(), ...gridStudyJson(s), caution: CAUTION }, null, 2));
    else if (args.options.csv) {
      io.out([
        `# grid-convergence estimate after Celik et al. (2008), J. Fluids Eng. 130, 078001; h in m; relative errors and GCI as fractions`,
        `# meshes fine → coarse: ${s.levels.map((l) => `${l.file} (h = ${l.size.h} m)`).join('; ')}`,
        `# Caution: ${CAUTION}`,
        'probe,quantity,unit,fine,medium,coarse,behaviour,apparent order,extrapolated,e_a,e_ext,GCI fine,note',
        ...s.quantities.map((q) => [q.probe, q.key, q.unit, n(q.phi[0]), n(q.phi[1]), n(q.phi[2]), q.result?.kind ?? 'missing', n(q.result?.order),
          n(q.result?.extrapolated), n(q.result?.approxRelError), n(q.result?.extrapRelError), n(q.result?.gciFine), q.missing ?? q.result?.notes.join(' ') ?? ''].map(cell).join(',')),
      ].join('\n'));
    } else io.out([...gridStudyText(s), '', 'Reference: Celik et al. (2008), J. Fluids Eng. 130(7), 078001; safety factor 1.25 for three grids.', `Caution: ${CAUTION}`].join('\n'));
    const chosen = new Set(s.quantities.map((q) => q.probe));
    const failures = levels.flatMap((l) => l.evaluation.probes.filter((p) => !p.ok && chosen.has(p.id)).map((p) => `${l.file}: ${p.label} [${p.id}] — ${p.error}`));
    if (failures.length) {
      io.err([`${failures.length} probe evaluation${failures.length > 1 ? 's' : ''} failed:`, ...failures.map((f) => `  ${f}`)].join('\n'));
      return EXIT_PROBE_FAILED;
    }
    return 0;
  },
};
export default gci;
