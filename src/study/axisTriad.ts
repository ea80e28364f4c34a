/**
 * The axis triad: which way x, y and z point in a picture. Pure geometry and SVG text, shared by the view
 * (src/ui/axisTriad.ts), the app's exported pictures and the command line's report pictures.
 *
 * Our own look: a small pale plate; each axis a short line from a common hub ending in a round tag with its
 * letter; an axis pointing away from the viewer is drawn dashed and fainter, and arms are drawn back to
 * front so the nearest stays on top. Colours are ours (amber x, teal y, violet z).
 */

export type Vec3 = readonly [number, number, number];

/** The picture's camera as three unit vectors in world axes: right and up on the picture, forward into it. */
export interface ViewBasis {
  readonly right: Vec3;
  readonly up: Vec3;
  readonly forward: Vec3;
}

/** One arm: unit-length offset on the picture (x right, y down), and whether it points away from the viewer. */
export interface TriadArm {
  readonly axis: 'x' | 'y' | 'z';
  readonly dx: number;
  readonly dy: number;
  /** Component along the view direction (> 0: into the picture). */
  readonly depth: number;
  readonly away: boolean;
}

/** Sizes (CSS pixels at scale 1) and colours of the triad. */
export const TRIAD_STYLE = {
  /** Side of the square the triad fills. */
  size: 76,
  /** Arm length from the hub to the tag centre. */
  arm: 25,
  tagRadius: 7,
  plate: 'rgba(248,250,252,0.85)',
  plateBorder: '#cbd5e1',
  hub: '#334155',
  colors: { x: '#b45309', y: '#0f766e', z: '#6d28d9' } as Readonly<Record<'x' | 'y' | 'z', string>>,
  /** Gap between the triad and the picture's edge. */
  margin: 12,
} as const;

/** The three arms, back to front (the one pointing furthest into the picture first). */
export function triadArms(b: ViewBasis): TriadArm[] {
  const arms: TriadArm[] = (['x', 'y', 'z'] as const).map((axis, k) => {
    const depth = b.forward[k]!;
    return { axis, dx: b.right[k]!, dy: -b.up[k]!, depth, away: depth > 1e-6 };
  });
  return arms.sort((p, q) => q.depth - p.depth);
}

/** The view basis of a camera looking from `eye` at `target` with `up` (as src/study/rasterise.ts builds it). */
export function basisOf(eye: Vec3, target: Vec3, up: Vec3): ViewBasis {
  const f = unit([target[0] - eye[0], target[1] - eye[1], target[2] - eye[2]]);
  let r = cross(f, up);
  if (Math.hypot(...r) < 1e-9) r = cross(f, Math.abs(f[2]) < 0.9 ? [0, 0, 1] : [0, 1, 0]);
  const right = unit(r);
  return { right, up: cross(right, f), forward: f };
}

/** The triad's square (pixels) in the bottom-right corner of a `width` × `height` picture, above `bottomClear` pixels. */
export function triadBox(width: number, height: number, scale = 1, bottomClear = 0): { x: number; y: number; width: number; height: number } {
  const s = TRIAD_STYLE.size * scale, m = TRIAD_STYLE.margin * scale;
  return { x: width - m - s, y: height - m - s - bottomClear, width: s, height: s };
}

/** The triad as an SVG `<g>` filling the square at (x, y) of side `TRIAD_STYLE.size × scale`. */
export function triadSvg(b: ViewBasis, x: number, y: number, scale = 1): string {
  const S = TRIAD_STYLE, s = S.size * scale, cx = x + s / 2, cy = y + s / 2, L = S.arm * scale, R = S.tagRadius * scale;
  const f = (v: number) => v.toFixed(1);
  const parts = [`<g class="axis-triad">`,
    `<rect x="${f(x)}" y="${f(y)}" width="${f(s)}" height="${f(s)}" rx="${f(8 * scale)}" fill="${S.plate}" stroke="${S.plateBorder}"/>`];
  for (const a of triadArms(b)) {
    const c = S.colors[a.axis], ex = cx + a.dx * L, ey = cy + a.dy * L, op = a.away ? 0.55 : 1;
    parts.push(`<g data-axis="${a.axis}" opacity="${op}">`,
      `<line x1="${f(cx)}" y1="${f(cy)}" x2="${f(ex)}" y2="${f(ey)}" stroke="${c}" stroke-width="${f(2.5 * scale)}" stroke-linecap="round"${a.away ? ` stroke-dasharray="${f(3 * scale)} ${f(3 * scale)}"` : ''}/>`,
      `<circle cx="${f(ex)}" cy="${f(ey)}" r="${f(R)}" fill="${a.away ? 'white' : c}" stroke="${c}" stroke-width="${f(1.5 * scale)}"/>`,
      `<text x="${f(ex)}" y="${f(ey + 3.8 * scale)}" text-anchor="middle" font-size="${f(10.5 * scale)}" font-weight="700" fill="${a.away ? c : 'white'}">${a.axis}</text>`,
      '</g>');
  }
  parts.push(`<circle cx="${f(cx)}" cy="${f(cy)}" r="${f(2.5 * scale)}" fill="${S.hub}"/>`, '</g>');
  return parts.join('');
}

function unit(v: readonly number[]): [number, number, number] {
  const l = Math.hypot(v[0]!, v[1]!, v[2]!) || 1;
  return [v[0]! / l, v[1]! / l, v[2]! / l];
}
function cross(a: readonly number[], b: readonly number[]): [number, number, number] {
  return [a[1]! * b[2]! - a[2]! * b[1]!, a[2]! * b[0]! - a[0]! * b[2]!, a[0]! * b[1]! - a[1]! * b[0]!];
}
