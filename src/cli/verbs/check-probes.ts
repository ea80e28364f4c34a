/**
 * `fieldtally check-probes <set.json> [--upgrade out.json] [--json]`: checks a probe-set file and lists its
 * probes; every problem is listed with where it is, what was expected and what was found. An older
 * version is upgraded on reading; --upgrade writes it in the current version.
 */
import { existsSync, writeFileSync } from 'node:fs';
import { basename } from 'node:path';
import { DocumentError } from '../../study/checkValues.ts';
import { probeLabel, PROBE_SET_VERSION } from '../../study/probeSet.ts';
import { writeProbeSet } from '../../study/probeSetFile.ts';
import { FLUID_PRESETS, UNIT_CATALOGUE } from '../../study/units.ts';
import { parseArgs, str } from '../args.ts';
import { readProbeSetFile } from '../studyInputs.ts';
import type { Verb } from '../verb.ts';

const checkProbes: Verb = {
  summary: 'check a probe-set file, list its probes, upgrade an older version',
  usage: [
    'fieldtally check-probes <set.json> [--upgrade out.json] [--json]',
    `  A probe set (format "fieldtally-probe-set", version ${PROBE_SET_VERSION}; schema: src/study/probeSet.schema.json) holds the probes`,
    '  (cut-plane, line, point, force, pressure-loss, mass-balance), the reference values (SI) and the file\'s units.',
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
    if (out !== undefined) {
      if (existsSync(out) && basename(out) === basename(path)) throw new Error(`--upgrade ${out}: would overwrite the input; choose another name`);
      writeFileSync(out, writeProbeSet(ps.set));
    }
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
