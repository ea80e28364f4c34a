/**
 * `fieldtally iso-surface <file> --field f --values v1,v2 [--colour-by g] [--json] [--out surface.vtp]`: the
 * surface where a field (a file's array, a derived field, a vector's magnitude or component) takes each value,
 * with its area, its pieces, the enclosed volume when closed (else why not), and statistics of a colour field
 * on it (src/iso/). `--out` writes the surfaces as VTK XML PolyData.
 */
import { basename, dirname, extname, join } from 'node:path';
import { isoSurfaces, type IsoSurface } from '../../iso/isoSurface.ts';
import { isoSummary, volumeSentence } from '../../iso/isoSummary.ts';
import { loadDatasetFile } from '../../io/nodeFiles.ts';
import { writeVtp } from '../../io/writeVtp.ts';
import { CAUTION } from '../../study/caution.ts';
import { parseArgs, parseNumber, str } from '../args.ts';
import { DERIVED_HELP, DERIVED_OPTIONS, withDerivedArgs } from '../derivedArgs.ts';
import { checkCreatable, replaceFile } from '../safeWrite.ts';
import type { Verb } from '../verb.ts';
import { fmt } from './surfaces.ts';

/** The names to hand to the derived-field step for a spec: itself and its base without a component suffix. */
export function derivedCandidates(spec: string): string[] {
  const bare = spec.replace(/^(point|cell):/, '');
  const m = /^(.*)_(x|y|z|\d+)$/.exec(bare);
  return m ? [bare, m[1]!] : [bare];
}

/** File name of surface `i` of `n` for `--out`: the path itself for one surface, `name-2.vtp` etc. for more. */
export function surfacePath(out: string, i: number, n: number): string {
  if (n === 1) return out;
  const ext = extname(out) || '.vtp';
  return join(dirname(out), `${basename(out, extname(out))}-${i + 1}${ext}`);
}

const isoVerb: Verb = {
  summary: 'iso-surfaces of a field: area, enclosed volume when closed, pieces, colour-field statistics; optional .vtp',
  usage: [
    'fieldtally iso-surface <file> --field f --values v1,v2 [--colour-by g] [--velocity name] [--pressure name] [--json] [--out surface.vtp]',
    '  --field       the field: a file array, a derived field, a vector (its magnitude) or NAME_x / NAME_y / NAME_z',
    '                (NAME_0, NAME_1 … for other arrays); point:/cell: picks the association. Cell data is averaged',
    '                to the points (unweighted mean of the cells around each point, common practice).',
    '  --values      one or more iso values in the field\'s unit, comma-separated',
    '  --colour-by   a field carried onto the surface (same naming); its min, max and area-weighted mean are reported',
    '  --out         write the surfaces as VTK XML PolyData (.vtp); several values: name-1.vtp, name-2.vtp, …',
    '  Each cell is split into tetrahedra (a vertex mean added for non-tetrahedra) and cut where the linear',
    '  interpolant equals the value; 2D cells give iso-lines (their length is reported). Area in the length unit²;',
    '  a surface closed on itself (every edge shared by two consistently oriented triangles) reports the volume it',
    '  encloses (divergence theorem), otherwise "open" with the number of boundary edges.',
    DERIVED_HELP,
  ].join('\n'),
  options: { field: 'string', values: 'string', 'colour-by': 'string', velocity: 'string', pressure: 'string', out: 'string', json: 'boolean', ...DERIVED_OPTIONS },
  async run(argv, io) {
    const args = parseArgs(argv, this.options, 'iso-surface');
    const file = args.positional[0];
    if (!file || args.positional.length > 1) throw new Error('expected one result file: fieldtally iso-surface <file> --field f --values v1,v2');
    const field = str(args, 'field');
    if (!field) throw new Error('--field is required: the field to draw the iso-surface of (see `fieldtally info <file>`)');
    const valuesText = str(args, 'values');
    if (!valuesText) throw new Error(`--values is required: one or more iso values of "${field}", comma-separated`);
    const values = valuesText.split(',').map((s) => s.trim()).filter((s) => s !== '').map((s) => parseNumber(s, 'values'));
    if (values.length === 0) throw new Error(`--values: expected one or more numbers, got "${valuesText}"`);
    const colourBy = str(args, 'colour-by');
    const out = str(args, 'out');
    if (out !== undefined) {
      if (extname(out).toLowerCase() !== '.vtp') throw new Error(`--out ${out}: expected a .vtp file name (VTK XML PolyData)`);
      for (let i = 0; i < values.length; i++) checkCreatable(surfacePath(out, i, values.length), '--out');
    }
    const loaded = await loadDatasetFile(file);
    const dataset = withDerivedArgs(loaded, [...derivedCandidates(field), ...(colourBy ? derivedCandidates(colourBy) : [])], args, {
      velocity: str(args, 'velocity'), pressure: str(args, 'pressure'),
    });
    const surfaces = isoSurfaces(dataset, { field, values, ...(colourBy ? { colourBy } : {}) });
    const written: string[] = [];
    if (out !== undefined) surfaces.forEach((s, i) => {
      const path = surfacePath(out, i, surfaces.length);
      replaceFile(path, writeVtp(s), '--out');
      written.push(path);
    });
    if (args.options.json) {
      io.out(JSON.stringify({
        file, surfaces: surfaces.map(isoSummary), ...(written.length ? { written } : {}),
        units: 'area in the file\'s length unit squared (m² for SI files), volume in its cube, line length in the length unit; iso value and colour statistics in their field\'s unit',
        caution: CAUTION,
      }, null, 2));
      return 0;
    }
    const lines = [`${file}: iso-surfaces of ${surfaces[0]!.field.label}`];
    surfaces.forEach((s, i) => lines.push('', ...surfaceLines(s), ...(written[i] ? [`  written to ${written[i]}`] : [])));
    lines.push('', 'Area in the file\'s length unit squared (m² for SI files), volume in its cube.', `Caution: ${CAUTION}`);
    io.out(lines.join('\n'));
    return 0;
  },
};

function surfaceLines(s: IsoSurface): string[] {
  const sum = isoSummary(s);
  const lines = [`${sum.field} = ${fmt(s.value)}: ${sum.triangles} triangles, area ${fmt(s.area)}`];
  if (s.empty) { lines.push(`  ${s.openReason}`); return lines; }
  lines.push(`  ${s.closed ? `volume ${fmt(s.volume!)}   (${volumeSentence(sum)})` : `volume: — (${s.openReason})`}`);
  if (s.lineLength > 0) lines.push(`  iso-lines on 2D cells: ${s.segments.length / 2} segments, length ${fmt(s.lineLength)}`);
  if (s.pieces.length > 0) {
    lines.push(`  pieces: ${s.pieces.length}`);
    s.pieces.forEach((p, i) => lines.push(`    ${String(i + 1).padStart(3)}: area ${fmt(p.area)}   ${p.closed ? `volume ${fmt(p.volume!)} (values ${p.enclosed} inside)` : `open (${p.boundaryEdges} boundary edges)`}`));
  }
  if (s.colour) lines.push(`  ${s.colour.label} on the surface: min ${fmt(s.colour.min)}   max ${fmt(s.colour.max)}   area-weighted mean ${fmt(s.colour.mean)}`);
  return lines;
}

export default isoVerb;
