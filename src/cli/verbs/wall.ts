/**
 * `fieldtally wall <file> --groups a,b [--rho ρ --mu μ --speed U] [--json]`: wall shear stress, skin-friction
 * coefficient and y⁺ of the first cell on each named surface group, with area-weighted statistics, the area
 * share above y⁺ thresholds and a y⁺ histogram (src/surface/wallQuantities.ts). Groups are named by id or name,
 * or chosen by what they are (`groupArgs.ts`: box, nearest point, area range, exact name).
 */
import { facesOfGroups, resolveGroups } from '../../surface/surfaceGroups.ts';
import { wallQuantities, WALL_DEFAULTS, type WallOptions, type WallResult, type WallStat } from '../../surface/wallQuantities.ts';
import { CAUTION } from '../../study/caution.ts';
import { parseArgs, parseNumber, str } from '../args.ts';
import type { Verb } from '../verb.ts';
import { GROUP_SELECT_HELP, GROUP_SELECT_OPTIONS, groupRefsOf } from '../groupArgs.ts';
import { GROUPING_HELP, GROUPING_OPTIONS, fmt, openSurfaces } from './surfaces.ts';
import { WORKER_OPTIONS } from '../workerOption.ts';
import { primeWallGradients } from '../../parallel/deriveShares.ts';

const SOURCES = ['auto', 'wall-shear', 'gradient'] as const;

/** JSON of one group's result (per-face arrays left out unless asked). */
export function wallJson(r: WallResult, perFace: boolean): Record<string, unknown> {
  return {
    faces: r.faces, area: r.area, shearSource: r.shearSource,
    stats: r.stats, yPlusAbove: r.yPlusAbove, yPlusHistogram: r.yPlusHistogram,
    wallDistanceDefinition: r.wallDistanceDefinition, notes: r.notes,
    ...(perFace ? { perFace: {
      area: Array.from(r.perFace.area), shearMagnitude: Array.from(r.perFace.shearMagnitude), wallDistance: Array.from(r.perFace.wallDistance),
      ...(r.perFace.cf ? { cf: Array.from(r.perFace.cf) } : {}), ...(r.perFace.yPlus ? { yPlus: Array.from(r.perFace.yPlus) } : {}),
    } } : {}),
  };
}

const row = (label: string, s: WallStat | null, unit: string): string =>
  `  ${label.padEnd(16)} ${s ? `mean ${fmt(s.mean)}   min ${fmt(s.min)}   max ${fmt(s.max)}` : '— (see notes)'}${s && unit ? `  ${unit}` : ''}`;

const wall: Verb = {
  summary: 'wall quantities on surface groups: wall shear stress, c_f, y+ statistics and histogram',
  usage: [
    'fieldtally wall <file> --groups a,b [--rho ρ] [--mu μ|field] [--speed U] [--wall-distance cell-centroid|first-node]',
    '                [--thresholds 1,5,30] [--histogram-bins n] [--shear-from auto|wall-shear|gradient]',
    '                [--wall-gradient second-order|first-order] [--velocity name] [--wall-shear name] [--per-face] [--json]',
    '                [--workers N]',
    '  --groups          surface groups by id or name (see `fieldtally surfaces`), or chosen by what they are',
    '                    (options below); each group reported on its own; a choice matching none names the file\'s groups',
    '  --rho, --mu       density (kg/m³) and dynamic viscosity (Pa·s, or a viscosity array): y+ = y·u_τ/ν, u_τ = √(|τ_w|/ρ)',
    '  --speed           reference speed U for c_f = |τ_w|/(½ρU²)',
    '  --wall-distance   y of y+: the wall cell\'s centroid from the face (default, common practice for cell-centred',
    '                    solvers) or the first off-wall node of the wall cell (common practice for node-based solvers)',
    '  --thresholds      y+ values for the area share above each (default 1,5,30); --histogram-bins (default 10)',
    '  --shear-from      τ_w from the file\'s wall-shear array (found by name) or from the velocity gradient (needs --mu);',
    '                    auto: the array when there is one. The output says which was used.',
    '  --wall-gradient   second-order (default: quadratic fit at each wall node) or first-order (wall cell\'s gradient)',
    '  --per-face        JSON: add the per-face values',
    '  --workers N       compute workers: they extract the boundary faces and fit the wall nodes\' velocity gradient,',
    '                    a run of wall nodes each (default: FIELDTALLY_WORKERS, else one per core, for files of 8 MiB',
    '                    or more); 1: none. The numbers are the same to the last digit for any count.',
    GROUP_SELECT_HELP,
    GROUPING_HELP,
  ].join('\n'),
  options: {
    groups: 'string', rho: 'string', mu: 'string', speed: 'string', 'wall-distance': 'string', thresholds: 'string',
    'histogram-bins': 'string', 'shear-from': 'string', 'wall-gradient': 'string', velocity: 'string', 'wall-shear': 'string',
    'per-face': 'boolean', json: 'boolean', ...GROUPING_OPTIONS, ...GROUP_SELECT_OPTIONS, ...WORKER_OPTIONS,
  },
  async run(argv, io) {
    const args = parseArgs(argv, this.options, 'wall');
    const file = args.positional[0];
    if (!file || args.positional.length > 1) throw new Error('expected one result file: fieldtally wall <file> --groups a,b');
    const refs = groupRefsOf(args, 'wall');
    const num = (k: string): number | undefined => { const t = str(args, k); return t === undefined ? undefined : parseNumber(t, k); };
    const muText = str(args, 'mu');
    const viscosity = muText === undefined ? undefined : muText.trim() !== '' && Number.isFinite(Number(muText)) ? Number(muText) : muText;
    const wallDistance = str(args, 'wall-distance') ?? WALL_DEFAULTS.wallDistance;
    if (wallDistance !== 'cell-centroid' && wallDistance !== 'first-node') throw new Error(`--wall-distance: expected cell-centroid or first-node, got "${wallDistance}"`);
    const source = str(args, 'shear-from') ?? 'auto';
    if (!(SOURCES as readonly string[]).includes(source)) throw new Error(`--shear-from: expected one of ${SOURCES.join(', ')}, got "${source}"`);
    const wallGradient = str(args, 'wall-gradient') ?? 'second-order';
    if (wallGradient !== 'second-order' && wallGradient !== 'first-order') throw new Error(`--wall-gradient: expected second-order or first-order, got "${wallGradient}"`);
    const thresholds = str(args, 'thresholds')?.split(',').map((s) => parseNumber(s, 'thresholds'));
    const bins = num('histogram-bins');
    const options: Partial<WallOptions> = {
      density: num('rho'), speed: num('speed'), viscosity, wallDistance, source: source as WallOptions['source'],
      ...(thresholds ? { thresholds } : {}), ...(bins !== undefined ? { bins } : {}),
      loads: { wallGradient, ...(str(args, 'velocity') ? { velocity: str(args, 'velocity') } : {}), ...(str(args, 'wall-shear') ? { wallShear: str(args, 'wall-shear') } : {}) },
    };
    const { dataset, faces, groups, pool, close } = await openSurfaces(file, args);
    const results: { group: (typeof groups.groups)[number]; r: WallResult }[] = [];
    try {
      for (const i of resolveGroups(groups, refs, faces)) {
        const selection = facesOfGroups(groups, [i]);
        // the wall nodes' gradient by the workers (or here), the kernel's values either way (deriveShares.ts)
        await primeWallGradients(pool, dataset, faces, selection, options);
        results.push({ group: groups.groups[i]!, r: wallQuantities(dataset, faces, selection, options, groups.faceSurfaceCell) });
      }
    } finally {
      await close();
    }
    if (args.options.json) {
      io.out(JSON.stringify({
        file, groups: results.map(({ group, r }) => ({ id: group.id, name: group.name, ...wallJson(r, args.options['per-face'] === true) })),
        units: 'τ_w in the pressure unit (Pa), wall distance in the length unit; c_f and y+ dimensionless', caution: CAUTION,
      }, null, 2));
      return 0;
    }
    const lines: string[] = [`${file}: wall quantities`];
    for (const { group, r } of results) {
      const src = r.shearSource.method === 'wall-shear-array' ? `the file's wall-shear array "${r.shearSource.array}"`
        : `the velocity gradient of "${r.shearSource.array}" (${r.shearSource.gradient ?? 'first-order'}), μ = ${r.shearSource.mu}`;
      lines.push('', `group ${group.id} "${group.name}": ${r.faces} faces, area ${fmt(r.area)}; τ_w from ${src}`);
      lines.push(row('|τ_w|', r.stats.shearMagnitude, 'Pa'), row('c_f', r.stats.cf, ''), row('y+', r.stats.yPlus, ''), row('wall distance y', r.stats.wallDistance, 'm'));
      if (r.yPlusAbove.length) lines.push(`  area share      ${r.yPlusAbove.map((t) => `y+ > ${fmt(t.threshold)}: ${fmt(100 * t.areaShare)} %`).join('   ')}`);
      if (r.yPlusHistogram) {
        const h = r.yPlusHistogram;
        lines.push('  y+ histogram (area share):');
        h.areaShare.forEach((s, i) => lines.push(`    ${fmt(h.edges[i]!).padStart(10)} … ${fmt(h.edges[i + 1]!).padEnd(10)} ${'#'.repeat(Math.round(40 * s)).padEnd(40)} ${fmt(100 * s)} %`));
      }
      lines.push(`  ${r.wallDistanceDefinition}`);
      for (const n of r.notes) lines.push(`  note: ${n}`);
    }
    lines.push('', `Caution: ${CAUTION}`);
    io.out(lines.join('\n'));
    return 0;
  },
};
export default wall;
