/**
 * The wall-quantities probe of a probe set: τ_w, c_f and y⁺ over the named surface groups together — the
 * same compute path as the `wall` verb (`wallQuantities`), on the SI dataset. ρ and U come from the set's
 * reference values, μ from `fields.viscosity` or the reference viscosity. Surfaces are named by id, name or a
 * selector choosing them by what they are (src/surface/groupSelect.ts); the definition states a selector used.
 */
import { describeSelector, type GroupSelector } from '../surface/groupSelect.ts';
import { facesOfGroups, resolveGroups } from '../surface/surfaceGroups.ts';
import { wallQuantities } from '../surface/wallQuantities.ts';
import { addQuantity, fmt6, type EvalContext, type ProbeOutcome } from './outcome.ts';
import type { WallProbe } from './probeSet.ts';
import { SI } from './units.ts';

/** Wall quantities on the probe's surfaces. */
export function evaluateWall(ctx: EvalContext, p: WallProbe, out: ProbeOutcome): void {
  const o = p.options ?? {}, f = p.fields ?? {}, ref = ctx.reference;
  const { faces, groups } = ctx.surfaces(o);
  const picked = resolveGroups(groups, p.geometry.surfaces, faces);
  const selection = facesOfGroups(groups, picked);
  const r = wallQuantities(ctx.dataset, faces, selection, {
    density: ref.density, speed: ref.speed, viscosity: f.viscosity ?? ref.viscosity,
    wallDistance: o.wallDistance ?? 'cell-centroid', source: o.shearFrom ?? 'auto',
    ...(o.thresholds ? { thresholds: o.thresholds } : {}), ...(o.bins !== undefined ? { bins: o.bins } : {}),
    loads: {
      wallGradient: o.wallGradient ?? 'second-order', wallShearSign: o.wallShearSign ?? 1,
      ...(f.wallShear !== undefined ? { wallShear: f.wallShear } : {}), ...(f.velocity !== undefined ? { velocity: f.velocity } : {}),
      ...(f.pressure !== undefined ? { pressure: f.pressure } : {}),
    },
  }, groups.faceSurfaceCell);
  let cx = 0, cy = 0, cz = 0, a = 0;
  for (const i of picked) { const g = groups.groups[i]!; cx += g.area * g.centroid[0]; cy += g.area * g.centroid[1]; cz += g.area * g.centroid[2]; a += g.area; }
  if (a > 0) out.anchor = ctx.file([cx / a, cy / a, cz / a]);
  const src = r.shearSource.method === 'wall-shear-array' ? `the file's wall-shear array "${r.shearSource.array}"`
    : `the ${r.shearSource.gradient ?? 'first-order'} velocity gradient of "${r.shearSource.array}" with μ = ${typeof r.shearSource.mu === 'number' ? `${fmt6(r.shearSource.mu)} Pa·s` : `"${r.shearSource.mu}"`}`;
  // groups chosen by what they are say how, so the same wall is recognised in another file
  const chosen = p.geometry.surfaces.filter((r): r is GroupSelector => typeof r === 'object').map((r) => ` (chosen ${describeSelector(r)})`).join('');
  out.definition = `wall quantities on ${picked.map((i) => `${groups.groups[i]!.id} "${groups.groups[i]!.name}"`).join(' + ')}${chosen}; τ_w from ${src}; ${r.wallDistanceDefinition}`;
  const s = r.stats;
  addQuantity(out, 'wallShear.mean', '|τ_w| mean', s.shearMagnitude.mean, SI.pressure);
  addQuantity(out, 'wallShear.min', '|τ_w| min', s.shearMagnitude.min, SI.pressure);
  addQuantity(out, 'wallShear.max', '|τ_w| max', s.shearMagnitude.max, SI.pressure);
  addQuantity(out, 'cf.mean', 'c_f mean', s.cf?.mean, SI.dimensionless);
  addQuantity(out, 'cf.max', 'c_f max', s.cf?.max, SI.dimensionless);
  addQuantity(out, 'yPlus.mean', 'y+ mean', s.yPlus?.mean, SI.dimensionless);
  addQuantity(out, 'yPlus.min', 'y+ min', s.yPlus?.min, SI.dimensionless);
  addQuantity(out, 'yPlus.max', 'y+ max', s.yPlus?.max, SI.dimensionless);
  for (const t of r.yPlusAbove) addQuantity(out, `yPlusAbove.${t.threshold}`, `area share y+ > ${t.threshold}`, t.areaShare, SI.dimensionless);
  addQuantity(out, 'wallDistance.mean', 'wall distance y mean', s.wallDistance.mean, SI.length);
  addQuantity(out, 'wallArea', 'wall area', r.area, SI.area);
  out.notes.push(...r.notes);
}
