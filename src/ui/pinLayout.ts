/**
 * Where pins go on screen: each pin is a box of text tied to an anchor point (the probe's position,
 * projected) by a leader line. Boxes must not cover each other nor leave the view. Deterministic:
 * the same anchors and sizes always give the same layout, so a picture can be reproduced.
 * Pure: no DOM (the overlay and the PNG export both use it).
 */

/** One pin to place: the anchor in pixels (origin top-left) and the box size in pixels. */
export interface PinBox {
  id: string;
  anchorX: number;
  anchorY: number;
  width: number;
  height: number;
  /** Placed by hand: the box's top-left corner relative to the anchor (pixels); kept (inside the view), and the others avoid it. */
  offset?: [number, number];
}

/** A placed pin: the box's top-left corner, and whether its anchor is in front of the camera and on screen. */
export interface PlacedPin {
  id: string;
  x: number;
  y: number;
  anchorX: number;
  anchorY: number;
  width: number;
  height: number;
}

export interface PinLayoutOptions {
  /** Distance in pixels from the anchor to the nearest box corner at the first try (default 28). */
  offset: number;
  /** Gap in pixels kept between boxes (default 6). */
  gap: number;
  /** Margin in pixels kept from the view's edges (default 8). */
  margin: number;
  /** Rings of candidate positions tried before giving up and accepting an overlap (default 12). */
  rings: number;
  /** Boxes no pin may cover: the legend, the footer with the file name and the caution, the view's buttons (pixels). */
  obstacles: readonly Rect[];
}

/** A rectangle in pixels (origin top-left). */
export interface Rect {
  x: number;
  y: number;
  width: number;
  height: number;
}

export const DEFAULT_PIN_LAYOUT: PinLayoutOptions = { offset: 28, gap: 6, margin: 8, rings: 12, obstacles: [] };

/** Candidate directions, tried in this order: up-right first (reads naturally beside the geometry). */
const DIRECTIONS: readonly (readonly [number, number])[] = [
  [1, -1], [-1, -1], [1, 1], [-1, 1], [1, 0], [-1, 0], [0, -1], [0, 1],
];

function overlaps(ax: number, ay: number, aw: number, ah: number, b: Rect, gap: number): boolean {
  return ax < b.x + b.width + gap && b.x < ax + aw + gap && ay < b.y + b.height + gap && b.y < ay + ah + gap;
}

/**
 * Places the pins in id order, each at the first candidate position (rings of growing distance around
 * its anchor, eight directions per ring) that keeps it inside the view and clear of the pins already
 * placed and of the obstacles. A pin that finds no free place keeps its first in-view candidate.
 * An anchor off the view is first brought to the view's edge (`edgeAnchor`), where its marker goes.
 */
export function layoutPins(pins: readonly PinBox[], viewWidth: number, viewHeight: number, options: Partial<PinLayoutOptions> = {}): PlacedPin[] {
  const o = { ...DEFAULT_PIN_LAYOUT, ...options };
  const placed: PlacedPin[] = [];
  const order = [...pins].sort((a, b) => (a.id < b.id ? -1 : a.id > b.id ? 1 : 0));
  const clampX = (x: number, w: number) => Math.min(Math.max(x, o.margin), Math.max(o.margin, viewWidth - o.margin - w));
  const clampY = (y: number, h: number) => Math.min(Math.max(y, o.margin), Math.max(o.margin, viewHeight - o.margin - h));
  // pins placed by hand first, where they were put
  for (const p of order) {
    if (!p.offset) continue;
    placed.push({ id: p.id, x: clampX(p.anchorX + p.offset[0], p.width), y: clampY(p.anchorY + p.offset[1], p.height), anchorX: p.anchorX, anchorY: p.anchorY, width: p.width, height: p.height });
  }
  for (const p of order) {
    if (p.offset) continue;
    let chosen: [number, number] | undefined, fallback: [number, number] | undefined;
    for (let ring = 0; ring < o.rings && !chosen; ring++) {
      const d = o.offset * (1 + ring * 0.75);
      for (const [dx, dy] of DIRECTIONS) {
        // box corner nearest the anchor sits at distance d along the direction
        let x = dx > 0 ? p.anchorX + d : dx < 0 ? p.anchorX - d - p.width : p.anchorX - p.width / 2;
        let y = dy > 0 ? p.anchorY + d : dy < 0 ? p.anchorY - d - p.height : p.anchorY - p.height / 2;
        x = Math.min(Math.max(x, o.margin), Math.max(o.margin, viewWidth - o.margin - p.width));
        y = Math.min(Math.max(y, o.margin), Math.max(o.margin, viewHeight - o.margin - p.height));
        fallback ??= [x, y];
        if (!placed.some((q) => overlaps(x, y, p.width, p.height, q, o.gap)) && !o.obstacles.some((q) => overlaps(x, y, p.width, p.height, q, o.gap))) { chosen = [x, y]; break; }
      }
    }
    const [x, y] = chosen ?? fallback!;
    placed.push({ id: p.id, x, y, anchorX: p.anchorX, anchorY: p.anchorY, width: p.width, height: p.height });
  }
  // in id order, as before
  return placed.sort((a, b) => (a.id < b.id ? -1 : a.id > b.id ? 1 : 0));
}

/**
 * The point on a box's outline where a leader line from the anchor should end: the box edge point
 * nearest the anchor (so lines stay short and never cross their own box).
 */
export function leaderEnd(p: PlacedPin): [number, number] {
  const x = Math.min(Math.max(p.anchorX, p.x), p.x + p.width);
  const y = Math.min(Math.max(p.anchorY, p.y), p.y + p.height);
  return [x, y];
}

/**
 * Where an anchor off the view is marked: the point on the view's edge (inset by `inset`) along the line
 * from the view's centre towards the anchor, and the direction it points in (unit vector); an anchor in
 * view is returned as it is with no direction.
 */
export function edgeAnchor(x: number, y: number, width: number, height: number, inset = 10): { x: number; y: number; dir: [number, number] | null } {
  if (x >= 0 && x <= width && y >= 0 && y <= height) return { x, y, dir: null };
  const cx = width / 2, cy = height / 2, dx = x - cx, dy = y - cy;
  const hx = Math.max(1, cx - inset), hy = Math.max(1, cy - inset);
  const t = Math.min(dx !== 0 ? hx / Math.abs(dx) : Infinity, dy !== 0 ? hy / Math.abs(dy) : Infinity);
  const n = Math.hypot(dx, dy) || 1;
  return { x: cx + dx * t, y: cy + dy * t, dir: [dx / n, dy / n] };
}
