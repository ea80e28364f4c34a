/**
 * A line probe's samples as CSV: every column headed with its unit (`s [m]`, `velocity_x [m/s]`; a field
 * whose unit its name does not tell gets none), numbers in shortest round-trip form (the shortest text that
 * reads back as the same double: 0.05, not 0.050000000000000003), the caution in a comment line. Pure: no DOM.
 */
import type { LineReply } from '../../workers/api.ts';
import { CAUTION } from './caution.ts';
import { fieldUnit } from './units.ts';

/** `name [unit]`, or the name alone without a unit. */
export function headed(name: string, unit: string): string {
  return unit ? `${name} [${unit}]` : name;
}

const csvCell = (s: string): string => (/[",\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s);

/** Shortest round-trip text of a point, `(x, y, z)`. */
const point = (v: readonly number[]) => `(${v.map(String).join(', ')})`;

/** The CSV text (see the file comment); `label` names the probe in the first comment line. */
export function lineSamplesCsv(label: string, from: readonly number[], to: readonly number[], r: LineReply): string {
  const head = [headed('s', 'm'), headed('x', 'm'), headed('y', 'm'), headed('z', 'm'), 'valid',
    ...r.fields.flatMap((f) => f.labels.map((l) => headed(l, fieldUnit(f.name))))];
  const rows = [
    `# fieldtally line probe "${label}": ${point(from)} → ${point(to)} m; values in the file's units (SI assumed); samples outside the mesh have valid = 0 and empty values`,
    `# Caution: ${CAUTION}`,
    head.map(csvCell).join(','),
  ];
  for (let i = 0; i < r.count; i++) {
    const cells = [String(r.s[i]), String(r.x[i]), String(r.y[i]), String(r.z[i]), String(r.valid[i])];
    for (const f of r.fields) for (const c of f.columns) cells.push(Number.isFinite(c[i]!) ? String(c[i]) : '');
    rows.push(cells.join(','));
  }
  return rows.join('\n') + '\n';
}
