/**
 * The axis triad's geometry. Reference: isometric projection (view along a body diagonal): the three axes
 * appear at 120° to each other, each foreshortened to √(2/3) ≈ 0.8165 of its length (standard result of
 * descriptive geometry; e.g. any engineering-drawing text's "isometric projection" section, from memory).
 */
import { describe, expect, it } from 'vitest';
import { basisOf, triadArms, triadBox, triadSvg } from '../../src/study/axisTriad.ts';
import { overlaySvg } from '../../src/ui/reportOverlay.ts';

describe('axis triad', () => {
  it('isometric view: arms of length √(2/3) at 120° to each other, z straight up, none pointing away', () => {
    const b = basisOf([1, 1, 1], [0, 0, 0], [0, 0, 1]);
    const arms = triadArms(b);
    for (const a of arms) expect(Math.hypot(a.dx, a.dy)).toBeCloseTo(Math.sqrt(2 / 3), 12);
    const by = Object.fromEntries(arms.map((a) => [a.axis, a]));
    const angle = (p: { dx: number; dy: number }, q: { dx: number; dy: number }) => Math.acos((p.dx * q.dx + p.dy * q.dy) / (Math.hypot(p.dx, p.dy) * Math.hypot(q.dx, q.dy))) * 180 / Math.PI;
    expect(angle(by['x']!, by['y']!)).toBeCloseTo(120, 9);
    expect(angle(by['y']!, by['z']!)).toBeCloseTo(120, 9);
    expect(by['z']!.dx).toBeCloseTo(0, 12);
    expect(by['z']!.dy).toBeLessThan(0);
    // the eye is on the +x, +y, +z side: every axis points towards it
    expect(arms.every((a) => !a.away)).toBe(true);
  });

  it('looking from +z: x right, y up on the picture, z at the viewer; from −z, z points into it (dashed)', () => {
    const arms = Object.fromEntries(triadArms(basisOf([0, 0, 5], [0, 0, 0], [0, 1, 0])).map((a) => [a.axis, a]));
    expect(arms['x']!.dx).toBe(1);
    expect(arms['y']!.dy).toBe(-1);
    expect(arms['z']!.away).toBe(false);
    const below = basisOf([0, 0, -5], [0, 0, 0], [0, 1, 0]);
    expect(triadArms(below).find((a) => a.axis === 'z')!.away).toBe(true);
    expect(triadArms(below).find((a) => a.axis === 'x')!.dx).toBe(-1);
    expect(triadSvg(below, 0, 0)).toMatch(/<g data-axis="z" opacity="0\.55"><line [^>]*stroke-dasharray/);
  });

  it('report overlays carry it in the lower right and lay pins out clear of it', () => {
    const b = basisOf([1, 1, 1], [0, 0, 0], [0, 0, 1]);
    const box = triadBox(400, 300);
    expect(box).toEqual({ x: 400 - 12 - 76, y: 300 - 12 - 76, width: 76, height: 76 });
    // a pin anchored inside the triad's square is placed outside it
    const svg = overlaySvg(400, 300, [{ id: 'p', x: 350, y: 260, title: 'Plane 1', rows: ['Q = 1 m³/s'] }], null, b);
    expect(svg).toMatch(/<g class="axis-triad">/);
    const rect = /<g class="pin" data-pin="p">.*?<rect x="([\d.]+)" y="([\d.]+)" width="(\d+)" height="(\d+)"/.exec(svg)!;
    const [x, y, w, h] = rect.slice(1).map(Number) as [number, number, number, number];
    expect(x + w <= box.x || x >= box.x + box.width || y + h <= box.y || y >= box.y + box.height).toBe(true);
    expect(overlaySvg(400, 300, [], null)).not.toMatch(/axis-triad/);
  });
});
