/**
 * The headline numbers of an iso-surface as plain JSON (no typed arrays), shared by the `iso-surface` verb,
 * the `iso` probe kind and the app's pin. Units: area L², volume L³, line length L (L the file's length unit,
 * m for SI files); the iso value and colour statistics in their field's unit.
 */
import type { IsoSurface } from './isoSurface.ts';

/** JSON summary of one iso-surface. */
export interface IsoSummary {
  field: string;
  value: number;
  triangles: number;
  area: number;
  closed: boolean;
  /** Enclosed volume when closed, else null (see `openReason`). */
  volume: number | null;
  enclosed: 'below' | 'above' | null;
  openReason: string | null;
  boundaryEdges: number;
  lineLength: number;
  pieces: { triangles: number; area: number; closed: boolean; boundaryEdges: number; volume: number | null; enclosed: 'below' | 'above' | null }[];
  colour: { field: string; min: number; max: number; mean: number } | null;
}

/** Summary of `s` (pieces in order of their first triangle). */
export function isoSummary(s: IsoSurface): IsoSummary {
  return {
    field: s.field.label, value: s.value, triangles: s.indices.length / 3, area: s.area, closed: s.closed,
    volume: s.volume, enclosed: s.enclosed, openReason: s.openReason, boundaryEdges: s.boundaryEdges, lineLength: s.lineLength,
    pieces: s.pieces.map((p) => ({ triangles: p.triangles, area: p.area, closed: p.closed, boundaryEdges: p.boundaryEdges, volume: p.volume, enclosed: p.enclosed })),
    colour: s.colour ? { field: s.colour.label, min: s.colour.min, max: s.colour.max, mean: s.colour.mean } : null,
  };
}

/** One sentence on what the volume is: "encloses the region where p < 10" or the open reason. */
export function volumeSentence(s: Pick<IsoSummary, 'closed' | 'enclosed' | 'field' | 'value' | 'openReason'>): string {
  if (!s.closed) return s.openReason ?? 'open';
  return `closed: encloses the region where ${s.field} ${s.enclosed === 'below' ? '<' : '>'} ${s.value}`;
}
