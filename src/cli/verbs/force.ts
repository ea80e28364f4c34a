/**
 * `fieldtally force <file> --groups a,b [reference values] [--json]`: pressure and viscous force, moment and
 * coefficients on the merged surface groups, with the sign convention and units stated in the output.
 */
import { forceDistribution } from '../../surface/distribution.ts';
import { forceTotals, pressureCoefficient, type ForceReference, type Vec3 } from '../../surface/forces.ts';
import { facesOfGroups, resolveGroups } from '../../surface/surfaceGroups.ts';
import { surfaceLoads, type LoadOptions } from '../../surface/surfaceLoads.ts';
import { surfaceQuality } from '../../surface/surfaceQuality.ts';
import { CAUTION } from '../../study/caution.ts';
import { checkReferenceScale, parseArgs, parseNumber, parsePositive, parseVec3, str } from '../args.ts';
import type { Verb } from '../verb.ts';
import { GROUP_SELECT_HELP, GROUP_SELECT_OPTIONS, groupRefsOf } from '../groupArgs.ts';
import { GROUPING_HELP, GROUPING_OPTIONS, fmt, loadSurfaces, vec } from './surfaces.ts';
import { WORKER_HELP, WORKER_OPTIONS } from '../workerOption.ts';

const VISCOUS = ['auto', 'wall-shear', 'gradient', 'none'] as const;

const force: Verb = {
  summary: 'force totals on surface groups: pressure and viscous force, moment, C_D / C_L, centre of pressure',
  usage: [
    'fieldtally force <file> --groups a,b [--rho v] [--speed v] [--area v] [--length v] [--drag-direction x,y,z]',
    '                 [--lift-direction x,y,z] [--moment-point x,y,z] [--mu v|field] [--reference-pressure v] [--pressure name]',
    '                 [--kinematic] [--wall-shear name] [--shear-sign -1] [--velocity name] [--viscous auto|wall-shear|gradient|none]',
    '                 [--cp-axis x,y,z] [--strips n] [--wall-gradient second-order|first-order] [--json]',
    '  --groups        surface groups by id or name (see `fieldtally surfaces`), merged into one force total',
    '  --rho/--speed/--area  reference density, speed and area for coefficients (q = ½ρU²); --length for moment coefficients',
    '  --drag-direction  drag direction (default 1,0,0); --lift-direction lift direction (default 0,0,1, made orthogonal',
    '                  to drag); side = lift × drag',
    '  --mu            dynamic viscosity (Pa·s) or a viscosity array, for the viscous force from the velocity gradient',
    '  --reference-pressure  subtracted from the pressure array (its unit); --kinematic: p (and wall shear)',
    '                  stored divided by density, multiplied by --rho',
    '  --wall-shear    wall-shear-stress array (default: found by name); --shear-sign -1 if it is the force on the fluid',
    '  --strips n      cut the body into n strips of equal width along the drag direction and give the drag per unit',
    '                  length in each (JSON: distribution)',
    '  --wall-gradient velocity gradient at the wall for --viscous gradient with point velocity: second-order (default;',
    '                  quadratic least-squares fit at each wall node) or first-order (the wall cell\'s linear gradient)',
    GROUP_SELECT_HELP,
    GROUPING_HELP,
    WORKER_HELP,
    '  Force on the wall (body): F = ∫(p − p_ref)(−n_body) dA + ∫τ_w dA; moment about --moment-point (default origin).',
  ].join('\n'),
  options: {
    groups: 'string', rho: 'string', speed: 'string', area: 'string', length: 'string', 'drag-direction': 'string', 'lift-direction': 'string',
    'moment-point': 'string', mu: 'string', 'reference-pressure': 'string', pressure: 'string', kinematic: 'boolean', 'wall-shear': 'string',
    'shear-sign': 'string', velocity: 'string', viscous: 'string', 'cp-axis': 'string', strips: 'string', 'wall-gradient': 'string', json: 'boolean', ...GROUPING_OPTIONS, ...GROUP_SELECT_OPTIONS, ...WORKER_OPTIONS,
  },
  aliases: { 'drag-dir': 'drag-direction', 'lift-dir': 'lift-direction', 'p-ref': 'reference-pressure', bins: 'strips' },
  async run(argv, io) {
    const args = parseArgs(argv, this.options, 'force', this.aliases);
    for (const n of args.notices) io.err(n);
    const file = args.positional[0];
    if (!file || args.positional.length > 1) throw new Error('expected one result file: fieldtally force <file> --groups a,b');
    const refs = groupRefsOf(args, 'force');
    const num = (name: string): number | undefined => { const t = str(args, name); return t === undefined ? undefined : parseNumber(t, name); };
    const v3 = (name: string): Vec3 | undefined => { const t = str(args, name); return t === undefined ? undefined : parseVec3(t, name); };
    const rho = num('rho'), speed = num('speed'), area = num('area'), length = num('length'), strips = num('strips');
    const viscous = str(args, 'viscous') ?? 'auto';
    if (!(VISCOUS as readonly string[]).includes(viscous)) throw new Error(`--viscous: expected one of ${VISCOUS.join(', ')}, got "${viscous}"`);
    const muText = str(args, 'mu');
    const mu = muText === undefined ? undefined : /^[-+]?(\d|\.\d)/.test(muText.trim()) ? parsePositive(muText, 'mu', 'a dynamic viscosity in Pa·s') : muText;
    const shearSign = num('shear-sign') ?? 1;
    const wallGradient = str(args, 'wall-gradient') ?? 'second-order';
    if (wallGradient !== 'second-order' && wallGradient !== 'first-order') throw new Error(`--wall-gradient: expected second-order or first-order, got "${wallGradient}"`);
    if (shearSign !== 1 && shearSign !== -1) throw new Error(`--shear-sign: expected 1 or -1, got ${shearSign}`);
    const given = [rho, speed, area].filter((x) => x !== undefined).length;
    if (given > 0 && given < 3) throw new Error('coefficients need all of --rho, --speed and --area');
    if (strips !== undefined && !(Number.isInteger(strips) && strips >= 1)) throw new Error(`--strips: expected a whole number ≥ 1, got ${strips}`);
    if (given === 3) checkReferenceScale({ rho: rho!, speed: speed!, area: area!, ...(length !== undefined ? { length } : {}) });
    const reference: ForceReference | undefined = given === 3 ? { rho: rho!, speed: speed!, area: area!, ...(length !== undefined ? { length } : {}) } : undefined;

    const { dataset, faces, groups } = await loadSurfaces(file, args);
    const picked = resolveGroups(groups, refs, faces);
    const selection = facesOfGroups(groups, picked);
    const loadOptions: Partial<LoadOptions> = {
      viscous: viscous as LoadOptions['viscous'], pRef: num('reference-pressure') ?? 0, kinematic: args.options.kinematic === true,
      rho, mu, wallShearSign: shearSign as 1 | -1, wallGradient,
      ...(str(args, 'pressure') !== undefined ? { pressure: str(args, 'pressure') } : {}),
      ...(str(args, 'wall-shear') !== undefined ? { wallShear: str(args, 'wall-shear') } : {}),
      ...(str(args, 'velocity') !== undefined ? { velocity: str(args, 'velocity') } : {}),
    };
    const loads = surfaceLoads(dataset, faces, selection, loadOptions, groups.faceSurfaceCell);
    const drag = v3('drag-direction') ?? [1, 0, 0];
    const r = forceTotals(dataset, faces, loads, {
      dragDirection: drag, liftDirection: v3('lift-direction') ?? [0, 0, 1], momentPoint: v3('moment-point') ?? [0, 0, 0],
      cpAxis: v3('cp-axis'), reference,
    });
    const quality = surfaceQuality(faces, selection);
    const cp = reference ? pressureCoefficient(dataset, faces, loads, reference.rho, reference.speed) : null;
    const dist = strips !== undefined ? forceDistribution(dataset, faces, loads, { axis: drag, bins: strips, dragDirection: drag }) : null;
    const groupList = picked.map((i) => ({ id: groups.groups[i]!.id, name: groups.groups[i]!.name, faces: groups.groups[i]!.faces }));
    if (args.options.json) {
      io.out(JSON.stringify({
        file, groups: groupList, ...r,
        cp: cp ? { min: cp.min, max: cp.max } : null,
        surface: { closed: quality.closed, closure: quality.closure, openEdges: quality.openEdges, inconsistentEdges: quality.inconsistentEdges },
        distribution: dist ? {
          axis: dist.axis, edges: Array.from(dist.edges), dragPerLength: Array.from(dist.dragPerLength),
          cumulativeDrag: Array.from(dist.cumulativeDrag), split: dist.split,
        } : undefined,
        caution: CAUTION,
      }, null, 2));
      return 0;
    }
    const c = r.coefficients;
    const parts = (p: { drag: number; lift: number; side: number } | null) => p ? `drag ${fmt(p.drag)}, lift ${fmt(p.lift)}, side ${fmt(p.side)}` : '—';
    io.out([
      `${file}: force on ${groupList.map((g) => `${g.id} "${g.name}"`).join(' + ')} (${r.faces} faces, area ${fmt(r.area)})`,
      `  surface ${quality.closed ? 'closed' : `not closed (${quality.openEdges} open, ${quality.inconsistentEdges} inconsistent edges)`}`,
      '',
      `pressure force   ${vec(r.pressureForce)}   [array "${r.pressureArray}"]`,
      `viscous force    ${vec(r.viscousForce)}   [${r.viscous.method}${r.viscous.array ? ` "${r.viscous.array}"` : ''}${r.viscous.gradient ? `, ${r.viscous.gradient}` : ''}]`,
      `total force      ${vec(r.force)}`,
      `moment about ${vec(r.momentPoint)}: ${vec(r.moment)}  (pressure ${vec(r.pressureMoment)}, viscous ${vec(r.viscousMoment)})`,
      `directions: drag ${vec(r.directions.drag)}, lift ${vec(r.directions.lift)}, side ${vec(r.directions.side)}`,
      `components: total ${parts(r.components.total)}`,
      `            pressure ${parts(r.components.pressure)}`,
      `            viscous ${parts(r.components.viscous)}`,
      ...(c ? [
        `coefficients (q = ${fmt(c.dynamicPressure)}, A = ${fmt(c.reference.area)}): C_D ${fmt(c.drag)}, C_L ${fmt(c.lift)}, C_S ${fmt(c.side)}`,
        `            pressure ${parts(c.pressure)}`,
        `            viscous ${parts(c.viscous)}`,
        ...(c.moment ? [`moment coefficients (L = ${fmt(c.reference.length)}): about drag ${fmt(c.moment.aboutDrag)}, side ${fmt(c.moment.aboutSide)}, lift ${fmt(c.moment.aboutLift)}`] : []),
        `Cp on the surface: ${fmt(cp!.min)} … ${fmt(cp!.max)}`,
      ] : []),
      ...(r.centreOfPressure ? [`centre of pressure along ${vec(r.centreOfPressure.axis)}: ${vec(r.centreOfPressure.position)}`] : []),
      ...(dist ? ['', 'drag per unit length along the drag direction:', ...Array.from(dist.dragPerLength, (v, i) =>
        `  ${fmt(dist.edges[i]!)} … ${fmt(dist.edges[i + 1]!)}: ${fmt(v)}   cumulative ${fmt(dist.cumulativeDrag[i + 1]!)}`)] : []),
      ...r.notes.map((n) => `note: ${n}`),
      '', r.signConvention, r.units, `Caution: ${CAUTION}`,
    ].join('\n'));
    return 0;
  },
};
export default force;
