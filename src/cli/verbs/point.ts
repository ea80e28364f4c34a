/**
 * `fieldtally point <file> --at x,y,z | --points sensors.csv [--fields a,b] [--json | --csv]`: field values at
 * one point or at a list of sensor positions.
 */
import { basename } from 'node:path';
import { loadDatasetFile, readBytes } from '../../io/nodeFiles.ts';
import { DERIVED_HELP, DERIVED_OPTIONS, withDerivedArgs } from '../derivedArgs.ts';
import { probePoints, type PointProbeResult } from '../../locate/pointProbe.ts';
import { parseSensorCsv } from '../../locate/sensorCsv.ts';
import { CAUTION, CAUTION_CSV_LINE } from '../../study/caution.ts';
import { parseArgs, parseNumber, parseVec3, str } from '../args.ts';
import type { Verb } from '../verb.ts';

const UNITS = "values in the file's units; positions in the file's length unit";
const jnum = (v: number): number | null => (Number.isFinite(v) ? v : null);
const fmt = (v: number): string => (!Number.isFinite(v) ? '—' : v === 0 || (Math.abs(v) >= 1e-3 && Math.abs(v) < 1e6) ? String(Number(v.toPrecision(6))) : v.toExponential(5));

/**
 * CSV: `#` comment lines (the file, units, the caution), then the header `[label,]x,y,z,valid,` and one column
 * per scalar / component; empty cells outside the mesh.
 */
export function pointCsv(r: PointProbeResult, file: string): string {
  const labels = r.fields.flatMap((f) => f.labels), cols = r.fields.flatMap((f) => f.columns);
  const rows = [
    `# fieldtally point probe; file: ${file.replace(/[\r\n]+/g, ' ')}; ${r.count} point(s), ${r.validCount} inside the mesh`,
    `# Units: ${UNITS}; points outside the mesh have valid = 0 and empty values`,
    CAUTION_CSV_LINE,
    [...(r.labels ? ['label'] : []), 'x', 'y', 'z', 'valid', ...labels].join(','),
  ];
  for (let i = 0; i < r.count; i++) {
    const cells = [...(r.labels ? [csvText(r.labels[i]!)] : []), String(r.x[i]), String(r.y[i]), String(r.z[i]), String(r.valid[i])];
    for (const c of cols) cells.push(r.valid[i] ? String(c[i]) : '');
    rows.push(cells.join(','));
  }
  return rows.join('\n');
}

const csvText = (t: string): string => (/[",\n]/.test(t) ? `"${t.replace(/"/g, '""')}"` : t);

const point: Verb = {
  summary: 'point probe: field values at a point or at sensor positions from a CSV file',
  usage: [
    'fieldtally point <file> --at x,y,z | --points sensors.csv [--fields a,b] [--json | --csv] [--tolerance t]',
    '  --at x,y,z         one point',
    '  --points file.csv  sensor positions: lines x,y,z or label,x,y,z, header optional',
    '  --fields a,b       fields to sample (default: all; prefix point: or cell: to pick the association)',
    '  --json | --csv     machine-readable output (CSV: [label,]x,y,z,valid, then one column per scalar, name_x,name_y,name_z per vector)',
    '  --tolerance t      locate tolerance, parametric, relative to the cell size (default 1e-6, at most 1e-4)',
    '  Points outside the mesh are flagged (valid = 0) and get no values.',
    '  --velocity name    velocity field the derived fields use (default: by the naming rule)',
    DERIVED_HELP,
  ].join('\n'),
  options: { at: 'string', points: 'string', fields: 'string', json: 'boolean', csv: 'boolean', tolerance: 'string', velocity: 'string', ...DERIVED_OPTIONS },
  async run(argv, io) {
    const args = parseArgs(argv, this.options, 'point');
    const file = args.positional[0];
    if (!file || args.positional.length > 1) throw new Error('expected one result file: fieldtally point <file> --at x,y,z | --points file.csv');
    const at = str(args, 'at'), list = str(args, 'points');
    if ((at === undefined) === (list === undefined)) throw new Error('give exactly one of --at x,y,z and --points file.csv');
    if (args.options.csv && args.options.json) throw new Error('choose one of --csv and --json');
    let points: ArrayLike<number>, labels: string[] | null = null;
    if (at !== undefined) points = parseVec3(at, 'at');
    else {
      // the same guard as every input: a regular file (never a pipe or device), of a bounded size
      const text = new TextDecoder().decode(await readBytes(list!, 256 << 20));
      const parsed = parseSensorCsv(text, basename(list!));
      points = parsed.points; labels = parsed.labels;
    }
    const fields = str(args, 'fields')?.split(',').map((s) => s.trim()).filter((s) => s !== '');
    const tol = str(args, 'tolerance');
    const dataset = withDerivedArgs(await loadDatasetFile(file), fields ?? [], args, { velocity: str(args, 'velocity') });
    const r = probePoints(dataset, points, {
      labels, ...(fields ? { fields } : {}), ...(tol !== undefined ? { tolerance: parseNumber(tol, 'tolerance') } : {}),
    });
    if (args.options.csv) {
      io.out(pointCsv(r, file));
      return 0;
    }
    if (args.options.json) {
      const pts = [];
      for (let i = 0; i < r.count; i++) {
        const values: Record<string, number | null> = {};
        for (const f of r.fields) f.columns.forEach((c, k) => { values[f.labels[k]!] = jnum(c[i]!); });
        pts.push({ ...(r.labels ? { label: r.labels[i] } : {}), x: r.x[i], y: r.y[i], z: r.z[i], valid: r.valid[i] === 1, cell: r.cell[i], values });
      }
      io.out(JSON.stringify({ file, count: r.count, validCount: r.validCount, units: UNITS, points: pts, caution: CAUTION }, null, 2));
      return 0;
    }
    const out = [`${file}: ${r.count} point(s), ${r.validCount} inside the mesh`];
    for (let i = 0; i < r.count; i++) {
      const name = r.labels ? `${r.labels[i]} ` : '';
      const where = `${name}(${fmt(r.x[i]!)}, ${fmt(r.y[i]!)}, ${fmt(r.z[i]!)})`;
      if (!r.valid[i]) { out.push(`${where}: outside the mesh, no values`); continue; }
      out.push(`${where}: cell ${r.cell[i]}`);
      for (const f of r.fields) {
        const v = f.columns.map((c) => fmt(c[i]!));
        out.push(`  ${f.name.padEnd(18)} ${f.components === 1 ? v[0] : `(${v.join(', ')})`}${f.association === 'cell' ? '   (cell value)' : ''}`);
      }
    }
    out.push('', `Units: ${UNITS}.`, `Caution: ${CAUTION}`);
    io.out(out.join('\n'));
    return 0;
  },
};
export default point;
