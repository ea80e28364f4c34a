/**
 * The sampling probes of a probe set: a line probe (statistics along it and, for a wall-normal line,
 * boundary-layer quantities) and a point probe (field values at one point). Same compute path as the
 * `line` and `point` verbs (`probeLine`, `lineStats`, `boundaryLayer`, `probePoints`), on the SI dataset.
 * A line wholly outside the mesh or a point outside it fails the probe; samples outside the mesh are
 * left out of every statistic (src/locate/lineStats.ts).
 */
import { boundaryLayer } from '../locate/boundaryLayer.ts';
import { probeLine } from '../locate/lineProbe.ts';
import { lineStats } from '../locate/lineStats.ts';
import { probePoints } from '../locate/pointProbe.ts';
import { addQuantity, fail, fmt6, vecText, type EvalContext, type ProbeOutcome } from './outcome.ts';
import type { LineProbe, PointProbe } from './probeSet.ts';
import { SI } from './units.ts';

/** Samples of a line probe when the set does not say (as the `line` verb). */
export const LINE_SAMPLES_DEFAULT = 101;

/** A line probe. */
export function evaluateLine(ctx: EvalContext, p: LineProbe, out: ProbeOutcome): void {
  const g = p.geometry, o = p.options ?? {};
  const crossings = o.spacing === 'cell-crossings';
  const samples = o.samples ?? LINE_SAMPLES_DEFAULT;
  const bl = o.boundaryLayer;
  let fields = p.fields?.sample;
  const velocity = bl?.velocity ?? 'velocity';
  if (bl && fields && !fields.includes(velocity)) fields = [...fields, velocity];
  out.definition = `line ${vecText(g.from)} → ${vecText(g.to)}, ${crossings ? 'samples at cell-face crossings' : `${samples} evenly spaced samples`}` +
    `${fields ? `, fields ${fields.join(', ')}` : ''}${bl ? '; starts on a wall (boundary layer)' : ''}`;
  out.anchor = g.to;
  const r = probeLine(ctx.dataset, ctx.si(g.from), ctx.si(g.to), {
    mode: crossings ? 'crossings' : 'samples', samples,
    ...(fields ? { fields } : {}), ...(o.tolerance !== undefined ? { tolerance: o.tolerance } : {}),
  });
  if (ctx.keepShapes) out.shapes = [{ kind: 'segment', from: g.from, to: g.to }];
  if (r.outside) { fail(out, 'the line lies wholly outside the mesh: no samples'); return; }
  const st = lineStats(r);
  addQuantity(out, 'length', 'L', r.length, SI.length);
  addQuantity(out, 'coveredLength', 'L inside the mesh', st.coveredLength, SI.length);
  for (const s of st.series) {
    const unit = ctx.fieldUnit(s.field);
    addQuantity(out, `${s.label}.mean`, `${s.label} mean`, s.stats.mean, unit);
    addQuantity(out, `${s.label}.min`, `${s.label} min`, s.stats.min, unit);
    addQuantity(out, `${s.label}.max`, `${s.label} max`, s.stats.max, unit);
  }
  if (st.gaps.length) out.notes.push(`${r.validCount} of ${r.count} samples inside the mesh; stretches outside: ${st.gaps.map((x) => `${fmt6(x.from)}…${fmt6(x.to)} m`).join(', ')}`);
  if (!bl) return;
  const b = boundaryLayer(r, {
    field: velocity, ...(bl.edge ? { edge: bl.edge } : {}), ...(bl.edgeFraction !== undefined ? { gradientFraction: bl.edgeFraction } : {}),
    ...(bl.direction ? { direction: bl.direction } : {}),
  });
  out.notes.push(`boundary layer: ${b.criterion}`, ...b.warnings);
  if (!b.ok) { fail(out, `boundary layer not available: ${b.reason}`); return; }
  const u = ctx.fieldUnit(velocity);
  addQuantity(out, 'boundaryLayer.edgeVelocity', 'U_e', b.edgeVelocity, u);
  addQuantity(out, 'boundaryLayer.delta99', 'δ99', b.delta99, SI.length);
  addQuantity(out, 'boundaryLayer.displacementThickness', 'δ*', b.displacementThickness, SI.length);
  addQuantity(out, 'boundaryLayer.momentumThickness', 'θ', b.momentumThickness, SI.length);
  addQuantity(out, 'boundaryLayer.shapeFactor', 'H = δ*/θ', b.shapeFactor, SI.dimensionless);
}

/** A point probe. */
export function evaluatePoint(ctx: EvalContext, p: PointProbe, out: ProbeOutcome): void {
  const at = p.geometry.at;
  const fields = p.fields?.sample;
  out.definition = `point ${vecText(at)}${fields ? `, fields ${fields.join(', ')}` : ''}`;
  out.anchor = at;
  if (ctx.keepShapes) out.shapes = [{ kind: 'point', at }];
  const r = probePoints(ctx.dataset, ctx.si(at), {
    ...(fields ? { fields } : {}), ...(p.options?.tolerance !== undefined ? { tolerance: p.options.tolerance } : {}),
  });
  if (!r.valid[0]) { fail(out, 'the point lies outside the mesh: no values'); return; }
  for (const f of r.fields) {
    const unit = ctx.fieldUnit(f.name);
    f.columns.forEach((c, k) => addQuantity(out, f.labels[k]!, f.labels[k]!, c[0], unit));
    if (f.components > 1) addQuantity(out, `|${f.name}|`, `|${f.name}|`, Math.hypot(...f.columns.map((c) => c[0]!)), unit);
    if (f.association === 'cell') out.notes.push(`${f.name} is cell data: the value of the cell holding the point`);
  }
}
