/** Pins keep clear of the legend and the footer; an anchor off the view gets a marker on the edge. */
import { describe, expect, it } from 'vitest';
import { edgeAnchor, layoutPins } from '../../src/ui/pinLayout.ts';

const clear = (a: { x: number; y: number; width: number; height: number }, b: { x: number; y: number; width: number; height: number }) =>
  a.x + a.width <= b.x || b.x + b.width <= a.x || a.y + a.height <= b.y || b.y + b.height <= a.y;

describe('pin obstacles', () => {
  it('a pin whose first place would cover the footer goes elsewhere', () => {
    const footer = { x: 600, y: 540, width: 200, height: 60 };
    const pin = { id: 'p', anchorX: 560, anchorY: 590, width: 150, height: 50 };
    const free = layoutPins([pin], 800, 600)[0]!;
    expect(clear(free, footer)).toBe(false);
    const placed = layoutPins([pin], 800, 600, { obstacles: [footer] })[0]!;
    expect(clear(placed, footer)).toBe(true);
  });

  it('many pins keep clear of the legend and of each other', () => {
    const legend = { x: 10, y: 300, width: 120, height: 280 };
    const pins = Array.from({ length: 6 }, (_, i) => ({ id: `p${i}`, anchorX: 60 + 20 * i, anchorY: 420, width: 140, height: 48 }));
    const placed = layoutPins(pins, 1000, 600, { obstacles: [legend] });
    for (const p of placed) expect(clear(p, legend)).toBe(true);
    for (let i = 0; i < placed.length; i++) for (let j = i + 1; j < placed.length; j++) expect(clear(placed[i]!, placed[j]!)).toBe(true);
  });
});

describe('edgeAnchor', () => {
  it('leaves an anchor in view alone', () => {
    expect(edgeAnchor(100, 50, 800, 600)).toEqual({ x: 100, y: 50, dir: null });
  });
  it('brings an anchor right of the view to the right edge, pointing right', () => {
    const e = edgeAnchor(1600, 300, 800, 600);
    expect(e.x).toBeCloseTo(790, 12);
    expect(e.y).toBeCloseTo(300, 12);
    expect(e.dir).toEqual([1, 0]);
  });
  it('a corner direction stops at the nearer edge', () => {
    const e = edgeAnchor(-400, -1000, 800, 600);
    expect(e.y).toBeCloseTo(10, 12);
    expect(e.x).toBeGreaterThan(10);
    expect(Math.hypot(...e.dir!)).toBeCloseTo(1, 12);
  });
});

describe('pins placed by hand', () => {
  it('keep their place (inside the view); the automatic ones avoid them', () => {
    const pins = [
      { id: 'a', anchorX: 100, anchorY: 100, width: 120, height: 40, offset: [200, 50] as [number, number] },
      { id: 'b', anchorX: 300, anchorY: 150, width: 120, height: 40 },
    ];
    const [a, b] = layoutPins(pins, 800, 600);
    expect([a!.x, a!.y]).toEqual([300, 150]);
    expect(clear(a!, b!)).toBe(true);
    // a hand offset that would leave the view is brought back inside it
    const [c] = layoutPins([{ id: 'c', anchorX: 700, anchorY: 500, width: 120, height: 40, offset: [300, 300] }], 800, 600);
    expect([c!.x, c!.y]).toEqual([800 - 8 - 120, 600 - 8 - 40]);
  });
});
