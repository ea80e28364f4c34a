/**
 * The plane-based probes of a probe set: a cut-plane's integrals, the pressure loss between two planes,
 * and a mass balance over planes and boundary surfaces. Each calls the same compute path as the `cut`,
 * `loss` and `balance` verbs (`integratePlane`, `pressureLoss`, `massBalance`), on the SI dataset; a plane
 * asked again on the same mesh (the steps of a series) reuses its cut geometry (`cutCache.ts`).
 *
 * Field roles: a named field, or null for none; left out, the velocity and pressure go by the rule of
 * src/cut/fieldRoles.ts (the velocity must then be found, else the probe fails asking for it), and the
 * density is a density field if the file has one, else the set's reference density, else none (then no
 * mass-flow numbers, with a note).
 */
import { pressureLoss, massBalance, type BalanceItem } from '../cut/composite.ts';
import { allFieldRefs } from '../cut/cutFields.ts';
import { boundaryTriangleSet } from '../cut/faceSet.ts';
import { guessRole } from '../cut/fieldRoles.ts';
import { integrateSurface, type IntegralOptions, type SurfaceIntegrals } from '../cut/integrals.ts';
import { integratePlaneReusingCut } from '../cut/cutCache.ts';
import type { PlaneResult } from '../cut/planeIntegrals.ts';
import type { RegionSpec } from '../cut/region.ts';
import type { TriangleSet } from '../cut/triangleSet.ts';
import { findField } from '../model/piece.ts';
import { refText } from '../surface/groupSelect.ts';
import { facesOfGroups, resolveGroups } from '../surface/surfaceGroups.ts';
import { addQuantity, fail, fmt6, vecText, type EvalContext, type ProbeOutcome } from './outcome.ts';
import type { CutPlaneProbe, FlowFields, FlowOptions, MassBalanceProbe, PlaneDoc, PressureLossProbe } from './probeSet.ts';
import { SI } from './units.ts';

/** Integral options from a probe's field roles (see the file comment). */
export function flowIntegralOptions(ctx: EvalContext, fields: FlowFields | undefined, options: FlowOptions | undefined): Partial<IntegralOptions> {
  const d = ctx.dataset;
  const infos = allFieldRefs(d).map((r) => ({ ...r, components: findField(d.pieces[0]!, r.name, r.association)!.components }));
  if (fields?.velocity === undefined) {
    const g = guessRole(infos, 'velocity');
    if (!g.field) {
      const vecs = infos.filter((f) => f.components === 3).map((f) => `${f.name} (${f.association})`).join(', ') || 'none';
      throw new Error(`${g.candidates.length > 1 ? `several velocity fields (${g.candidates.join(', ')})` : 'no field named like a velocity'}: set fields.velocity to one of the 3-component fields (${vecs}) or to null`);
    }
  }
  let density = fields?.density;
  if (density === undefined && !guessRole(infos, 'density').field) density = ctx.reference.density ?? null;
  return { velocity: fields?.velocity, pressure: fields?.pressure, density, kinematicPressure: options?.kinematicPressure ?? false };
}

/** A plane of the document as a compute query (geometry converted to SI). */
function query(ctx: EvalContext, p: PlaneDoc): { origin: [number, number, number]; normal: [number, number, number]; region: RegionSpec[] } {
  const r = p.region ?? {}, region: RegionSpec[] = [];
  const k = ctx.lengthFactor;
  if (r.seed) region.push({ kind: 'seed', point: ctx.si(r.seed) });
  if (r.disk) region.push({ kind: 'disk', centre: ctx.si(r.disk.centre), radius: r.disk.radius * k });
  if (r.rectangle) region.push({ kind: 'rectangle', centre: ctx.si(r.rectangle.centre), axis: r.rectangle.axis, half: [r.rectangle.halfSizes[0] * k, r.rectangle.halfSizes[1] * k] });
  if (r.cellGroups) region.push({ kind: 'groups', field: r.cellGroups.field, ids: r.cellGroups.ids });
  return { origin: ctx.si(p.origin), normal: p.normal, region };
}

/** Cuts and integrates one plane; an empty cut or region (or a seed off the cut) is an error. */
function planeIntegrals(ctx: EvalContext, p: PlaneDoc, integral: Partial<IntegralOptions>, what: string): PlaneResult {
  const q = query(ctx, p);
  const r = integratePlaneReusingCut(ctx.dataset, { ...q, integral });
  if (r.integrals.empty) throw new Error(`${what}: ${r.integrals.reason ?? 'empty cut'}`);
  if (q.region.some((x) => x.kind === 'seed') && r.region.reason) throw new Error(`${what}: ${r.region.reason}`);
  return r;
}

function planeText(p: PlaneDoc): string {
  const r = p.region;
  const parts = [`through ${vecText(p.origin)} normal ${vecText(p.normal)}`];
  if (r?.seed) parts.push(`seed ${vecText(r.seed)}`);
  if (r?.disk) parts.push(`disk r = ${fmt6(r.disk.radius)} at ${vecText(r.disk.centre)}`);
  if (r?.rectangle) parts.push(`rectangle ${fmt6(2 * r.rectangle.halfSizes[0])} × ${fmt6(2 * r.rectangle.halfSizes[1])} at ${vecText(r.rectangle.centre)}`);
  if (r?.cellGroups) parts.push(`cells with ${r.cellGroups.field} in {${r.cellGroups.ids.join(', ')}}`);
  return parts.join(', ');
}

function rolesText(s: SurfaceIntegrals): string {
  const rho = s.roles.density;
  return `velocity ${s.roles.velocity ?? 'none'}, pressure ${s.roles.pressure ?? 'none'}${s.roles.kinematicPressure ? ' (kinematic)' : ''}, density ${typeof rho === 'number' ? `${fmt6(rho)} kg/m³` : rho ?? 'none'}`;
}

const bare = (role: string | null): string | null => role?.replace(/ \((point|cell)\)$/, '') ?? null;

function shapeOf(ctx: EvalContext, set: TriangleSet): TriangleSet {
  if (ctx.lengthFactor === 1) return set;
  const k = 1 / ctx.lengthFactor, pos = new Float64Array(set.positions.length);
  for (let i = 0; i < pos.length; i++) pos[i] = set.positions[i]! * k;
  return { ...set, positions: pos };
}

/** The numbers of one surface's integrals (shared by the cut-plane and the two planes of a loss). */
function surfaceQuantities(ctx: EvalContext, out: ProbeOutcome, s: SurfaceIntegrals, prefix = ''): void {
  const pName = bare(s.roles.pressure), uName = bare(s.roles.velocity);
  const pUnit = s.roles.kinematicPressure ? SI.kinematicPressure : pName ? ctx.fieldUnit(pName) : SI.pressure;
  addQuantity(out, `${prefix}area`, 'A', s.area, SI.area);
  addQuantity(out, `${prefix}volumeFlowRate`, 'Q', s.volumeFlowRate, SI.volumeFlow);
  addQuantity(out, `${prefix}massFlowRate`, 'ṁ', s.massFlowRate, SI.massFlow);
  if (s.volumeFlowRate !== null && s.area) addQuantity(out, `${prefix}meanNormalVelocity`, 'ū·n = Q/A', s.volumeFlowRate / s.area, SI.velocity);
  if (s.staticPressure) {
    addQuantity(out, `${prefix}staticPressure.areaMean`, `${pName} area mean`, s.staticPressure.areaMean, pUnit);
    addQuantity(out, `${prefix}staticPressure.massFlowMean`, `${pName} mass-flow mean`, s.staticPressure.massFlowMean, pUnit);
  }
  if (s.totalPressure) {
    const label = s.totalPressure.kinematic ? 'p₀/ρ' : 'p₀';
    addQuantity(out, `${prefix}totalPressure.areaMean`, `${label} area mean`, s.totalPressure.areaMean, pUnit);
    addQuantity(out, `${prefix}totalPressure.massFlowMean`, `${label} mass-flow mean`, s.totalPressure.massFlowMean, pUnit);
  }
  if (uName) addQuantity(out, `${prefix}velocityMagnitude.massFlowMean`, `|${uName}| mass-flow mean`, s.magnitudeMassFlowMean[uName], ctx.fieldUnit(uName));
  addQuantity(out, `${prefix}uniformityIndex`, 'uniformity γ', s.uniformityIndex, SI.dimensionless);
  if (s.reverseFlow) addQuantity(out, `${prefix}reverseFlow.areaShare`, 'reverse-flow area share', s.reverseFlow.areaShare, SI.dimensionless);
}

/** A cut-plane probe. */
export function evaluateCutPlane(ctx: EvalContext, p: CutPlaneProbe, out: ProbeOutcome): void {
  out.definition = `cut-plane ${planeText(p.geometry)}`;
  out.anchor = p.geometry.origin;
  const r = planeIntegrals(ctx, p.geometry, flowIntegralOptions(ctx, p.fields, p.options), 'cut-plane');
  const s = r.integrals;
  out.definition += `; ${rolesText(s)}`;
  out.anchor = ctx.file(s.centroid!);
  surfaceQuantities(ctx, out, s);
  if (s.massFlowRate === null && s.volumeFlowRate !== null) out.notes.push('no density (no density field, no fields.density, no reference density): no mass-flow numbers');
  out.notes.push(...s.notes);
  if (ctx.keepShapes) out.shapes = [{ kind: 'triangles', set: shapeOf(ctx, r.region.set) }];
}

/** A pressure loss between two planes with its loss coefficient. */
export function evaluateLoss(ctx: EvalContext, p: PressureLossProbe, out: ProbeOutcome): void {
  const g = p.geometry;
  out.definition = `pressure loss from the plane ${planeText(g.upstream)} to the plane ${planeText(g.downstream)}`;
  out.anchor = [(g.upstream.origin[0] + g.downstream.origin[0]) / 2, (g.upstream.origin[1] + g.downstream.origin[1]) / 2, (g.upstream.origin[2] + g.downstream.origin[2]) / 2];
  const integral = flowIntegralOptions(ctx, p.fields, p.options);
  const up = planeIntegrals(ctx, g.upstream, integral, 'upstream plane');
  const down = planeIntegrals(ctx, g.downstream, integral, 'downstream plane');
  const l = pressureLoss(up.integrals, down.integrals, { reference: p.options?.dynamicPressureFrom ?? 'upstream' });
  out.definition += `; ${rolesText(up.integrals)}; ½ρV² from the ${l.reference} plane`;
  const c1 = up.integrals.centroid!, c2 = down.integrals.centroid!;
  out.anchor = ctx.file([(c1[0] + c2[0]) / 2, (c1[1] + c2[1]) / 2, (c1[2] + c2[2]) / 2]);
  const pName = bare(up.integrals.roles.pressure);
  const pUnit = l.kinematic ? SI.kinematicPressure : pName ? ctx.fieldUnit(pName) : SI.pressure;
  addQuantity(out, 'totalPressureLoss', l.kinematic ? 'Δ(p₀/ρ)' : 'Δp₀', l.totalPressureLoss, pUnit);
  addQuantity(out, 'staticPressureDrop.massFlowWeighted', 'Δp mass-flow-weighted', l.staticPressureDrop?.massFlowWeighted, pUnit);
  addQuantity(out, 'staticPressureDrop.areaWeighted', 'Δp area-weighted', l.staticPressureDrop?.areaWeighted, pUnit);
  addQuantity(out, 'meanVelocity', 'V = |Q|/A', l.meanVelocity, SI.velocity);
  addQuantity(out, 'dynamicPressure', l.kinematic ? '½V²' : '½ρV²', l.dynamicPressure, pUnit);
  addQuantity(out, 'lossCoefficient', 'K', l.lossCoefficient, SI.dimensionless);
  addQuantity(out, 'upstream.volumeFlowRate', 'Q upstream', up.integrals.volumeFlowRate, SI.volumeFlow);
  addQuantity(out, 'downstream.volumeFlowRate', 'Q downstream', down.integrals.volumeFlowRate, SI.volumeFlow);
  addQuantity(out, 'upstream.massFlowRate', 'ṁ upstream', up.integrals.massFlowRate, SI.massFlow);
  addQuantity(out, 'downstream.massFlowRate', 'ṁ downstream', down.integrals.massFlowRate, SI.massFlow);
  out.notes.push(...l.notes);
  if (l.totalPressureLoss === null) fail(out, l.notes[0] ?? 'no total-pressure loss');
  else if (l.lossCoefficient === null) out.notes.push('no loss coefficient: the dynamic pressure is zero or unknown');
  if (ctx.keepShapes) out.shapes = [{ kind: 'triangles', set: shapeOf(ctx, up.region.set) }, { kind: 'triangles', set: shapeOf(ctx, down.region.set) }];
}

/** A mass (or volume) balance over planes whose normals point out of the control volume and boundary surfaces. */
export function evaluateBalance(ctx: EvalContext, p: MassBalanceProbe, out: ProbeOutcome): void {
  const g = p.geometry;
  const integral = flowIntegralOptions(ctx, p.fields, undefined);
  out.definition = `mass balance over ${g.planes.length} plane(s)${g.surfaces?.length ? ` and the surfaces ${g.surfaces.map(refText).join(', ')}` : ''} (normals out of the control volume)`;
  const items: BalanceItem[] = [];
  const shapes: TriangleSet[] = [];
  let cx = 0, cy = 0, cz = 0, n = 0;
  g.planes.forEach((pl, i) => {
    const label = `plane ${i + 1} ${planeText(pl)}`;
    const q = query(ctx, pl);
    const r = integratePlaneReusingCut(ctx.dataset, { ...q, integral });
    if (r.integrals.empty) r.integrals.reason ??= 'empty cut';
    items.push({ label, integrals: r.integrals });
    shapes.push(r.region.set);
    if (r.integrals.centroid) { cx += r.integrals.centroid[0]; cy += r.integrals.centroid[1]; cz += r.integrals.centroid[2]; n++; }
  });
  if (g.surfaces?.length) {
    const { faces, groups } = ctx.surfaces(p.options);
    for (const gi of resolveGroups(groups, g.surfaces, faces)) {
      const set = boundaryTriangleSet(ctx.dataset, faces, facesOfGroups(groups, [gi]));
      const s = integrateSurface(set, integral);
      items.push({ label: `surface ${groups.groups[gi]!.id} "${groups.groups[gi]!.name}"`, integrals: s });
      if (s.centroid) { cx += s.centroid[0]; cy += s.centroid[1]; cz += s.centroid[2]; n++; }
    }
  }
  if (n > 0) out.anchor = ctx.file([cx / n, cy / n, cz / n]);
  const b = massBalance(items);
  const unit = b.basis === 'mass' ? SI.massFlow : SI.volumeFlow, sym = b.basis === 'mass' ? 'ṁ' : 'Q';
  out.definition += `; ${b.basis} flow, outward positive`;
  addQuantity(out, 'net', `net ${sym} (Σ outward)`, b.net, unit);
  addQuantity(out, 'inflow', `${sym} in`, b.inflow, unit);
  addQuantity(out, 'outflow', `${sym} out`, b.outflow, unit);
  addQuantity(out, 'imbalanceShare', 'imbalance / inflow', b.imbalanceShare, SI.dimensionless);
  b.items.forEach((it, i) => addQuantity(out, `item${i + 1}.flux`, `${sym} ${it.label}`, it.flux, unit));
  // a flow split: what share of the inflow leaves through each outlet (a part with a net outward flux)
  if (b.inflow !== null && b.inflow > 0) {
    b.items.forEach((it, i) => {
      if (it.flux !== null && it.flux > 0 && it.outflow !== null) addQuantity(out, `item${i + 1}.outflowShare`, `share of ${sym} in leaving by ${it.label}`, it.outflow / b.inflow!, SI.dimensionless);
    });
  }
  out.notes.push(...b.notes);
  if (b.net === null) {
    const missing = b.notes.filter((x) => /empty|no velocity/.test(x));
    fail(out, `the balance cannot be closed: ${missing.length ? missing.join('; ') : 'a surface gave no flux'}`);
    out.notes = out.notes.filter((x) => !missing.includes(x));
  }
  if (ctx.keepShapes) out.shapes = shapes.map((s) => ({ kind: 'triangles' as const, set: shapeOf(ctx, s) }));
}
