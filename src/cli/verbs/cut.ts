/**
 * `fieldtally cut <file> --origin x,y,z --normal x,y,z [region] [fields] [--json]`: cuts the mesh with a plane
 * and reports area, centroid, flow rates, area- and mass-flow-weighted means, total pressure, uniformity and
 * reverse flow over the cut (or a region of it).
 */
import { integratePlane } from '../../cut/planeIntegrals.ts';
import { parseArgs, parseDirection, parseVec3, str } from '../args.ts';
import {
  CAUTION, FIELD_HELP, FIELD_OPTIONS, FIELD_RULE, REGION_HELP, REGION_OPTIONS, SIGN_CONVENTION, UNITS_NOTE,
  footer, integralOptions, integralsJson, integralsTable, num, regionSpecs,
} from '../cutCommon.ts';
import type { Verb } from '../verb.ts';
import { loadForOneShot, ONE_SHOT_WORKER_HELP, ONE_SHOT_WORKER_OPTIONS } from '../oneShotLoad.ts';
import { DERIVED_HELP, DERIVED_OPTIONS, withDerivedArgs } from '../derivedArgs.ts';

const cut: Verb = {
  summary: 'cut-plane integrals: area, flow rates, area- and mass-flow-weighted means, total pressure',
  usage: [
    'fieldtally cut <file> --origin x,y,z --normal x,y,z [--seed x,y,z] [--disk …] [--rect …] [--groups …]',
    '               [--velocity name] [--pressure name] [--rho value|name] [--kinematic] [--fields a,b] [--json] [--workers N]',
    '  Cuts every 3D cell with the plane through --origin with normal --normal and integrates over the cut.',
    REGION_HELP, FIELD_HELP,
    '  --fields a,b            derived fields to add: their integrals, means and ranges are reported with the file\'s fields',
    DERIVED_HELP, FIELD_RULE, ONE_SHOT_WORKER_HELP, SIGN_CONVENTION, UNITS_NOTE,
  ].join('\n'),
  options: { origin: 'string', normal: 'string', ...REGION_OPTIONS, ...FIELD_OPTIONS, fields: 'string', ...DERIVED_OPTIONS, ...ONE_SHOT_WORKER_OPTIONS },
  async run(argv, io) {
    const args = parseArgs(argv, this.options, 'cut');
    const file = args.positional[0];
    if (!file || args.positional.length > 1) throw new Error('expected one result file: fieldtally cut <file> --origin x,y,z --normal x,y,z');
    const o = str(args, 'origin'), n = str(args, 'normal');
    if (!o || !n) throw new Error('--origin and --normal are required (three numbers each, e.g. --origin 0,0,0.05 --normal 0,0,1)');
    const origin = parseVec3(o, 'origin'), normal = parseDirection(n, 'normal');
    const region = regionSpecs(args);
    const extra = str(args, 'fields')?.split(',').map((x) => x.trim()).filter((x) => x !== '') ?? [];
    const input = await loadForOneShot(file, args);
    let result;
    let dataset;
    try {
      const none = (v: string | undefined) => (v === 'none' ? undefined : v);
      const rho = none(str(args, 'rho'));
      // with workers, the velocity gradient of the derived fields is computed by them (deriveShares.ts)
      if (input.pool) {
        const { primeDerivedGradients } = await import('../../parallel/deriveShares.ts');
        await primeDerivedGradients(input.pool, extra, { velocity: none(str(args, 'velocity')) });
      }
      dataset = withDerivedArgs(input.dataset, [...extra, ...[str(args, 'velocity'), str(args, 'pressure'), rho].filter((x): x is string => !!x)], args, {
        velocity: none(str(args, 'velocity')), pressure: none(str(args, 'pressure')), kinematicPressure: args.options.kinematic === true,
        ...(rho !== undefined ? { density: /^[-+]?(\d|\.\d)/.test(rho.trim()) ? Number(rho) : rho } : {}),
      });
      for (const n of extra) if (!dataset.pieces[0]?.pointData.some((f) => f.name === n) && !dataset.pieces[0]?.cellData.some((f) => f.name === n)) throw new Error(`--fields: no field "${n}" in ${file} and no derived field of that name`);
      const q = { origin, normal, region, integral: integralOptions(args, dataset) };
      // Derived fields live on this thread's dataset only: the workers' shared copy lacks them.
      result = input.pool && dataset === input.dataset ? await input.pool.integratePlane(q) : integratePlane(dataset, q);
    } finally {
      await input.close();
    }
    const { cut: c, region: r, integrals: s } = result;
    if (region.some((x) => x.kind === 'seed') && r.reason && !c.empty) throw new Error(r.reason);
    if (args.options.json) {
      io.out(JSON.stringify({
        file, plane: { origin, normal: c.normal.map((x) => num(x)) }, region: r.applied.length ? r.applied : ['whole cut'],
        ...integralsJson(s),
        cut: { triangles: c.indices.length / 3, cellsCut: c.stats.cutCells, boundaryFacesInPlane: c.stats.boundaryFaces, ms: num(c.stats.ms) },
        signConvention: SIGN_CONVENTION, units: UNITS_NOTE, caution: CAUTION,
      }, null, 2));
      return 0;
    }
    io.out([
      `${file}: plane through (${origin.join(', ')}) with normal (${c.normal.map((x) => num(x)).join(', ')})`,
      `region: ${r.applied.length ? r.applied.join('; ') : 'whole cut'}   (${c.stats.cutCells} cells cut, ${s.triangles} triangles)`,
      '',
      ...integralsTable(s),
      ...footer(),
    ].join('\n'));
    return 0;
  },
};
export default cut;
