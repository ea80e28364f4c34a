/**
 * The command line's picture of a result file for a report, made without a browser: the boundary
 * surface coloured by a field with the viewer's colour map (`src/view/colorMaps.ts`), the probes' cuts,
 * lines and points, rendered by the software rasteriser (`src/study/rasterise.ts`) and encoded as PNG;
 * pins and legend as an SVG overlay (`src/ui/reportOverlay.ts`) so their text stays crisp. It frames the
 * view as the viewer opens a file: isometric, outer boundaries that enclose a body hidden, surfaces made
 * see-through when probes lie inside them.
 */
import type { Dataset } from '../model/dataset.ts';
import { findField } from '../model/piece.ts';
import type { ProbeOutcome, SetEvaluation } from '../study/evaluate.ts';
import { encodePng } from '../study/pngEncode.ts';
import type { ReportPicture } from '../study/reportHtml.ts';
import { fitCamera, projection, rasterise, type Mark, type TriangleLayer } from '../study/rasterise.ts';
import { headline } from '../study/resultTables.ts';
import { unitByName } from '../study/units.ts';
import type { UnitsDoc } from '../study/probeSet.ts';
import { getBoundaryFaces, getSurfaceGroups } from '../surface/surfaceCache.ts';
import { overlaySvg, pinRow, type OverlayPin } from '../ui/reportOverlay.ts';
import { DEFAULT_COLOR_MAP, colorMap } from '../view/colorMaps.ts';
import { basisOf } from '../study/axisTriad.ts';
import { drawFaces, faceValues, surfaceCellFaces } from '../surface/surfaceDrawing.ts';
import type { FieldChoice } from '../surface/surfaceDrawing.ts';

/** Options of `reportPicture`. */
export interface PictureOptions {
  /** Pixels. Default 1200 × 800. */
  width: number;
  height: number;
  /** Colouring field `name`, `point:name`, `cell:name`, with `:x|:y|:z|:magnitude` for a vector part; default: a pressure field, else the first. */
  color: string | undefined;
  /** Picture file name in the report folder. */
  file: string;
}

export const PICTURE_DEFAULTS: PictureOptions = { width: 1200, height: 800, color: undefined, file: 'view.png' };

/** Colour of line probes and points (the viewer's accent). */
const MARK_RGB: [number, number, number] = [0x1d, 0x4e, 0xd8];

/** The field to colour by (see `PictureOptions.color`), or undefined when the file has none. */
export function colorChoice(d: Dataset, spec: string | undefined): FieldChoice | undefined {
  const p0 = d.pieces[0];
  if (!p0) return undefined;
  const all = [...p0.pointData, ...p0.cellData].filter((f) => f.components <= 3 && d.pieces.every((p) => findField(p, f.name, f.association as 'point' | 'cell')));
  if (spec === undefined) {
    const f = all.find((x) => /^p$|pressure/i.test(x.name)) ?? all[0];
    return f ? { name: f.name, association: f.association as 'point' | 'cell', component: f.components === 1 ? 0 : -1 } : undefined;
  }
  const m = /^(?:(point|cell):)?(.+?)(?::(x|y|z|magnitude))?$/.exec(spec)!;
  const f = all.find((x) => x.name === m[2] && (!m[1] || x.association === m[1]));
  if (!f) throw new Error(`--color: no field "${spec}" to colour by (fields: ${all.map((x) => `${x.name} (${x.association})`).join(', ') || 'none'})`);
  const component = f.components === 1 ? 0 : m[3] && m[3] !== 'magnitude' ? 'xyz'.indexOf(m[3]) : -1;
  return { name: f.name, association: f.association as 'point' | 'cell', component };
}

/** Values of the colouring field on a cut's triangles, in drawing order (NaN when the cut lacks the field). */
function cutValues(shape: Extract<NonNullable<ProbeOutcome['shapes']>[number], { kind: 'triangles' }>, c: FieldChoice | undefined): { positions: Float64Array; values: Float32Array | null } {
  const s = shape.set, nt = s.indices.length / 3;
  const positions = new Float64Array(9 * nt);
  for (let t = 0; t < nt; t++) for (let j = 0; j < 3; j++) {
    const v = s.indices[3 * t + j]!;
    positions[9 * t + 3 * j] = s.positions[3 * v]!; positions[9 * t + 3 * j + 1] = s.positions[3 * v + 1]!; positions[9 * t + 3 * j + 2] = s.positions[3 * v + 2]!;
  }
  const f = c ? s.fields.find((x) => x.name === c.name && x.association === c.association) : undefined;
  if (!c || !f) return { positions, values: null };
  const values = new Float32Array(3 * nt), nc = f.components;
  const at = (i: number): number => {
    if (nc === 1) return f.values[i]!;
    if (c.component >= 0) return f.values[i * nc + c.component]!;
    let q = 0;
    for (let k = 0; k < nc; k++) q += f.values[i * nc + k]! ** 2;
    return Math.sqrt(q);
  };
  for (let t = 0; t < nt; t++) for (let j = 0; j < 3; j++) values[3 * t + j] = at(f.association === 'point' ? s.indices[3 * t + j]! : t);
  return { positions, values };
}

type Box = [number, number, number, number, number, number];

/** Groups hidden at first, as the viewer does: outer boundaries enclosing another group. */
function enclosing(groupBounds: readonly Box[], all: Box): Set<number> {
  const tol = 1e-6 * Math.hypot(all[1] - all[0], all[3] - all[2], all[5] - all[4]);
  const touchesAll = (g: Box) => [0, 1, 2, 3, 4, 5].every((i) => Math.abs(g[i]! - all[i]!) <= tol);
  const inside = (g: Box) => [0, 2, 4].every((i) => g[i]! > all[i]! + tol) && [1, 3, 5].every((i) => g[i]! < all[i]! - tol);
  const hasInner = groupBounds.some(inside);
  return new Set(hasInner ? groupBounds.map((g, i) => (touchesAll(g) ? i : -1)).filter((i) => i >= 0) : []);
}

function boxOf(P: ArrayLike<number>): Box {
  const b: Box = [Infinity, -Infinity, Infinity, -Infinity, Infinity, -Infinity];
  for (let i = 0; i < P.length; i += 3) {
    const x = P[i]!, y = P[i + 1]!, z = P[i + 2]!;
    if (x < b[0]) b[0] = x; if (x > b[1]) b[1] = x; if (y < b[2]) b[2] = y; if (y > b[3]) b[3] = y; if (z < b[4]) b[4] = z; if (z > b[5]) b[5] = z;
  }
  return b;
}

/** Renders the picture of one file with its probes (the evaluation must be made with `keepShapes`). */
export function reportPicture(d: Dataset, ev: SetEvaluation, units: UnitsDoc | undefined, options: Partial<PictureOptions> = {}): ReportPicture {
  const o = { ...PICTURE_DEFAULTS, ...options };
  const choice = colorChoice(d, o.color);
  const bf = getBoundaryFaces(d);
  let faces, faceGroup: Int32Array | null = null, hidden = new Set<number>(), groupBoxes: Box[] = [];
  if (bf.count > 0) {
    const groups = getSurfaceGroups(d);
    faces = bf; faceGroup = groups.faceGroup;
    groupBoxes = groups.groups.map((g) => [...g.bounds] as Box);
    const all = groupBoxes.reduce<Box>((a, g) => [Math.min(a[0], g[0]), Math.max(a[1], g[1]), Math.min(a[2], g[2]), Math.max(a[3], g[3]), Math.min(a[4], g[4]), Math.max(a[5], g[5])],
      [Infinity, -Infinity, Infinity, -Infinity, Infinity, -Infinity]);
    hidden = enclosing(groupBoxes, all);
  } else faces = surfaceCellFaces(d);
  const drawing = drawFaces(d, faces, faceGroup);
  const vals = choice ? faceValues(d, faces, choice) : null;
  // keep the shown groups' triangles only
  const nt = drawing.positions.length / 9;
  let kept = 0;
  const pos = new Float64Array(drawing.positions.length), val = vals ? new Float32Array(vals.values.length) : null;
  for (let t = 0; t < nt; t++) {
    if (hidden.has(drawing.groups[3 * t]!)) continue;
    for (let k = 0; k < 9; k++) pos[9 * kept + k] = drawing.positions[9 * t + k]!;
    if (val) for (let k = 0; k < 3; k++) val[3 * kept + k] = vals!.values[3 * t + k]!;
    kept++;
  }
  const surfPos = pos.subarray(0, 9 * kept), surfVal = val ? val.subarray(0, 3 * kept) : null;
  let lo = Infinity, hi = -Infinity;
  if (surfVal) for (const v of surfVal) { if (v < lo) lo = v; if (v > hi) hi = v; }
  const map = colorMap(DEFAULT_COLOR_MAP);
  const range: [number, number] = Number.isFinite(lo) ? [lo, hi > lo ? hi : lo + 1] : [0, 1];

  const layers: TriangleLayer[] = [], marks: Mark[] = [];
  let cuts = false;
  const box = boxOf(surfPos.length ? surfPos : drawing.positions);
  const grow = (x: number, y: number, z: number) => {
    box[0] = Math.min(box[0], x); box[1] = Math.max(box[1], x); box[2] = Math.min(box[2], y); box[3] = Math.max(box[3], y); box[4] = Math.min(box[4], z); box[5] = Math.max(box[5], z);
  };
  // a failed probe is not drawn (a point outside the mesh would only stretch the frame)
  for (const p of ev.probes) for (const s of p.ok ? p.shapes ?? [] : []) {
    if (s.kind === 'triangles') { const c = cutValues(s, choice); layers.push({ positions: c.positions, values: c.values, color: [147, 197, 253] }); cuts = true; }
    else if (s.kind === 'segment') { marks.push({ from: s.from, to: s.to, color: MARK_RGB, width: 2.5 }); grow(...s.from); grow(...s.to); }
    else { marks.push({ from: s.at, to: s.at, color: MARK_RGB, width: 7 }); grow(...s.at); }
  }
  // a cut lies inside the walls: let it show through, as the viewer does when a plane is added
  layers.push({ positions: surfPos, values: surfVal, opacity: cuts ? 0.35 : 1 });
  const cam = fitCamera(box, o.width, o.height);
  const rgba = rasterise(cam, layers, marks, { colors: map.colors, range });
  const proj = projection(cam);
  const pins: OverlayPin[] = [];
  let outside = 0;
  for (const p of ev.probes) {
    if (!p.anchor) continue;
    const a = proj.project(...p.anchor);
    if (a.behind || a.x < 0 || a.y < 0 || a.x > o.width || a.y > o.height) { outside++; continue; }
    const rows = p.ok ? headline(p, 3).map((q) => pinRow(q.label, q.value, q.unit)) : [`FAILED: ${(p.error ?? '').slice(0, 60)}`];
    pins.push({ id: p.id, x: a.x, y: a.y, title: p.label, rows });
  }
  const unit = choice ? units?.fields?.[choice.name] ?? unitByName(choice.name) : '';
  const comps = choice ? findField(d.pieces[0]!, choice.name, choice.association)?.components ?? 1 : 1;
  const part = !choice || comps === 1 ? '' : choice.component >= 0 ? ` (${'xyz'[choice.component]})` : ' (magnitude)';
  const legend = choice ? { title: `${choice.name}${part}`, unit, range, map } : null;
  return {
    file: o.file, png: encodePng(o.width, o.height, rgba), width: o.width, height: o.height,
    caption: `${ev.source}: boundary surfaces${choice ? ` coloured by ${choice.name}${part}` : ''}, isometric view, with the probes and their first numbers (software rendering)` +
      `${hidden.size ? '; outer boundary hidden' : ''}${outside ? `; ${outside} probe${outside > 1 ? 's' : ''} outside the picture (see the tables)` : ''}`,
    overlay: overlaySvg(o.width, o.height, pins, legend, basisOf(cam.eye, cam.target, cam.up)),
  };
}
