/**
 * Reads sensor positions from CSV text, for point probes.
 *
 * Format: comma-separated, one point per line; blank lines and lines starting with `#` are skipped.
 * Columns `x,y,z` or `label,x,y,z`. A header line is optional: the first line is a header when any of its
 * fields is not a number; it must then name `x`, `y`, `z` (any order, any case) and at most one label
 * column (`label`, `name`, `id` or `sensor`). Without a header, 3 fields are x,y,z and 4 fields are
 * label,x,y,z. Fields may be wrapped in double quotes. Every error names the source and the line number.
 * Coordinates are taken to be in the mesh file's length unit.
 */

export interface SensorPoints {
  /** Labels per point, or null when the file has no label column. */
  labels: string[] | null;
  /** xyz interleaved. */
  points: Float64Array;
}

const LABEL_NAMES = ['label', 'name', 'id', 'sensor'];

function fieldsOf(line: string): string[] {
  return line.split(',').map((f) => {
    const t = f.trim();
    return t.length >= 2 && t.startsWith('"') && t.endsWith('"') ? t.slice(1, -1).trim() : t;
  });
}

const isNumber = (t: string): boolean => t !== '' && Number.isFinite(Number(t));

/** Parses sensor positions; `source` names the file in errors. */
export function parseSensorCsv(text: string, source: string): SensorPoints {
  const lines = text.split(/\r?\n/);
  let xi = -1, yi = -1, zi = -1, li = -1, width = -1, headerSeen = false;
  const labels: string[] = [], coords: number[] = [];
  for (let ln = 0; ln < lines.length; ln++) {
    const raw = lines[ln]!.trim();
    if (raw === '' || raw.startsWith('#')) continue;
    const f = fieldsOf(raw);
    const where = `${source} line ${ln + 1}`;
    if (width < 0) {
      // First data-bearing line: header or first point.
      if (!f.every(isNumber) && !(f.length === 4 && f.slice(1).every(isNumber))) {
        const names = f.map((t) => t.toLowerCase());
        xi = names.indexOf('x'); yi = names.indexOf('y'); zi = names.indexOf('z');
        li = names.findIndex((t) => LABEL_NAMES.includes(t));
        const unknown = names.filter((_, i) => i !== xi && i !== yi && i !== zi && i !== li);
        if (xi < 0 || yi < 0 || zi < 0 || unknown.length > 0) {
          throw new Error(`${where}: header must name columns x,y,z or label,x,y,z, found "${raw}"`);
        }
        width = f.length; headerSeen = true;
        continue;
      }
      if (f.length === 3) { xi = 0; yi = 1; zi = 2; li = -1; } else if (f.length === 4) { li = 0; xi = 1; yi = 2; zi = 3; } else {
        throw new Error(`${where}: expected 3 fields (x,y,z) or 4 (label,x,y,z), found ${f.length}`);
      }
      width = f.length;
    }
    if (f.length !== width) {
      throw new Error(`${where}: expected ${width} fields${headerSeen ? ' as in the header' : ' as in the first line'}, found ${f.length}`);
    }
    for (const [i, axis] of [[xi, 'x'], [yi, 'y'], [zi, 'z']] as const) {
      if (!isNumber(f[i]!)) throw new Error(`${where}: ${axis} is "${f[i]}", expected a number`);
      coords.push(Number(f[i]));
    }
    if (li >= 0) labels.push(f[li]!);
  }
  if (coords.length === 0) throw new Error(`${source}: no sensor positions found (expected lines x,y,z or label,x,y,z)`);
  return { labels: li >= 0 ? labels : null, points: Float64Array.from(coords) };
}
