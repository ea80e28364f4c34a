/**
 * An iso-surface probe's triangles for the view: the evaluated outcome's triangle shape (file length unit)
 * as non-indexed drawing arrays with per-triangle normals and the colour field's values (its component, or
 * the magnitude), in the layout of `src/surface/surfaceDrawing.ts`.
 */
import type { FieldChoice, TriangleDrawing, DrawingValues } from '../surface/surfaceDrawing.ts';
import { drawTriangleSet } from '../surface/surfaceDrawing.ts';
import type { ProbeOutcome } from '../study/outcome.ts';

const SUFFIX = /^(.*)_(x|y|z|\d+)$/;

/** The colour choice of a colour-by spec on the shape's fields (the field it names, its component or −1). */
export function colourChoice(spec: string | undefined, fields: readonly { name: string; association: 'point' | 'cell'; components: number }[]): FieldChoice | undefined {
  if (!spec) return undefined;
  const bare = spec.replace(/^(point|cell):/, '');
  const direct = fields.find((f) => f.name === bare);
  if (direct) return { name: direct.name, association: direct.association, component: -1 };
  const m = SUFFIX.exec(bare);
  const base = m ? fields.find((f) => f.name === m[1]) : undefined;
  if (!m || !base) return undefined;
  const s = m[2]!;
  return { name: base.name, association: base.association, component: s === 'x' ? 0 : s === 'y' ? 1 : s === 'z' ? 2 : Number(s) };
}

/** Drawing arrays of the outcome's iso triangles, or null when it has none. */
export function isoDrawing(o: ProbeOutcome, colourBy: string | undefined): (TriangleDrawing & DrawingValues) | null {
  const shape = o.shapes?.find((s) => s.kind === 'triangles');
  if (!shape || shape.kind !== 'triangles' || shape.set.indices.length === 0) return null;
  const set = shape.set;
  const d = drawTriangleSet(set, [0, 0, 1], colourChoice(colourBy, set.fields));
  // An iso-surface is curved: each triangle gets its own normal for the lighting.
  const p = d.positions, n = d.normals;
  for (let t = 0; t < p.length / 9; t++) {
    const o9 = 9 * t;
    const ux = p[o9 + 3]! - p[o9]!, uy = p[o9 + 4]! - p[o9 + 1]!, uz = p[o9 + 5]! - p[o9 + 2]!;
    const vx = p[o9 + 6]! - p[o9]!, vy = p[o9 + 7]! - p[o9 + 1]!, vz = p[o9 + 8]! - p[o9 + 2]!;
    let nx = uy * vz - uz * vy, ny = uz * vx - ux * vz, nz = ux * vy - uy * vx;
    const l = Math.hypot(nx, ny, nz) || 1;
    nx /= l; ny /= l; nz /= l;
    for (let j = 0; j < 3; j++) { n[o9 + 3 * j] = nx; n[o9 + 3 * j + 1] = ny; n[o9 + 3 * j + 2] = nz; }
  }
  return d;
}
