/**
 * The iso-surface probe of a probe set: the surface where a field equals a value on the SI dataset — the same
 * compute path as the `iso-surface` verb (`isoSurfaces`, src/iso/). Derived fields named by the probe (also
 * with a component suffix) are attached here. Quantities: area (m²), enclosed volume (m³, only when closed),
 * pieces, iso-line length on 2D cells (m), and the colour field's min, max and area-weighted mean in its unit.
 */
import { DERIVED_UNITS, isDerivedName, withDerivedFields } from '../derive/derivedFields.ts';
import { isoSurfaces } from '../iso/isoSurface.ts';
import { volumeSentence } from '../iso/isoSummary.ts';
import type { TriangleSet } from '../cut/triangleSet.ts';
import { addQuantity, fail, fmt6, type EvalContext, type ProbeOutcome } from './outcome.ts';
import type { IsoProbe } from './probeSet.ts';
import { SI } from './units.ts';

const SUFFIX = /^(.*)_(x|y|z|\d+)$/;
const bare = (spec: string): string => spec.replace(/^(point|cell):/, '');

/** The array a spec reads (without association prefix or component suffix, when that names a derived field). */
function baseName(spec: string): string {
  const b = bare(spec), m = SUFFIX.exec(b);
  return m && isDerivedName(m[1]!) ? m[1]! : b;
}

/** SI unit of the values of `spec`: a derived field's unit, else the set's unit of the array. */
function unitOf(ctx: EvalContext, spec: string): string {
  const b = baseName(spec), m = SUFFIX.exec(bare(spec));
  if (isDerivedName(b)) return DERIVED_UNITS[b];
  return ctx.fieldUnit(m && ctx.fieldUnit(bare(spec)) === 'undeclared' ? m[1]! : bare(spec));
}

/** The iso-surface of the probe's field at its value. */
export function evaluateIso(ctx: EvalContext, p: IsoProbe, out: ProbeOutcome): void {
  const { field, value } = p.geometry, colourBy = p.fields?.colourBy;
  const names = [field, ...(colourBy ? [colourBy] : [])].flatMap((s) => [bare(s), baseName(s)]);
  const d = withDerivedFields(ctx.dataset, names);
  const [s] = isoSurfaces(d, { field, values: [value], ...(colourBy ? { colourBy } : {}) });
  const iso = s!, unit = unitOf(ctx, field);
  out.definition = `iso-surface ${iso.field.label} = ${fmt6(value)}${unit === '1' ? '' : ` ${unit}`}: each cell split into tetrahedra (a vertex mean added for non-tetrahedra) and cut where the linear interpolant equals the value${colourBy ? `; coloured by ${colourBy}` : ''}`;
  if (iso.empty) { fail(out, `iso-surface ${iso.field.label} = ${fmt6(value)}: ${iso.openReason}`); return; }
  addQuantity(out, 'area', 'A', iso.area, SI.area);
  addQuantity(out, 'volume', 'V enclosed', iso.volume, 'm³');
  addQuantity(out, 'pieces', 'pieces', iso.pieces.length, SI.dimensionless);
  if (iso.lineLength > 0) addQuantity(out, 'lineLength', 'iso-line length', iso.lineLength, SI.length);
  if (!iso.closed) addQuantity(out, 'boundaryEdges', 'open edges', iso.boundaryEdges, SI.dimensionless);
  if (iso.colour && colourBy) {
    const cu = unitOf(ctx, colourBy);
    addQuantity(out, 'colour.mean', `${iso.colour.label} mean`, iso.colour.mean, cu);
    addQuantity(out, 'colour.min', `${iso.colour.label} min`, iso.colour.min, cu);
    addQuantity(out, 'colour.max', `${iso.colour.label} max`, iso.colour.max, cu);
  }
  out.notes.push(volumeSentence({ closed: iso.closed, enclosed: iso.enclosed, field: iso.field.label, value, openReason: iso.openReason }));
  // Pin: the vertex nearest the centre of the largest piece's bounds (a point on the surface).
  const big = iso.pieces.reduce((a, b) => (b.area > a.area ? b : a), iso.pieces[0] ?? { bounds: [0, 0, 0, 0, 0, 0] as const, area: 0 });
  const c = [0, 1, 2].map((j) => 0.5 * (big.bounds[2 * j]! + big.bounds[2 * j + 1]!));
  let best = 0, bestD = Infinity;
  for (let v = 0; v < iso.positions.length / 3; v++) {
    const dd = (iso.positions[3 * v]! - c[0]!) ** 2 + (iso.positions[3 * v + 1]! - c[1]!) ** 2 + (iso.positions[3 * v + 2]! - c[2]!) ** 2;
    if (dd < bestD) { bestD = dd; best = v; }
  }
  if (iso.positions.length) out.anchor = ctx.file([iso.positions[3 * best]!, iso.positions[3 * best + 1]!, iso.positions[3 * best + 2]!]);
  if (ctx.keepShapes) {
    const k = 1 / ctx.lengthFactor, pos = new Float64Array(iso.positions.length);
    for (let i = 0; i < pos.length; i++) pos[i] = iso.positions[i]! * k;
    const set: TriangleSet = { positions: pos, indices: iso.indices, sourceCell: iso.sourceCell, fields: iso.fields };
    out.shapes = [{ kind: 'triangles', set }];
  }
}
