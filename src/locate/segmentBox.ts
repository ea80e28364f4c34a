/**
 * Whether a segment meets an axis-aligned box: the slab test (clip the segment's parameter interval against
 * each pair of planes in turn). Shared by the cell tree's walk along a line and the block scan of line
 * samples. Units: any length unit, the same for the box and the segment. Pure: no allocation.
 */

/** Whether p + τd, τ in [0, 1], meets the box (slab test; a zero direction component tests containment).
 * An empty box (min above max) or a box with a NaN bound meets nothing. */
export function segmentMeetsBox(x0: number, x1: number, y0: number, y1: number, z0: number, z1: number,
  px: number, py: number, pz: number, dx: number, dy: number, dz: number): boolean {
  if (!(x0 <= x1 && y0 <= y1 && z0 <= z1)) return false;
  let t0 = 0, t1 = 1;
  if (dx === 0) { if (px < x0 || px > x1) return false; } else {
    let a = (x0 - px) / dx, c = (x1 - px) / dx;
    if (a > c) { const s = a; a = c; c = s; }
    if (a > t0) t0 = a; if (c < t1) t1 = c;
    if (t0 > t1) return false;
  }
  if (dy === 0) { if (py < y0 || py > y1) return false; } else {
    let a = (y0 - py) / dy, c = (y1 - py) / dy;
    if (a > c) { const s = a; a = c; c = s; }
    if (a > t0) t0 = a; if (c < t1) t1 = c;
    if (t0 > t1) return false;
  }
  if (dz === 0) { if (pz < z0 || pz > z1) return false; } else {
    let a = (z0 - pz) / dz, c = (z1 - pz) / dz;
    if (a > c) { const s = a; a = c; c = s; }
    if (a > t0) t0 = a; if (c < t1) t1 = c;
    if (t0 > t1) return false;
  }
  return true;
}
