/**
 * Iso-surfaces: the surface where a field takes a value, as a welded triangle set with its area, its
 * connected pieces and, when closed, the volume it encloses; on 2D cells the iso-lines with their length.
 * The extraction is `isoExtract.ts`; the measures `surfaceMeasures.ts`; other fields on it `isoFields.ts`.
 *
 * Orientation: triangle normals point towards increasing field values, so a closed piece encloses the
 * region where the field is below the value when its signed volume is positive, above it when negative.
 */
import { ExactPointIndex } from '../cut/pointKey.ts';
import type { SurfaceField, TriangleSet } from '../cut/triangleSet.ts';
import { pieceOfCell, pointStarts, totalCells, type Dataset } from '../model/dataset.ts';
import { cellFieldOnIso, pointFieldOnIso, type IsoProvenance } from './isoFields.ts';
import { extractIso } from './isoExtract.ts';
import { pointScalars, resolveScalar, scalarOf, type ScalarSource } from './isoField.ts';
import { measureSurface } from './surfaceMeasures.ts';

/** Options of `isoSurfaces`. */
export interface IsoOptions {
  /** Field spec: a name (vector → magnitude), `NAME_x`/`_y`/`_z`/`_N` for a component, optional `point:`/`cell:` prefix. */
  field: string;
  /** Iso values, in the field's unit; at least one, finite. */
  values: readonly number[];
  /** Field spec to colour by (same rules), carried on the surface with its statistics. Default none. */
  colourBy?: string;
}

/** Which side of the value a closed piece encloses. */
export type EnclosedSide = 'below' | 'above';

/** One connected piece of an iso-surface. */
export interface IsoPiece {
  readonly triangles: number;
  /** Area (L², L the file's length unit). */
  readonly area: number;
  readonly closed: boolean;
  /** Edges used by one triangle only (where the surface meets the mesh boundary or a hole). */
  readonly boundaryEdges: number;
  /** Enclosed volume (L³) when closed, else null. */
  readonly volume: number | null;
  /** Whether the enclosed region holds values below or above the iso value; null when open. */
  readonly enclosed: EnclosedSide | null;
  readonly bounds: readonly [number, number, number, number, number, number];
}

/** Statistics of the colour field on the surface (its unit). */
export interface ColourStats {
  readonly label: string;
  readonly min: number;
  readonly max: number;
  /** Area-weighted mean over the triangles (length-weighted over the lines when there are no triangles). */
  readonly mean: number;
}

/** One iso-surface. Layout of the triangle set as in `triangleSet.ts`; vertices welded (shared by triangles). */
export interface IsoSurface extends TriangleSet {
  readonly field: ScalarSource;
  /** The iso value (field's unit). */
  readonly value: number;
  /** Vertex provenance: two end points per vertex (global point id, or −1 − g for cell g's vertex mean). */
  readonly vertexEnds: Int32Array;
  /** Parameter along the provenance edge per vertex. */
  readonly vertexT: Float64Array;
  /** Iso-line segments of 2D cells: two vertex numbers each. */
  readonly segments: Uint32Array;
  /** Global cell id of each segment. */
  readonly segmentCell: Int32Array;
  /** Total area of the triangles (L²). */
  readonly area: number;
  /** Total length of the iso-lines (L). */
  readonly lineLength: number;
  readonly pieces: readonly IsoPiece[];
  /** Every piece closed (and at least one triangle). */
  readonly closed: boolean;
  /** Sum of the pieces' boundary edges. */
  readonly boundaryEdges: number;
  /** Enclosed volume (L³) when closed (nested pieces subtract), else null. */
  readonly volume: number | null;
  readonly enclosed: EnclosedSide | null;
  /** Why the volume is not given, e.g. "open: 96 boundary edges"; null when closed. */
  readonly openReason: string | null;
  readonly colour: ColourStats | null;
  /** No triangle and no segment: the value is outside the field's range on the mesh. */
  readonly empty: boolean;
}

/**
 * Iso-surfaces of `opts.field` at each of `opts.values` on `d`. Throws a one-line error naming the field or the
 * value when the spec matches no field or a value is not finite. Derived fields must be attached first
 * (`withDerivedFields`).
 */
export function isoSurfaces(d: Dataset, opts: IsoOptions): IsoSurface[] {
  if (opts.values.length === 0) throw new Error(`iso field "${opts.field}": expected at least one iso value`);
  for (const v of opts.values) if (!Number.isFinite(v)) throw new Error(`iso field "${opts.field}": iso value ${v} is not a finite number`);
  const src = resolveScalar(d, opts.field);
  const colour = opts.colourBy ? resolveScalar(d, opts.colourBy) : undefined;
  const scalars = d.pieces.map((p) => pointScalars(p, src));
  return opts.values.map((v) => isoAt(d, src, scalars, v, colour));
}

function isoAt(d: Dataset, src: ScalarSource, scalars: readonly Float64Array[], value: number, colour?: ScalarSource): IsoSurface {
  const raw = extractIso(d, scalars, value);
  const nRaw = raw.t.length;
  const { vid, count: nv } = weldByEdge(d, raw.ends, nRaw);
  const positions = new Float64Array(3 * nv), vertexEnds = new Int32Array(2 * nv), vertexT = new Float64Array(nv);
  const filled = new Uint8Array(nv);
  for (let i = 0; i < nRaw; i++) {
    const v = vid[i]!;
    if (filled[v]) continue;
    filled[v] = 1;
    positions[3 * v] = raw.positions[3 * i]!; positions[3 * v + 1] = raw.positions[3 * i + 1]!; positions[3 * v + 2] = raw.positions[3 * i + 2]!;
    vertexEnds[2 * v] = raw.ends[2 * i]!; vertexEnds[2 * v + 1] = raw.ends[2 * i + 1]!; vertexT[v] = raw.t[i]!;
  }
  // A triangle repeating a vertex (only from degenerate cells) carries no area: dropped.
  const idx: number[] = [], cells: number[] = [];
  for (let tr = 0; tr < raw.triangles; tr++) {
    const a = vid[3 * tr]!, b = vid[3 * tr + 1]!, c = vid[3 * tr + 2]!;
    if (a === b || b === c || a === c) continue;
    idx.push(a, b, c); cells.push(raw.cells[tr]!);
  }
  const seg: number[] = [], segCells: number[] = [];
  let lineLength = 0;
  for (let s = 0; s < raw.segments; s++) {
    const a = vid[raw.triVertices + 2 * s]!, b = vid[raw.triVertices + 2 * s + 1]!;
    if (a === b) continue;
    seg.push(a, b); segCells.push(raw.cells[raw.triangles + s]!);
    lineLength += Math.hypot(positions[3 * a]! - positions[3 * b]!, positions[3 * a + 1]! - positions[3 * b + 1]!, positions[3 * a + 2]! - positions[3 * b + 2]!);
  }
  const indices = Uint32Array.from(idx), sourceCell = Int32Array.from(cells), segments = Uint32Array.from(seg);
  const m = measureSurface(positions, indices);
  const pieces: IsoPiece[] = m.pieces.map((p) => ({
    triangles: p.triangles, area: p.area, closed: p.closed, boundaryEdges: p.boundaryEdges,
    volume: p.signedVolume === null ? null : Math.abs(p.signedVolume),
    enclosed: p.signedVolume === null ? null : p.signedVolume >= 0 ? 'below' : 'above',
    bounds: p.bounds,
  }));
  const nt = indices.length / 3;
  const closed = nt > 0 && m.pieces.every((p) => p.closed);
  const boundaryEdges = m.pieces.reduce((s, p) => s + p.boundaryEdges, 0), bad = m.pieces.reduce((s, p) => s + p.badEdges, 0);
  const signed = closed ? m.pieces.reduce((s, p) => s + p.signedVolume!, 0) : null;
  let openReason: string | null = null;
  if (!closed) {
    if (nt === 0) openReason = segments.length > 0 ? 'iso-lines only (2D cells)' : 'no surface: the value is outside the field\'s range';
    else openReason = `open: ${boundaryEdges} boundary edge${boundaryEdges === 1 ? '' : 's'}${bad > 0 ? `, ${bad} edges not shared by exactly two consistently oriented triangles` : ''}`;
  }
  const prov: IsoProvenance = { ends: vertexEnds, t: vertexT, sourceCell, indices };
  const fields: SurfaceField[] = [];
  let stats: ColourStats | null = null;
  if (colour) {
    const f = colour.association === 'point' ? pointFieldOnIso(d, prov, colour.name) : cellFieldOnIso(d, prov, colour.name);
    fields.push(f);
    stats = colourStats(f, colour, positions, indices, segments);
  }
  return {
    positions, indices, sourceCell, fields, field: src, value, vertexEnds, vertexT, segments, segmentCell: Int32Array.from(segCells),
    area: m.area, lineLength, pieces, closed, boundaryEdges,
    volume: signed === null ? null : Math.abs(signed), enclosed: signed === null ? null : signed >= 0 ? 'below' : 'above',
    openReason, colour: stats, empty: nt === 0 && segments.length === 0,
  };
}

/**
 * Vertex numbers of the raw vertices, one per subdivision edge: an end point is a mesh point identified by
 * its exact position (so points repeated in several pieces are one), or a cell's vertex mean (its own).
 */
function weldByEdge(d: Dataset, ends: Int32Array, nRaw: number): { vid: Int32Array; count: number } {
  const pStarts = pointStarts(d), total = pStarts[pStarts.length - 1]!;
  const posId = d.pieces.length > 1 ? new Int32Array(total).fill(-1) : null;
  const index = posId ? new ExactPointIndex(Math.max(16, nRaw >> 1)) : null;
  const endKey = (e: number): number => {
    if (e < 0) return total + (-1 - e);
    if (!posId) return e;
    let id = posId[e]!;
    if (id < 0) {
      const k = pieceOfCell(pStarts, e), pts = d.pieces[k]!.points, j = 3 * (e - pStarts[k]!);
      id = posId[e] = index!.idOf(pts[j]!, pts[j + 1]!, pts[j + 2]!);
    }
    return id;
  };
  const span = total + totalCells(d) + 1;
  const map = new Map<number, number>();
  const vid = new Int32Array(nRaw);
  for (let i = 0; i < nRaw; i++) {
    const a = endKey(ends[2 * i]!), b = endKey(ends[2 * i + 1]!);
    const key = a < b ? a * span + b : b * span + a;
    let v = map.get(key);
    if (v === undefined) { v = map.size; map.set(key, v); }
    vid[i] = v;
  }
  return { vid, count: map.size };
}

function colourStats(f: SurfaceField, src: ScalarSource, pos: Float64Array, idx: Uint32Array, seg: Uint32Array): ColourStats {
  const tuples = f.values.length / f.components;
  const s = scalarOf(f.values, f.components, src.component, tuples);
  const label = src.association === 'cell' ? src.label.replace(' (cell data averaged to points)', ' (cell data)') : src.label;
  let min = Infinity, max = -Infinity, wSum = 0, vSum = 0;
  const nt = idx.length / 3;
  const take = (x: number): void => { if (x < min) min = x; if (x > max) max = x; };
  const len = (a: number, b: number): number => Math.hypot(pos[3 * a]! - pos[3 * b]!, pos[3 * a + 1]! - pos[3 * b + 1]!, pos[3 * a + 2]! - pos[3 * b + 2]!);
  for (let t = 0; t < nt; t++) {
    const a = idx[3 * t]!, b = idx[3 * t + 1]!, c = idx[3 * t + 2]!;
    const ux = pos[3 * b]! - pos[3 * a]!, uy = pos[3 * b + 1]! - pos[3 * a + 1]!, uz = pos[3 * b + 2]! - pos[3 * a + 2]!;
    const vx = pos[3 * c]! - pos[3 * a]!, vy = pos[3 * c + 1]! - pos[3 * a + 1]!, vz = pos[3 * c + 2]! - pos[3 * a + 2]!;
    const area = 0.5 * Math.hypot(uy * vz - uz * vy, uz * vx - ux * vz, ux * vy - uy * vx);
    // Linear over the triangle: its mean is the mean of the corner values.
    const mean = f.association === 'cell' ? s[t]! : (s[a]! + s[b]! + s[c]!) / 3;
    if (f.association === 'cell') take(s[t]!); else { take(s[a]!); take(s[b]!); take(s[c]!); }
    wSum += area; vSum += area * mean;
  }
  if (nt === 0 && f.association === 'point') {
    for (let i = 0; i < seg.length; i += 2) {
      const a = seg[i]!, b = seg[i + 1]!, l = len(a, b);
      take(s[a]!); take(s[b]!); wSum += l; vSum += l * 0.5 * (s[a]! + s[b]!);
    }
  }
  return { label, min: wSum > 0 ? min : NaN, max: wSum > 0 ? max : NaN, mean: wSum > 0 ? vSum / wSum : NaN };
}
