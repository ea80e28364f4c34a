/**
 * `fieldtally loss <file> --upstream x,y,z@nx,ny,nz --downstream x,y,z@nx,ny,nz [--reference upstream|downstream]`:
 * total- and static-pressure loss between two cut-planes and the loss coefficient K = Δp₀/(½ρV²).
 */
import { pressureLoss } from '../../cut/composite.ts';
import { integratePlane } from '../../cut/planeIntegrals.ts';
import { loadDatasetFile } from '../../io/nodeFiles.ts';
import { parseArgs, str } from '../args.ts';
import {
  CAUTION, FIELD_HELP, FIELD_OPTIONS, FIELD_RULE, REGION_OPTIONS, SIGN_CONVENTION, UNITS_NOTE,
  fmt, footer, integralOptions, integralsJson, integralsTable, num, parsePlane, regionSpecs,
} from '../cutCommon.ts';
import type { Verb } from '../verb.ts';

const prefixed = (p: string) => Object.fromEntries(Object.entries(REGION_OPTIONS).map(([k, v]) => [`${p}${k}`, v]));

const loss: Verb = {
  summary: 'pressure loss between two cut-planes and loss coefficient K = Δp₀/(½ρV²)',
  usage: [
    'fieldtally loss <file> --upstream x,y,z@nx,ny,nz --downstream x,y,z@nx,ny,nz [--reference upstream|downstream]',
    '                [--upstream-seed x,y,z] [--downstream-seed x,y,z] (also -disk, -rect, -groups per plane, as for cut)',
    '                [--velocity name] [--pressure name] [--rho value|name] [--kinematic] [--json]',
    '  Δp₀ = mass-flow-weighted total pressure upstream − downstream (positive = loss); static drop both weightings;',
    '  K = Δp₀/(½ρV²) with V = |Q|/A on the reference plane (default upstream) and ρ the constant density or that plane\'s ṁ/Q.',
    FIELD_HELP, FIELD_RULE, UNITS_NOTE,
  ].join('\n'),
  options: { upstream: 'string', downstream: 'string', reference: 'string', ...prefixed('upstream-'), ...prefixed('downstream-'), ...FIELD_OPTIONS },
  async run(argv, io) {
    const args = parseArgs(argv, this.options, 'loss');
    const file = args.positional[0];
    if (!file || args.positional.length > 1) throw new Error('expected one result file: fieldtally loss <file> --upstream … --downstream …');
    const up = str(args, 'upstream'), down = str(args, 'downstream');
    if (!up || !down) throw new Error('--upstream and --downstream are required, each as x,y,z@nx,ny,nz');
    const reference = str(args, 'reference') ?? 'upstream';
    if (reference !== 'upstream' && reference !== 'downstream') throw new Error(`--reference: expected upstream or downstream, got "${reference}"`);
    const p1 = parsePlane(up, 'upstream'), p2 = parsePlane(down, 'downstream');
    const dataset = await loadDatasetFile(file);
    const integral = integralOptions(args, dataset);
    const r1 = integratePlane(dataset, { ...p1, region: regionSpecs(args, 'upstream-'), integral });
    const r2 = integratePlane(dataset, { ...p2, region: regionSpecs(args, 'downstream-'), integral });
    const l = pressureLoss(r1.integrals, r2.integrals, { reference });
    if (args.options.json) {
      io.out(JSON.stringify({
        file,
        upstream: { plane: p1, ...integralsJson(r1.integrals) },
        downstream: { plane: p2, ...integralsJson(r2.integrals) },
        totalPressureLoss: num(l.totalPressureLoss),
        staticPressureDrop: l.staticPressureDrop && { massFlowWeighted: num(l.staticPressureDrop.massFlowWeighted), areaWeighted: num(l.staticPressureDrop.areaWeighted) },
        reference: l.reference, meanVelocity: num(l.meanVelocity), density: num(l.density), dynamicPressure: num(l.dynamicPressure),
        lossCoefficient: num(l.lossCoefficient), kinematic: l.kinematic, notes: l.notes,
        signConvention: SIGN_CONVENTION, units: UNITS_NOTE, caution: CAUTION,
      }, null, 2));
      return 0;
    }
    io.out([
      `${file}: pressure loss from plane 1 (upstream) to plane 2 (downstream)`,
      '', `plane 1 through (${p1.origin.join(', ')}) normal (${p1.normal.join(', ')})`, ...integralsTable(r1.integrals).map((s) => '  ' + s),
      '', `plane 2 through (${p2.origin.join(', ')}) normal (${p2.normal.join(', ')})`, ...integralsTable(r2.integrals).map((s) => '  ' + s),
      '',
      `total-pressure loss Δp₀${l.kinematic ? '/ρ' : ''} (mass-flow-weighted)   ${fmt(l.totalPressureLoss)}`,
      `static-pressure drop (mass-flow-weighted)   ${fmt(l.staticPressureDrop?.massFlowWeighted)}`,
      `static-pressure drop (area-weighted)        ${fmt(l.staticPressureDrop?.areaWeighted)}`,
      `mean velocity V = |Q|/A on the ${l.reference} plane   ${fmt(l.meanVelocity)}`,
      `dynamic pressure ${l.kinematic ? '½V²' : '½ρV²'}                     ${fmt(l.dynamicPressure)}${l.density !== null ? `   (ρ = ${fmt(l.density)})` : ''}`,
      `loss coefficient K = Δp₀/(½ρV²)            ${fmt(l.lossCoefficient)}`,
      ...l.notes.map((n) => `note: ${n}`),
      ...footer(),
    ].join('\n'));
    return 0;
  },
};
export default loss;
