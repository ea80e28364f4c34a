/**
 * `fieldtally line <file> --from x,y,z --to x,y,z [--samples N | --crossings] [--fields a,b] [--csv | --json]
 * [--wall-normal [--velocity name] [--edge max|gradient] [--edge-fraction f] [--stream x,y,z]]`:
 * a line probe with statistics along the line and, for a wall-normal line, boundary-layer quantities.
 */
import type { Dataset } from '../../model/dataset.ts';
import { DERIVED_HELP, DERIVED_OPTIONS, withDerivedArgs } from '../derivedArgs.ts';
import { primeDerivedGradients } from '../../parallel/deriveShares.ts';
import { boundaryLayer, type BoundaryLayerResult } from '../../locate/boundaryLayer.ts';
import { LINE_PROBE_DEFAULTS, probeLine, type LineProbeResult } from '../../locate/lineProbe.ts';
import { lineStats, type LineStats } from '../../locate/lineStats.ts';
import { CAUTION, CAUTION_CSV_LINE } from '../../study/caution.ts';
import { parseArgs, parseNumber, parseVec3, str } from '../args.ts';
import { checkMemory } from '../memoryLimit.ts';
import { writeParts, type Verb } from '../verb.ts';
import { loadForCompute, WORKER_HELP, WORKER_OPTIONS } from '../workerOption.ts';

/** Most samples of one line probe (the compute layer's cap). */
const MAX_LINE_SAMPLES = 10_000_000;

/**
 * Bytes one sample takes at the peak of a line probe and its output: position, parameter, flags and cell
 * (45 bytes), 8 per component of every field, and about 20 characters per number of one streamed part
 * (counted once per sample as a margin, common practice).
 */
function lineBytesPerSample(d: Dataset): number {
  const p = d.pieces[0];
  const comps = p ? [...p.pointData, ...p.cellData].reduce((s, f) => s + f.components, 0) : 0;
  return 45 + 8 + 8 * comps + 20;
}

const UNITS = "values in the file's units; s, x, y, z in the file's length unit; integrals in field unit × length unit";

/** A number for JSON: NaN (no value) becomes null, never 0. */
const jnum = (v: number): number | null => (Number.isFinite(v) ? v : null);
const fmt = (v: number): string => (!Number.isFinite(v) ? '—' : v === 0 || (Math.abs(v) >= 1e-3 && Math.abs(v) < 1e6) ? String(Number(v.toPrecision(6))) : v.toExponential(5));

/**
 * The CSV table: `#` comment lines (the file, the line's ends, units, the caution), then the header
 * `s,x,y,z,valid,` and one column per scalar / component; empty cells where invalid.
 */
export function lineCsv(r: LineProbeResult, file: string): string {
  return [...lineCsvParts(r, file)].join('').slice(0, -1);
}

/** A file name fit for one comment line (line breaks in a name would end the comment). */
const oneLine = (t: string): string => t.replace(/[\r\n]+/g, ' ');

/** Rows written per part of a streamed output. */
const ROWS_PER_PART = 10_000;

/** The CSV of `lineCsv` in parts of `ROWS_PER_PART` rows, each ending in a newline. */
export function* lineCsvParts(r: LineProbeResult, file: string): Generator<string> {
  const labels = r.fields.flatMap((f) => f.labels);
  const cols = r.fields.flatMap((f) => f.columns);
  yield [
    `# fieldtally line probe; file: ${oneLine(file)}; from (${r.from.join(', ')}) to (${r.to.join(', ')}); ${r.count} samples, ${r.validCount} inside the mesh`,
    `# Units: ${UNITS}; samples outside the mesh have valid = 0 and empty values`,
    CAUTION_CSV_LINE,
    ['s', 'x', 'y', 'z', 'valid', ...labels].join(','),
  ].join('\n') + '\n';
  for (let from = 0; from < r.count; from += ROWS_PER_PART) {
    const rows: string[] = [];
    for (let i = from; i < Math.min(r.count, from + ROWS_PER_PART); i++) {
      const cells = [String(r.s[i]), String(r.x[i]), String(r.y[i]), String(r.z[i]), String(r.valid[i])];
      for (const c of cols) cells.push(r.valid[i] ? String(c[i]) : '');
      rows.push(cells.join(','));
    }
    yield rows.join('\n') + '\n';
  }
}

/** Marks where the samples go in the JSON text built around them. */
const SAMPLES_MARK = '@@fieldtally line samples@@';

/** The JSON of `doc` with its `samples` member (columns of numbers) written in parts, never as one string. */
function* jsonWithSamples(doc: Record<string, unknown>, columns: [string, ArrayLike<number>][]): Generator<string> {
  const text = JSON.stringify({ ...doc, samples: SAMPLES_MARK }, null, 2);
  const at = text.indexOf(JSON.stringify(SAMPLES_MARK));
  yield text.slice(0, at) + '{\n';
  for (const [k, [name, col]] of columns.entries()) {
    yield `    ${JSON.stringify(name)}: [`;
    for (let from = 0; from < col.length; from += ROWS_PER_PART) {
      const part: string[] = [];
      for (let i = from; i < Math.min(col.length, from + ROWS_PER_PART); i++) part.push(String(jnum(col[i]!)));
      yield (from > 0 ? ',' : '') + part.join(',');
    }
    yield `]${k < columns.length - 1 ? ',' : ''}\n`;
  }
  yield '  }' + text.slice(at + JSON.stringify(SAMPLES_MARK).length) + '\n';
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
    WORKER_HELP,
    '  Samples outside the mesh are flagged (valid = 0) and left out of every statistic.',
    DERIVED_HELP,
  ].join('\n'),
  options: {
    from: 'string', to: 'string', samples: 'string', crossings: 'boolean', fields: 'string', csv: 'boolean', json: 'boolean',
    tolerance: 'string', 'wall-normal': 'boolean', velocity: 'string', edge: 'string', 'edge-fraction': 'string', stream: 'string',
    ...WORKER_OPTIONS,
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
    if (!(Number.isInteger(samples) && samples >= 2 && samples <= MAX_LINE_SAMPLES)) throw new Error(`--samples: expected a whole number from 2 to ${MAX_LINE_SAMPLES}, got "${samplesText}"`);
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

    const lineOptions = {
      mode: args.options.crossings ? 'crossings' as const : 'samples' as const, samples,
      ...(fields ? { fields } : {}), ...(tol !== undefined ? { tolerance: parseNumber(tol, 'tolerance') } : {}),
    };
    const from = parseVec3(f, 'from'), to = parseVec3(t, 'to');
    const input = await loadForCompute(file, args);
    let r;
    try {
      // with workers, the velocity gradient of the derived fields is computed by them (deriveShares.ts)
      if (input.pool) await primeDerivedGradients(input.pool, fields ?? [], { velocity: str(args, 'velocity') });
      const dataset = withDerivedArgs(input.dataset, fields ?? [], args, { velocity: str(args, 'velocity') });
      if (!args.options.crossings) checkMemory(samples * lineBytesPerSample(dataset), `--samples ${samples}: the probe's values and their output`);
      // Derived fields live on this thread's dataset only: the workers' shared copy lacks them.
      r = input.pool && dataset === input.dataset ? await input.pool.probeLine(from, to, lineOptions) : probeLine(dataset, from, to, lineOptions);
    } finally {
      await input.close();
    }
    const st = lineStats(r);
    const bl = wall ? boundaryLayer(r, {
      field: velocity, edge, ...(frac !== undefined ? { gradientFraction: parseNumber(frac, 'edge-fraction') } : {}),
      ...(stream ? { direction: parseVec3(stream, 'stream') } : {}),
    }) : undefined;

    if (args.options.csv) {
      await writeParts(io, lineCsvParts(r, file));
      if (r.outside) io.err('the line lies wholly outside the mesh; no samples');
      return 0;
    }
    if (args.options.json) {
      const columns: [string, ArrayLike<number>][] = [['s', r.s], ['x', r.x], ['y', r.y], ['z', r.z], ['valid', r.valid], ['cell', r.cell]];
      for (const fl of r.fields) fl.columns.forEach((c, k) => { columns.push([fl.labels[k]!, c]); });
      await writeParts(io, jsonWithSamples({
        file, from: r.from, to: r.to, length: r.length, mode: r.mode, count: r.count, validCount: r.validCount, outside: r.outside,
        ...(r.outside ? { message: 'the line lies wholly outside the mesh; no samples' } : {}),
        units: UNITS, samples: null, stats: statsJson(st), ...(bl ? { boundaryLayer: blJson(bl) } : {}),
        caution: CAUTION,
      }, columns));
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
