/** Pin placement: boxes stay in view, clear of each other, and the same input gives the same layout. */
import { describe, expect, it } from 'vitest';
import { layoutPins, leaderEnd, type PinBox } from '../../src/ui/pinLayout.ts';

const overlap = (a: { x: number; y: number; width: number; height: number }, b: typeof a) =>
  a.x < b.x + b.width && b.x < a.x + a.width && a.y < b.y + b.height && b.y < a.y + a.height;

describe('layoutPins', () => {
  it('keeps pins anchored at one point from piling on each other', () => {
    const pins: PinBox[] = Array.from({ length: 6 }, (_, i) => ({ id: `p${i}`, anchorX: 400, anchorY: 300, width: 150, height: 70 }));
    const placed = layoutPins(pins, 1000, 700);
    for (let i = 0; i < placed.length; i++) for (let j = i + 1; j < placed.length; j++) expect(overlap(placed[i]!, placed[j]!)).toBe(false);
    for (const p of placed) {
      expect(p.x).toBeGreaterThanOrEqual(8);
      expect(p.y).toBeGreaterThanOrEqual(8);
      expect(p.x + p.width).toBeLessThanOrEqual(992);
      expect(p.y + p.height).toBeLessThanOrEqual(692);
    }
  });

  it('is deterministic and independent of input order', () => {
    const pins: PinBox[] = [
      { id: 'b', anchorX: 100, anchorY: 120, width: 90, height: 40 },
      { id: 'a', anchorX: 110, anchorY: 125, width: 90, height: 40 },
      { id: 'c', anchorX: 900, anchorY: 20, width: 120, height: 60 },
    ];
    expect(layoutPins(pins, 1000, 600)).toEqual(layoutPins([...pins].reverse(), 1000, 600));
  });

  it('puts the first pin up and to the right of its anchor, and ends its leader on the box edge', () => {
    const [p] = layoutPins([{ id: 'a', anchorX: 500, anchorY: 400, width: 100, height: 50 }], 1000, 800);
    expect(p!.x).toBe(528);
    expect(p!.y).toBe(400 - 28 - 50);
    expect(leaderEnd(p!)).toEqual([528, 372]);
  });
});
