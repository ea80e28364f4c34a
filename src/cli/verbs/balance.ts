/**
 * `fieldtally balance <file> --planes "x,y,z@nx,ny,nz; …" [--surfaces id|name,…]`: mass balance over cut-planes
 * and boundary-surface groups; plane normals must point out of the control volume (boundary surfaces are
 * oriented out of the fluid domain automatically).
 */
import { massBalance, type BalanceItem } from '../../cut/composite.ts';
import { boundaryTriangleSet } from '../../cut/faceSet.ts';
import { integrateSurface } from '../../cut/integrals.ts';
import { integratePlane } from '../../cut/planeIntegrals.ts';
import { loadDatasetFile } from '../../io/nodeFiles.ts';
import { boundaryFaces } from '../../surface/boundaryFaces.ts';
import { facesOfGroups, resolveGroups, surfaceGroups } from '../../surface/surfaceGroups.ts';
import { parseArgs, str } from '../args.ts';
import { CAUTION, FIELD_HELP, FIELD_OPTIONS, FIELD_RULE, UNITS_NOTE, fmt, integralOptions, num, parsePlane } from '../cutCommon.ts';
import type { Verb } from '../verb.ts';

const balance: Verb = {
  summary: 'mass balance over cut-planes and boundary surfaces (net flux, inflow, imbalance share)',
  usage: [
    'fieldtally balance <file> [--planes "x,y,z@nx,ny,nz; x,y,z@nx,ny,nz; …"] [--surfaces id|name,…] [--seeds "x,y,z; …"]',
    '                   [--velocity name] [--rho value|name] [--json]',
    '  Each plane normal must point OUT of the control volume; boundary-surface groups (ids or names as `fieldtally surfaces`',
    '  lists them) are oriented out of the fluid automatically. Net = Σ outward flux (0 when balanced);',
    '  imbalance share = net / total inflow. Mass flow with a density, else volume flow. --seeds gives one seed per plane',
    '  (or "-" for the whole cut) to keep one passage of each plane.',
    FIELD_HELP, FIELD_RULE, UNITS_NOTE,
  ].join('\n'),
  options: { planes: 'string', surfaces: 'string', seeds: 'string', ...FIELD_OPTIONS },
  async run(argv, io) {
    const args = parseArgs(argv, this.options, 'balance');
    const file = args.positional[0];
    if (!file || args.positional.length > 1) throw new Error('expected one result file: fieldtally balance <file> --planes … [--surfaces …]');
    const planeText = str(args, 'planes'), surfText = str(args, 'surfaces'), seedText = str(args, 'seeds');
    if (!planeText && !surfText) throw new Error('give --planes and/or --surfaces');
    const planes = (planeText ?? '').split(';').map((s) => s.trim()).filter(Boolean).map((s, i) => parsePlane(s, `planes (item ${i + 1})`));
    if (planeText !== undefined && planes.length === 0) throw new Error(`--planes: no plane in "${planeText.slice(0, 40)}"; expected "x,y,z@nx,ny,nz; …"`);
    const seeds = seedText ? seedText.split(';').map((s) => s.trim()) : [];
    if (seeds.length && seeds.length !== planes.length) throw new Error(`--seeds: ${seeds.length} seeds for ${planes.length} planes`);
    const dataset = await loadDatasetFile(file);
    const integral = integralOptions(args, dataset);
    const items: BalanceItem[] = planes.map((p, i) => {
      const seed = seeds[i];
      const region = seed && seed !== '-' ? [{ kind: 'seed' as const, point: parsePlane(`${seed}@0,0,1`, 'seeds').origin }] : [];
      return { label: `plane ${i + 1} (${p.origin.join(',')} @ ${p.normal.join(',')})`, integrals: integratePlane(dataset, { ...p, region, integral }).integrals };
    });
    if (surfText) {
      const faces = boundaryFaces(dataset);
      const groups = surfaceGroups(dataset, faces);
      for (const gi of resolveGroups(groups, surfText.split(',').map((s) => s.trim()))) {
        const set = boundaryTriangleSet(dataset, faces, facesOfGroups(groups, [gi]));
        items.push({ label: `surface ${groups.groups[gi]!.id} "${groups.groups[gi]!.name}"`, integrals: integrateSurface(set, integral) });
      }
    }
    const b = massBalance(items);
    if (args.options.json) {
      io.out(JSON.stringify({
        file, basis: b.basis, net: num(b.net), inflow: num(b.inflow), outflow: num(b.outflow), imbalanceShare: num(b.imbalanceShare),
        items: b.items.map((r) => ({ ...r, flux: num(r.flux), inflow: num(r.inflow), outflow: num(r.outflow) })), notes: b.notes,
        signConvention: 'Outward flux positive: plane normals point out of the control volume, boundary surfaces out of the fluid.',
        units: UNITS_NOTE, caution: CAUTION,
      }, null, 2));
      return 0;
    }
    const unit = b.basis === 'mass' ? 'mass flow' : 'volume flow';
    const w = Math.max(20, ...b.items.map((r) => r.label.length + 2));
    io.out([
      `${file}: ${unit} balance (outward positive)`,
      '',
      `${'surface'.padEnd(w)} ${'net outward'.padEnd(14)} ${'inflow'.padEnd(14)} outflow`,
      ...b.items.map((r) => `${r.label.padEnd(w)} ${fmt(r.flux).padEnd(14)} ${fmt(r.inflow).padEnd(14)} ${fmt(r.outflow)}${r.empty ? '   (EMPTY)' : ''}`),
      '',
      `net (Σ outward)     ${fmt(b.net)}`,
      `total inflow        ${fmt(b.inflow)}`,
      `total outflow       ${fmt(b.outflow)}`,
      `imbalance / inflow  ${b.imbalanceShare === null ? '—' : `${fmt(100 * b.imbalanceShare)} %`}`,
      ...b.notes.map((n) => `note: ${n}`),
      '', UNITS_NOTE, `Caution: ${CAUTION}`,
    ].join('\n'));
    return 0;
  },
};
export default balance;
