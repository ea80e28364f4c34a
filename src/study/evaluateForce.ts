/**
 * The force-total probe of a probe set: pressure and viscous force on merged surface groups, moment and
 * coefficients — the same compute path as the `force` verb (`surfaceLoads`, `forceTotals`), on the SI
 * dataset. Reference values come from the set, replaced member by member by the probe's
 * `options.reference`; coefficients need ρ, U and A (moment coefficients also L) and are left out, with a
 * note, when any is missing. μ is the viscosity field named in `fields.viscosity`, else the reference
 * viscosity; it is used only when the viscous force comes from the velocity gradient.
 */
import { datasetBounds } from '../model/bounds.ts';
import { forceTotals, type ForceReference } from '../surface/forces.ts';
import { refText } from '../surface/groupSelect.ts';
import { facesOfGroups, resolveGroups } from '../surface/surfaceGroups.ts';
import { surfaceLoads, type LoadOptions } from '../surface/surfaceLoads.ts';
import type { SurfaceGroups } from '../surface/surfaceGroups.ts';
import { openSurfaceNote, surfaceQuality, type SurfaceQuality } from '../surface/surfaceQuality.ts';
import { addQuantity, fmt6, resolveReference, vecText, type EvalContext, type ProbeOutcome } from './outcome.ts';
import { deriveLift } from './liftRule.ts';
import type { ForceProbe } from './probeSet.ts';
import { SI } from './units.ts';

/** Drag along +x and lift along +z when the set does not say (as the `force` verb). */
export const DEFAULT_DRAG: [number, number, number] = [1, 0, 0];
export const DEFAULT_LIFT: [number, number, number] = [0, 0, 1];

/** Closure of a group selection depends on the mesh only: kept per (cached) grouping, so the steps of a series on one mesh check it once. */
const qualityCache = new WeakMap<SurfaceGroups, Map<string, SurfaceQuality>>();

function selectionQuality(groups: SurfaceGroups, faces: Parameters<typeof surfaceQuality>[0], picked: readonly number[], selection: ArrayLike<number>): SurfaceQuality {
  let m = qualityCache.get(groups);
  if (!m) { m = new Map(); qualityCache.set(groups, m); }
  const key = picked.join(',');
  let q = m.get(key);
  if (!q) { q = surfaceQuality(faces, selection); m.set(key, q); }
  return q;
}

/** A force total. */
export function evaluateForce(ctx: EvalContext, p: ForceProbe, out: ProbeOutcome): void {
  const o = p.options ?? {}, f = p.fields ?? {};
  const ref = o.reference ? resolveReference(ctx.reference, o.reference) : ctx.reference;
  out.definition = `force on the surfaces ${p.geometry.surfaces.map(refText).join(' + ')}`;
  const { faces, groups } = ctx.surfaces(o);
  const picked = resolveGroups(groups, p.geometry.surfaces, faces);
  const selection = facesOfGroups(groups, picked);
  const names = picked.map((i) => `${groups.groups[i]!.id} "${groups.groups[i]!.name}"`);
  out.definition = `force on ${names.join(' + ')}`;
  const loadOptions: Partial<LoadOptions> = {
    viscous: o.viscous ?? 'auto', pRef: ref.pressure ?? 0, kinematic: o.kinematicPressure ?? false, rho: ref.density,
    mu: f.viscosity ?? ref.viscosity, wallShearSign: o.wallShearSign ?? 1, wallGradient: o.wallGradient ?? 'second-order',
    ...(f.pressure !== undefined ? { pressure: f.pressure } : {}),
    ...(f.wallShear !== undefined ? { wallShear: f.wallShear } : {}),
    ...(f.velocity !== undefined ? { velocity: f.velocity } : {}),
  };
  const loads = surfaceLoads(ctx.dataset, faces, selection, loadOptions, groups.faceSurfaceCell);
  const hasRef = ref.density !== undefined && ref.speed !== undefined && ref.area !== undefined;
  const reference: ForceReference | undefined = hasRef
    ? { rho: ref.density!, speed: ref.speed!, area: ref.area!, ...(ref.length !== undefined ? { length: ref.length } : {}) } : undefined;
  const momentPoint = ctx.si(ref.momentPoint ?? [0, 0, 0]);
  const drag = ref.dragDirection ?? DEFAULT_DRAG;
  // lift by the stated rule when the set asks for it (bounds scale with the file's unit; the rule reads only their ratios)
  const byRule = ref.liftFrom === 'rule' && !(o.reference?.liftDirection && o.reference.liftFrom !== 'rule');
  const derived = byRule ? deriveLift(drag, datasetBounds(ctx.dataset)) : undefined;
  const r = forceTotals(ctx.dataset, faces, loads, {
    dragDirection: drag, liftDirection: derived?.direction ?? ref.liftDirection ?? DEFAULT_LIFT, momentPoint, reference,
  });
  let cx = 0, cy = 0, cz = 0, a = 0;
  for (const i of picked) { const g = groups.groups[i]!; cx += g.area * g.centroid[0]; cy += g.area * g.centroid[1]; cz += g.area * g.centroid[2]; a += g.area; }
  if (a > 0) out.anchor = ctx.file([cx / a, cy / a, cz / a]);
  out.definition += `; drag ${vecText(r.directions.drag)}, lift ${vecText(r.directions.lift)}, moment about ${vecText(ref.momentPoint ?? [0, 0, 0])}` +
    `; pressure "${r.pressureArray}" − ${fmt6(ref.pressure ?? 0)} Pa; viscous part: ${r.viscous.method}` +
    (reference ? `; ρ = ${fmt6(reference.rho)} kg/m³, U = ${fmt6(reference.speed)} m/s, A = ${fmt6(reference.area)} m²${reference.length !== undefined ? `, L = ${fmt6(reference.length)} m` : ''}` : '');
  const c = r.coefficients;
  addQuantity(out, 'CD', 'C_D', c?.drag, SI.dimensionless);
  addQuantity(out, 'CL', 'C_L', c?.lift, SI.dimensionless);
  addQuantity(out, 'CS', 'C_S', c?.side, SI.dimensionless);
  addQuantity(out, 'CD.pressure', 'C_D pressure part', c?.pressure.drag, SI.dimensionless);
  addQuantity(out, 'CD.viscous', 'C_D viscous part', c?.viscous?.drag, SI.dimensionless);
  addQuantity(out, 'force.drag', 'F_drag', r.components.total.drag, SI.force);
  addQuantity(out, 'force.lift', 'F_lift', r.components.total.lift, SI.force);
  addQuantity(out, 'force.side', 'F_side', r.components.total.side, SI.force);
  addQuantity(out, 'pressureForce.drag', 'F_drag pressure part', r.components.pressure.drag, SI.force);
  addQuantity(out, 'viscousForce.drag', 'F_drag viscous part', r.components.viscous?.drag, SI.force);
  (['x', 'y', 'z'] as const).forEach((k, i) => addQuantity(out, `force.${k}`, `F_${k}`, r.force[i], SI.force));
  (['x', 'y', 'z'] as const).forEach((k, i) => addQuantity(out, `moment.${k}`, `M_${k}`, r.moment[i], SI.moment));
  if (c?.moment) {
    addQuantity(out, 'CM.drag', 'C_M about drag axis', c.moment.aboutDrag, SI.dimensionless);
    addQuantity(out, 'CM.side', 'C_M about side axis', c.moment.aboutSide, SI.dimensionless);
    addQuantity(out, 'CM.lift', 'C_M about lift axis', c.moment.aboutLift, SI.dimensionless);
  }
  addQuantity(out, 'wettedArea', 'wetted area', r.area, SI.area);
  grossScales(out, r.grossForce, c ? c.dynamicPressure * c.reference.area : undefined);
  if (derived) out.notes.push(derived.text);
  if (!reference) out.notes.push('coefficients need the reference density, speed and area (reference.density or a preset, reference.speed, reference.area)');
  out.notes.push(...r.notes.filter((n) => !/^coefficients not computed/.test(n)));
  const open = openSurfaceNote(selectionQuality(groups, faces, picked, selection));
  if (open) out.notes.push(open);
}

/** Gives the force components the size Σ|dF| (N) and the coefficients Σ|dF|/(q·A), as rounding-noise scales. */
function grossScales(out: ProbeOutcome, gross: number, qa: number | undefined): void {
  if (!(gross > 0)) return;
  const scales: NonNullable<ProbeOutcome['scales']> = {};
  for (const q of out.quantities) {
    if (q.key.startsWith('force.') || q.key.endsWith('Force.drag')) scales[q.key] = { value: gross, label: 'Σ|dF|' };
    else if (qa !== undefined && /^(CD|CL$|CS$)/.test(q.key)) scales[q.key] = { value: gross / qa, label: 'Σ|dF|/(q·A)' };
  }
  out.scales = scales;
}
