/**
 * `fieldtally line <file> --from x,y,z --to x,y,z [--samples N | --crossings] [--fields a,b] [--csv | --json]
 * [--wall-normal [--velocity name] [--edge max|gradient] [--edge-fraction f] [--stream x,y,z]]`:
 * a line probe with statistics along the line and, for a wall-normal line, boundary-layer quantities.
 */
import { loadDatasetFile } from '../../io/nodeFiles.ts';
import { DERIVED_HELP, DERIVED_OPTIONS, withDerivedArgs } from '../derivedArgs.ts';
import { boundaryLayer, type BoundaryLayerResult } from '../../locate/boundaryLayer.ts';
import { LINE_PROBE_DEFAULTS, probeLine, type LineProbeResult } from '../../locate/lineProbe.ts';
import { lineStats, type LineStats } from '../../locate/lineStats.ts';
import { CAUTION } from '../../ui/caution.ts';
import { parseArgs, parseNumber, parseVec3, str } from '../args.ts';
import type { Verb } from '../verb.ts';

const UNITS = "values in the file's units; s, x, y, z in the file's length unit; integrals in field unit × length unit";

/** A number for JSON: NaN (no value) becomes null, never 0. */
const jnum = (v: number): number | null => (Number.isFinite(v) ? v : null);
const fmt = (v: number): string => (!Number.isFinite(v) ? '—' : v === 0 || (Math.abs(v) >= 1e-3 && Math.abs(v) < 1e6) ? String(Number(v.toPrecision(6))) : v.toExponential(5));

/** The CSV table: header `s,x,y,z,valid,` then one column per scalar / component; empty cells where invalid. */
export function lineCsv(r: LineProbeResult): string {
  const labels = r.fields.flatMap((f) => f.labels);
  const cols = r.fields.flatMap((f) => f.columns);
  const rows = [['s', 'x', 'y', 'z', 'valid', ...labels].join(',')];
  for (let i = 0; i < r.count; i++) {
    const cells = [String(r.s[i]), String(r.x[i]), String(r.y[i]), String(r.z[i]), String(r.valid[i])];
    for (const c of cols) cells.push(r.valid[i] ? String(c[i]) : '');
    rows.push(cells.join(','));
  }
  return rows.join('\n');
}

function statsJson(st: LineStats) {
  return {
    coveredLength: st.coveredLength,
    gaps: st.gaps,
    fields: st.series.map((q) => ({
      field: q.field, label: q.label, component: q.component === -1 ? 'magnitude' : q.component,
      validSamples: q.stats.validSamples, min: jnum(q.stats.min), max: jnum(q.stats.max), mean: jnum(q.stats.mean),
      integral: jnum(q.stats.integral),
    })),
  };
}

function blJson(b: BoundaryLayerResult) {
  return {
    ok: b.ok, ...(b.reason ? { reason: b.reason } : {}), criterion: b.criterion,
    edgeVelocity: jnum(b.edgeVelocity), edgeDistance: jnum(b.edgeDistance), delta99: jnum(b.delta99),
    displacementThickness: jnum(b.displacementThickness), momentumThickness: jnum(b.momentumThickness),
    shapeFactor: jnum(b.shapeFactor), samplesUsed: b.samplesUsed, warnings: b.warnings,
  };
}

const line: Verb = {
  summary: 'line probe: values along a segment, statistics, boundary-layer thicknesses',
  usage: [
    'fieldtally line <file> --from x,y,z --to x,y,z [--samples N | --crossings] [--fields a,b] [--csv | --json]',
    '                [--tolerance t] [--wall-normal [--velocity name] [--edge max|gradient] [--edge-fraction f] [--stream x,y,z]]',
    `  --samples N        N evenly spaced samples, both ends included (default ${LINE_PROBE_DEFAULTS.samples})`,
    '  --crossings        sample at both ends and wherever the segment crosses a cell face',
    '  --fields a,b       fields to sample (default: all; prefix point: or cell: to pick the association)',
    '  --csv              print the samples as CSV (header s,x,y,z,valid, then one column per scalar, name_x,name_y,name_z per vector)',
    '  --json             print samples, statistics and (with --wall-normal) the boundary-layer block as JSON',
    '  --tolerance t      locate tolerance, parametric, relative to the cell size (default 1e-6, at most 1e-4)',
    '  --wall-normal      the line starts on a wall: report edge velocity, δ99, δ*, θ and H',
    '  --velocity name    velocity field for --wall-normal (default: velocity)',
    '  --edge max|gradient  edge criterion: the profile maximum (default) or where |du/ds| falls below --edge-fraction',
    '                     (default 0.001) of its wall value — both common practice',
    '  --stream x,y,z     use the velocity component along this direction (default: magnitude of the part parallel to the wall)',
    '  Samples outside the mesh are flagged (valid = 0) and left out of every statistic.',
    DERIVED_HELP,
  ].join('\n'),
  options: {
    from: 'string', to: 'string', samples: 'string', crossings: 'boolean', fields: 'string', csv: 'boolean', json: 'boolean',
    tolerance: 'string', 'wall-normal': 'boolean', velocity: 'string', edge: 'string', 'edge-fraction': 'string', stream: 'string',
    ...DERIVED_OPTIONS,
  },
  async run(argv, io) {
    const args = parseArgs(argv, this.options, 'line');
    const file = args.positional[0];
    if (!file || args.positional.length > 1) throw new Error('expected one result file: fieldtally line <file> --from x,y,z --to x,y,z');
    const f = str(args, 'from'), t = str(args, 'to');
    if (!f || !t) throw new Error('--from and --to are required (three numbers each, e.g. --from 0,0,0 --to 0,0.01,0)');
    if (args.options.csv && args.options.json) throw new Error('choose one of --csv and --json');
    const samplesText = str(args, 'samples');
    if (samplesText !== undefined && args.options.crossings) throw new Error('choose one of --samples and --crossings');
    const samples = samplesText === undefined ? LINE_PROBE_DEFAULTS.samples : parseNumber(samplesText, 'samples');
    const tol = str(args, 'tolerance');
    const wall = args.options['wall-normal'] === true;
    const velocity = str(args, 'velocity') ?? 'velocity';
    const fieldsText = str(args, 'fields');
    let fields = fieldsText?.split(',').map((s) => s.trim()).filter((s) => s !== '');
    if (wall && fields && !fields.includes(velocity)) fields = [...fields, velocity];
    const edge = str(args, 'edge') ?? 'max';
    if (edge !== 'max' && edge !== 'gradient') throw new Error(`--edge: expected max or gradient, got "${edge}"`);
    const frac = str(args, 'edge-fraction');
    const stream = str(args, 'stream');

    const dataset = withDerivedArgs(await loadDatasetFile(file), fields ?? [], args, { velocity: str(args, 'velocity') });
    const r = probeLine(dataset, parseVec3(f, 'from'), parseVec3(t, 'to'), {
      mode: args.options.crossings ? 'crossings' : 'samples', samples,
      ...(fields ? { fields } : {}), ...(tol !== undefined ? { tolerance: parseNumber(tol, 'tolerance') } : {}),
    });
    const st = lineStats(r);
    const bl = wall ? boundaryLayer(r, {
      field: velocity, edge, ...(frac !== undefined ? { gradientFraction: parseNumber(frac, 'edge-fraction') } : {}),
      ...(stream ? { direction: parseVec3(stream, 'stream') } : {}),
    }) : undefined;

    if (args.options.csv) {
      io.out(lineCsv(r));
      io.err(`${r.outside ? 'the line lies wholly outside the mesh; no samples. ' : ''}Caution: ${CAUTION}`);
      return 0;
    }
    if (args.options.json) {
      const samplesJson: Record<string, (number | null)[]> = {
        s: Array.from(r.s), x: Array.from(r.x), y: Array.from(r.y), z: Array.from(r.z), valid: Array.from(r.valid), cell: Array.from(r.cell),
      };
      for (const fl of r.fields) fl.columns.forEach((c, k) => { samplesJson[fl.labels[k]!] = Array.from(c, jnum); });
      io.out(JSON.stringify({
        file, from: r.from, to: r.to, length: r.length, mode: r.mode, count: r.count, validCount: r.validCount, outside: r.outside,
        ...(r.outside ? { message: 'the line lies wholly outside the mesh; no samples' } : {}),
        units: UNITS, samples: samplesJson, stats: statsJson(st), ...(bl ? { boundaryLayer: blJson(bl) } : {}),
        caution: CAUTION,
      }, null, 2));
      return 0;
    }
    const out = [
      `${file}: line (${r.from.join(', ')}) → (${r.to.join(', ')}), length ${fmt(r.length)}`,
      r.outside ? 'the line lies wholly outside the mesh: no samples, no statistics'
        : `${r.count} samples (${r.mode === 'crossings' ? 'at cell-face crossings' : 'evenly spaced'}), ${r.validCount} inside the mesh; covered length ${fmt(st.coveredLength)}`,
      ...st.gaps.map((g) => `  outside the mesh: s = ${fmt(g.from)} … ${fmt(g.to)}`),
    ];
    if (!r.outside) {
      out.push('', `${'series'.padEnd(20)} ${'min'.padStart(12)} ${'max'.padStart(12)} ${'mean'.padStart(12)} ${'∫ ds'.padStart(12)}`);
      for (const q of st.series) out.push(`${q.label.padEnd(20)} ${fmt(q.stats.min).padStart(12)} ${fmt(q.stats.max).padStart(12)} ${fmt(q.stats.mean).padStart(12)} ${fmt(q.stats.integral).padStart(12)}`);
    }
    if (bl) {
      out.push('', `boundary layer (start point taken as the wall; ${bl.criterion}):`);
      if (!bl.ok) out.push(`  not available: ${bl.reason}`);
      else {
        out.push(`  edge velocity U_e ${fmt(bl.edgeVelocity)} at distance ${fmt(bl.edgeDistance)}`,
          `  δ99 ${fmt(bl.delta99)}   δ* ${fmt(bl.displacementThickness)}   θ ${fmt(bl.momentumThickness)}   H ${fmt(bl.shapeFactor)}`);
        for (const w of bl.warnings) out.push(`  warning: ${w}`);
      }
    }
    out.push('', `Units: ${UNITS}.`, `Caution: ${CAUTION}`);
    io.out(out.join('\n'));
    return 0;
  },
};
export default line;
