/**
 * The report's profile picture: round distinct ticks with a shared ×10ⁿ, gaps where samples lie outside
 * the mesh, the caution written in. Checked on the Hagen–Poiseuille profile u = 2V(1 − r²/R²) (Hagen 1839,
 * Poiseuille 1840) across a 20 mm pipe.
 */
import { describe, expect, it } from 'vitest';
import { niceTicks } from '../../src/ui/axisTicks.ts';
import { CAUTION } from '../../src/ui/caution.ts';
import { profileSvg } from '../../src/ui/profileSvg.ts';

describe('niceTicks', () => {
  it('round steps covering the range', () => {
    expect(niceTicks(0, 0.02)).toEqual([0, 0.005, 0.01, 0.015, 0.02]);
    expect(niceTicks(-1, 1, 4)).toEqual([-1, -0.5, 0, 0.5, 1]);
    expect(niceTicks(0.1205, 0.1215, 4)).toEqual([0.1205, 0.12075, 0.121, 0.12125, 0.1215]);
  });
});

describe('profileSvg', () => {
  const n = 21, R = 0.01, V = 0.05;
  const s = Float64Array.from({ length: n }, (_, i) => (2 * R * i) / (n - 1));
  const u = s.map((x) => { const r = (x - R) / R; return 2 * V * (1 - r * r); });
  u[20] = NaN;
  const svg = profileSvg({ title: 'Diameter at 70 mm', xName: 'arc length s', xUnit: 'm', x: s, series: [{ label: 'velocity_z', unit: 'm/s', values: u }], caution: CAUTION });

  it('labels the axes with units and distinct ticks', () => {
    expect(svg).toMatch(/^<svg xmlns="http:\/\/www\.w3\.org\/2000\/svg"/);
    expect(svg).toContain('>arc length s [m]</text>');
    expect(svg).toContain('>velocity_z [m/s]</text>');
    const ticks = [...svg.matchAll(/text-anchor="middle">([^<]+)<\/text>/g)].map((m) => m[1]).slice(0, 5);
    expect(ticks).toEqual(['0.000', '0.005', '0.010', '0.015', '0.020']);
  });

  it('draws the profile as one path, leaving out the sample outside the mesh', () => {
    const d = /<path d="([^"]+)"/.exec(svg)![1]!;
    expect(d.match(/[ML]/g)!.length).toBe(20);
    expect(d.startsWith('M')).toBe(true);
  });

  it('writes the caution into the picture', () => {
    const text = [...svg.matchAll(/class="caution">([^<]+)</g)].map((m) => m[1]).join(' ');
    expect(text).toBe(`Caution: ${CAUTION}`);
  });
});
