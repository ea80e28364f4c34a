/**
 * What the plane verbs (`cut`, `loss`, `balance`) share: option parsing for planes, regions and field
 * roles, and the JSON / text rendering of surface integrals. Not a verb (it lives outside `verbs/`).
 */
import type { IntegralOptions, Stat, SurfaceIntegrals } from '../cut/integrals.ts';
import { allFieldRefs } from '../cut/cutFields.ts';
import { guessRole } from '../cut/fieldRoles.ts';
import type { RegionSpec } from '../cut/region.ts';
import type { Dataset } from '../model/dataset.ts';
import { findField } from '../model/piece.ts';
import { CAUTION } from '../study/caution.ts';
import { parseDirection, parseNumber, parseVec3, str, type OptionKind, type ParsedArgs } from './args.ts';

export const SIGN_CONVENTION = 'Fluxes (volume-flow rate Q = ∫u·n dA, mass-flow rate ṁ = ∫ρ u·n dA) are positive along the given plane normal n (unit). Mass-flow-weighted means do not depend on the sign of n.';
export const UNITS_NOTE = 'All values are in the file\'s units (SI files: m, m², m³/s, kg/s, Pa); no unit conversion is done.';
export const FIELD_RULE = 'Default fields: the velocity is the unique 3-component point or cell array named u, vel, velocity, velocities or velocity…; ' +
  'the pressure the unique scalar named p, pres, press, pressure or static pressure; the density the unique scalar named rho, dens or density ' +
  '(case-insensitive; the point array when a cell array shares its name). When none or several qualify, name it with --velocity/--pressure/--rho ' +
  '(prefix point: or cell: to choose the association); without a velocity the command stops unless given --velocity none.';
export { CAUTION };

/** Options every plane verb understands (besides its plane options). */
export const FIELD_OPTIONS: Record<string, OptionKind> = {
  velocity: 'string', pressure: 'string', rho: 'string', kinematic: 'boolean', json: 'boolean',
};

/** Region options of the cut verb (and, prefixed, of the others). */
export const REGION_OPTIONS: Record<string, OptionKind> = { seed: 'string', disk: 'string', rect: 'string', groups: 'string' };

export const REGION_HELP = [
  '  --seed x,y,z            keep the connected part of the cut that contains this point (projected onto the plane)',
  '  --disk x,y,z:r          keep the part inside the disk of radius r around x,y,z (exact clipping, arcs included)',
  '  --rect x,y,z:ax,ay,az:h1,h2  keep the part inside the rectangle centred at x,y,z, side along ax,ay,az (in the plane), half-sizes h1, h2',
  '  --groups field:id,id,…  keep cells whose integer cell array "field" is one of the ids',
].join('\n');

export const FIELD_HELP = [
  '  --velocity name|none    velocity field (default: see below; an error when no single field qualifies)',
  '  --pressure name|none    pressure field (default: see below)',
  '  --rho value|name|none   density: a constant or a field (default: a density field if there is one, else none — then no mass-flow results)',
  '  --kinematic             the pressure field holds p/ρ: total pressure is reported as p₀/ρ = p/ρ + ½|u|²',
  '  --json                  print JSON instead of the table',
].join('\n');

/**
 * Integral options from --velocity/--pressure/--rho/--kinematic, checked against the dataset's fields: when
 * --velocity is not given and the rule finds no single velocity field, this throws asking for --velocity
 * (`--velocity none` measures without one). `none` also works for --pressure and --rho.
 */
export function integralOptions(args: ParsedArgs, d: Dataset): Partial<IntegralOptions> {
  const none = (v: string | undefined) => (v === 'none' ? null : v);
  const rho = str(args, 'rho');
  let density: number | string | null | undefined;
  if (rho !== undefined) density = rho === 'none' ? null : /^[-+]?(\d|\.\d)/.test(rho.trim()) ? parseNumber(rho, 'rho') : rho;
  const velocity = none(str(args, 'velocity'));
  if (velocity === undefined) {
    const infos = allFieldRefs(d).map((r) => ({ ...r, components: findField(d.pieces[0]!, r.name, r.association)!.components }));
    const g = guessRole(infos, 'velocity');
    if (!g.field) {
      const vecs = infos.filter((f) => f.components === 3).map((f) => `${f.name} (${f.association})`).join(', ') || 'none';
      throw new Error(`${g.candidates.length > 1 ? `several velocity fields (${g.candidates.join(', ')})` : 'no field named like a velocity'}: give --velocity <name> (3-component fields: ${vecs}) or --velocity none`);
    }
  }
  return { velocity, pressure: none(str(args, 'pressure')), density, kinematicPressure: args.options.kinematic === true };
}

/** Region filters from --seed/--disk/--rect/--groups (option names prefixed with `prefix`). */
export function regionSpecs(args: ParsedArgs, prefix = ''): RegionSpec[] {
  const out: RegionSpec[] = [];
  const seed = str(args, `${prefix}seed`), disk = str(args, `${prefix}disk`), rect = str(args, `${prefix}rect`), groups = str(args, `${prefix}groups`);
  if (seed) out.push({ kind: 'seed', point: parseVec3(seed, `${prefix}seed`) });
  if (disk) {
    const [c, r] = disk.split(':');
    if (!c || !r) throw new Error(`--${prefix}disk: expected x,y,z:radius, got "${disk}"`);
    out.push({ kind: 'disk', centre: parseVec3(c, `${prefix}disk`), radius: parseNumber(r, `${prefix}disk`) });
  }
  if (rect) {
    const [c, a, h] = rect.split(':');
    const hs = h?.split(',').map((s) => parseNumber(s, `${prefix}rect`));
    if (!c || !a || !hs || hs.length !== 2) throw new Error(`--${prefix}rect: expected x,y,z:ax,ay,az:h1,h2, got "${rect}"`);
    out.push({ kind: 'rectangle', centre: parseVec3(c, `${prefix}rect`), axis: parseVec3(a, `${prefix}rect`), half: [hs[0]!, hs[1]!] });
  }
  if (groups) {
    const i = groups.lastIndexOf(':');
    if (i <= 0) throw new Error(`--${prefix}groups: expected field:id,id,…, got "${groups}"`);
    out.push({ kind: 'groups', field: groups.slice(0, i), ids: groups.slice(i + 1).split(',').map((s) => parseNumber(s, `${prefix}groups`)) });
  }
  return out;
}

/** A plane written `x,y,z@nx,ny,nz`. */
export function parsePlane(text: string, option: string): { origin: [number, number, number]; normal: [number, number, number] } {
  const [o, n] = text.split('@');
  if (!o || !n) throw new Error(`--${option}: expected origin@normal as x,y,z@nx,ny,nz, got "${text}"`);
  return { origin: parseVec3(o, option), normal: parseDirection(n, option) };
}

/** Rounds for JSON: keeps 12 significant digits (the computation is exact to about that on exact fields). */
export function num(v: number | null): number | null {
  return v === null ? null : Number(v.toPrecision(12));
}

function stat(v: Stat): Stat { return Array.isArray(v) ? v.map((x) => num(x)!) : num(v)!; }
function record<T extends Stat>(r: Record<string, T>): Record<string, Stat> {
  return Object.fromEntries(Object.entries(r).map(([k, v]) => [k, stat(v)]));
}

/** The JSON object of one surface's integrals. */
export function integralsJson(s: SurfaceIntegrals): Record<string, unknown> {
  return {
    empty: s.empty, reason: s.reason, triangles: s.triangles,
    area: num(s.area), centroid: s.centroid?.map((x) => num(x)) ?? null, normal: s.normal?.map((x) => num(x)) ?? null,
    volumeFlowRate: num(s.volumeFlowRate), massFlowRate: num(s.massFlowRate),
    areaMean: record(s.areaMean), massFlowMean: record(s.massFlowMean),
    magnitudeAreaMean: record(s.magnitudeAreaMean), magnitudeMassFlowMean: record(s.magnitudeMassFlowMean),
    integral: record(s.integral), min: record(s.min), max: record(s.max),
    magnitudeMin: record(s.magnitudeMin), magnitudeMax: record(s.magnitudeMax),
    staticPressure: s.staticPressure && { areaMean: num(s.staticPressure.areaMean), massFlowMean: num(s.staticPressure.massFlowMean), kinematic: s.staticPressure.kinematic },
    totalPressure: s.totalPressure && { areaMean: num(s.totalPressure.areaMean), massFlowMean: num(s.totalPressure.massFlowMean), kinematic: s.totalPressure.kinematic },
    uniformityIndex: num(s.uniformityIndex),
    reverseFlow: s.reverseFlow && {
      area: num(s.reverseFlow.area), areaShare: num(s.reverseFlow.areaShare), volumeFlowRate: num(s.reverseFlow.volumeFlowRate),
      massFlowRate: num(s.reverseFlow.massFlowRate), massShare: num(s.reverseFlow.massShare),
    },
    fields: s.roles, notes: s.notes,
  };
}

/** Number formatting for tables: 6 significant digits. */
export function fmt(v: number | null | undefined): string {
  if (v === null || v === undefined) return '—';
  if (v === 0) return '0';
  return Math.abs(v) >= 1e-3 && Math.abs(v) < 1e6 ? String(Number(v.toPrecision(6))) : v.toExponential(5);
}

function fmtStat(v: Stat | undefined): string {
  if (v === undefined) return '—';
  return Array.isArray(v) ? `(${v.map(fmt).join(', ')})` : fmt(v);
}

/** Readable table of one surface's integrals. */
export function integralsTable(s: SurfaceIntegrals): string[] {
  if (s.empty) return [`EMPTY: ${s.reason ?? 'no surface'} — no numbers reported`];
  const lines = [
    `area                      ${fmt(s.area)}`,
    `centroid                  (${s.centroid!.map(fmt).join(', ')})`,
    `normal n                  (${s.normal?.map(fmt).join(', ') ?? '—'})`,
    `volume-flow rate Q        ${fmt(s.volumeFlowRate)}`,
    `mass-flow rate ṁ          ${fmt(s.massFlowRate)}`,
  ];
  if (s.staticPressure) lines.push(`static pressure${s.staticPressure.kinematic ? ' p/ρ' : ' p  '}       area mean ${fmt(s.staticPressure.areaMean)}   mass-flow mean ${fmt(s.staticPressure.massFlowMean)}`);
  if (s.totalPressure) lines.push(`total pressure${s.totalPressure.kinematic ? ' p₀/ρ' : ' p₀  '}      area mean ${fmt(s.totalPressure.areaMean)}   mass-flow mean ${fmt(s.totalPressure.massFlowMean)}`);
  if (s.uniformityIndex !== null) lines.push(`uniformity index γ        ${fmt(s.uniformityIndex)}`);
  if (s.reverseFlow) lines.push(`reverse flow (u·n < 0)    area ${fmt(s.reverseFlow.area)} (${fmt(100 * s.reverseFlow.areaShare)} %)   Q ${fmt(s.reverseFlow.volumeFlowRate)}   ṁ ${fmt(s.reverseFlow.massFlowRate)}`);
  const names = Object.keys(s.areaMean);
  const w = Math.max(10, ...names.map((n) => n.length + 2));
  lines.push('', `${'field'.padEnd(w)} ${'area mean'.padEnd(30)} ${'mass-flow mean'.padEnd(30)} ${'min'.padEnd(30)} max`);
  for (const n of names) {
    lines.push(`${n.padEnd(w)} ${fmtStat(s.areaMean[n]).padEnd(30)} ${fmtStat(s.massFlowMean[n]).padEnd(30)} ${fmtStat(s.min[n]).padEnd(30)} ${fmtStat(s.max[n])}`);
    if (n in s.magnitudeAreaMean) {
      lines.push(`${('|' + n + '|').padEnd(w)} ${fmt(s.magnitudeAreaMean[n]).padEnd(30)} ${fmt(s.magnitudeMassFlowMean[n]).padEnd(30)} ${fmt(s.magnitudeMin[n]).padEnd(30)} ${fmt(s.magnitudeMax[n])}`);
    }
  }
  lines.push('', `fields: velocity ${s.roles.velocity ?? 'none'}, pressure ${s.roles.pressure ?? 'none'}, density ${s.roles.density ?? 'none'}`);
  for (const n of s.notes) lines.push(`note: ${n}`);
  return lines;
}

/** Closing lines every text report carries. */
export function footer(): string[] {
  return ['', SIGN_CONVENTION, UNITS_NOTE, `Caution: ${CAUTION}`];
}
