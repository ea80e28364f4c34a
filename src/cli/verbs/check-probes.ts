/**
 * `fieldtally check-probes <set.json> [--upgrade out.json] [--json]`: checks a probe-set file and lists its
 * probes; every problem is listed with where it is, what was expected and what was found. An older
 * version is upgraded on reading; --upgrade writes it in the current version.
 */
import { readFileSync, statSync } from 'node:fs';
import { basename } from 'node:path';
import { DocumentError } from '../../study/checkValues.ts';
import { probeLabel, PROBE_SET_VERSION } from '../../study/probeSet.ts';
import { writeProbeSet } from '../../study/probeSetFile.ts';
import { FLUID_PRESETS, UNIT_CATALOGUE } from '../../study/units.ts';
import { parseArgs, str } from '../args.ts';
import { cutPath } from '../../io/messageText.ts';
import { checkCreatable, entryKind, refuseSpecialFolder, replaceFile, sameFile } from '../safeWrite.ts';
import { readProbeSetFile } from '../studyInputs.ts';
import type { Verb } from '../verb.ts';

/**
 * Writes the upgraded set to `out`: never over the input (by identity, whatever the names), never through
 * a symbolic link, never over a file that is not a probe set; by way of a temporary file renamed into place.
 */
function writeUpgrade(input: string, out: string, text: string): void {
  const option = '--upgrade';
  if (sameFile(input, out)) throw new Error(`${option} ${cutPath(out)}: is the input probe set itself; choose another name`);
  refuseSpecialFolder(out, option);
  checkCreatable(out, option);
  const kind = entryKind(out);
  if (kind === 'link') throw new Error(`${option} ${cutPath(out)}: is a symbolic link; not written through — choose another name`);
  if (kind !== 'none' && kind !== 'file') throw new Error(`${option} ${cutPath(out)}: exists and is not a file`);
  if (kind === 'file' && statSync(out).size > 64 << 20) throw new Error(`${option} ${cutPath(out)}: exists and is too large to be a probe set; not overwritten — choose another name`);
  if (kind === 'file') {
    let format: unknown;
    try { format = (JSON.parse(readFileSync(out, 'utf8')) as { format?: unknown }).format; } catch { format = undefined; }
    if (format !== 'fieldtally-probe-set') throw new Error(`${option} ${cutPath(out)}: exists and is not a probe set; not overwritten — choose another name`);
  }
  replaceFile(out, new TextEncoder().encode(text), option);
}

const checkProbes: Verb = {
  summary: 'check a probe-set file, list its probes, upgrade an older version',
  usage: [
    'fieldtally check-probes <set.json> [--upgrade out.json] [--json]',
    `  A probe set (format "fieldtally-probe-set", version ${PROBE_SET_VERSION}; schema: src/study/probeSet.schema.json) holds the probes`,
    '  (cut-plane, line, point, force, pressure-loss, mass-balance, wall, iso), the reference values (SI) and the file\'s units.',
    '  Version 1 files are read and upgraded; --upgrade writes the current version to out.json (never over the input).',
    `  Reference presets: ${FLUID_PRESETS.map((p) => `${p.id} (${p.label}: ρ = ${p.density} kg/m³, μ = ${p.viscosity} Pa·s)`).join('; ')}.`,
    `  Units: ${UNIT_CATALOGUE.map((u) => u.symbol).join(' ')}`,
  ].join('\n'),
  options: { upgrade: 'string', json: 'boolean' },
  async run(argv, io) {
    const args = parseArgs(argv, this.options, 'check-probes');
    const path = args.positional[0];
    if (!path || args.positional.length > 1) throw new Error('expected one probe-set file: fieldtally check-probes <set.json>');
    let ps;
    try {
      ps = await readProbeSetFile(path);
    } catch (e) {
      if (!(e instanceof DocumentError)) throw e;
      io.err([`fieldtally check-probes: ${basename(path)} is not a valid probe set (${e.issues.length} problem${e.issues.length > 1 ? 's' : ''}):`, ...e.details.split('\n').map((l) => `  ${l}`)].join('\n'));
      return 1;
    }
    const out = str(args, 'upgrade');
    if (out !== undefined) writeUpgrade(path, out, writeProbeSet(ps.set));
    if (args.options.json) { io.out(writeProbeSet(ps.set)); return 0; }
    io.out([
      `${basename(path)}: probe set version ${ps.fromVersion}${ps.fromVersion < PROBE_SET_VERSION ? ` (upgraded to ${PROBE_SET_VERSION} on reading)` : ''}${ps.set.title ? ` — "${ps.set.title}"` : ''}, ${ps.set.probes.length} probe(s)`,
      ...ps.set.probes.map((p) => `  ${p.id.padEnd(16)} ${p.kind.padEnd(14)} ${probeLabel(p)}`),
      `units: length ${ps.set.units?.length ?? 'm'}${Object.keys(ps.set.units?.fields ?? {}).length ? `; ${Object.entries(ps.set.units!.fields!).map(([k, v]) => `${k} in ${v}`).join(', ')}` : ''} (undeclared fields: SI)`,
      `reference: ${Object.entries(ps.set.reference ?? {}).map(([k, v]) => `${k} ${Array.isArray(v) ? `(${v.join(', ')})` : v}`).join(', ') || 'none'}`,
      ...(out !== undefined ? [`written in version ${PROBE_SET_VERSION}: ${out}`] : []),
    ].join('\n'));
    return 0;
  },
};
export default checkProbes;
