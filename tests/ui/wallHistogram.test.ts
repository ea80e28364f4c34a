/** The y⁺ histogram picture: one bar per bin scaled to the largest share, threshold lines with their shares. */
import { describe, expect, it } from 'vitest';
import { histogramSvg } from '../../src/ui/wallHistogram.ts';

describe('histogramSvg', () => {
  const h = { edges: [0, 1, 2, 3, 4], areaShare: [0.1, 0.4, 0.3, 0.2], above: [{ threshold: 1, areaShare: 0.9 }, { threshold: 3.5, areaShare: 0.1 }, { threshold: 9, areaShare: 0 }], title: 'y+ over wall' };

  it('draws one bar per bin, heights proportional to the area share, the tallest filling the plot', () => {
    const svg = histogramSvg(h, 260, 130);
    const bars = [...svg.matchAll(/<rect data-bin="(\d)" data-share="([\d.]+)" x="[\d.]+" y="[\d.]+" width="[\d.]+" height="([\d.]+)"/g)];
    expect(bars.map((b) => Number(b[2]))).toEqual(h.areaShare);
    const heights = bars.map((b) => Number(b[3]));
    // plot height 130 − 18 − 22 = 90 px for the largest share
    expect(heights).toEqual([22.5, 90, 67.5, 45]);
  });

  it('marks the thresholds inside the range with the share above each; one outside is left out', () => {
    const svg = histogramSvg(h);
    expect(svg).toContain('data-threshold="1"');
    expect(svg).toContain('data-threshold="3.5"');
    expect(svg).not.toContain('data-threshold="9"');
    expect(svg).toContain('&gt; 1: 90.0 %');
    // a line in the right half has its label on its left
    expect(svg).toMatch(/dx="-2" text-anchor="end" fill="#b91c1c">&gt; 3.5: 10.0 %/);
  });

  it('refuses edges that do not match the bins', () => {
    expect(() => histogramSvg({ ...h, edges: [0, 1] })).toThrow('y+ histogram: 2 edges for 4 bins; expected bins + 1');
  });
});
