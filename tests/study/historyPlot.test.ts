import { describe, expect, it } from 'vitest';
import { historySvg, plotTimeOfPixel, spectrumSvg } from '../../src/study/historyPlot.ts';
import { dominantFrequency } from '../../src/stats/spectrum.ts';

/** Tags of an SVG string balanced (a minimal well-formedness check: every open tag closed, in order). */
function balanced(svg: string): boolean {
  const stack: string[] = [];
  for (const m of svg.matchAll(/<(\/?)([a-zA-Z]+)[^>]*?(\/?)>/g)) {
    if (m[3]) continue;
    if (m[1]) { if (stack.pop() !== m[2]) return false; } else stack.push(m[2]!);
  }
  return stack.length === 0;
}

function texts(svg: string, cls: string): string[] {
  return [...svg.matchAll(new RegExp(`<text class="${cls}"[^>]*>([^<]*)</text>`, 'g'))].map((m) => m[1]!);
}

const TWO_PI = 2 * Math.PI;

describe('history plot', () => {
  const time = Float64Array.from({ length: 401 }, (_, i) => i * 0.005);
  const values = time.map((t) => 1.5e6 + 2e5 * Math.sin(TWO_PI * 3 * t));

  it('is self-contained SVG with the unit in the axis titles and distinct tick labels (mega scale)', () => {
    const svg = historySvg({ time, values, quantity: 'hull.Fx', unit: 'N', window: { from: 0.5, to: 1.8 }, mean: 1.5e6, halfWidth95: 2e4, transientEnd: 0.5 });
    expect(svg.startsWith('<svg xmlns="http://www.w3.org/2000/svg"')).toBe(true);
    expect(balanced(svg)).toBe(true);
    expect(svg).not.toMatch(/<script|href=|url\(|@import/);
    expect(texts(svg, 'y-title')).toEqual(['hull.Fx [×10⁶ N]']);
    expect(texts(svg, 'x-title')).toEqual(['time [s]']);
    const y = texts(svg, 'y-tick'), x = texts(svg, 'x-tick');
    expect(new Set(y).size).toBe(y.length);
    expect(new Set(x).size).toBe(x.length);
    expect(y).toContain('1.5');
    expect(x).toEqual(['0.0', '0.5', '1.0', '1.5', '2.0']);
  });

  it('shades the window between its times, draws the mean with its band and the transient line', () => {
    const svg = historySvg({ time, values, quantity: 'q', unit: 'Pa', window: { from: 0.5, to: 1.5 }, mean: 1.5e6, halfWidth95: 1e4, transientEnd: 0.25 });
    // x axis maps [0, 2] s to [74, 702] px (default 720 px wide, margins 74 and 18)
    const rect = /<rect class="window" x="([\d.]+)" y="[\d.]+" width="([\d.]+)"/.exec(svg)!;
    expect(Number(rect[1])).toBeCloseTo(74 + 0.25 * 628, 1);
    expect(Number(rect[2])).toBeCloseTo(0.5 * 628, 1);
    expect(svg).toMatch(/<line class="mean" x1="231" /);
    expect(svg).toMatch(/<rect class="band"/);
    expect(svg).toMatch(/<line class="transient" x1="152.5" /);
  });

  it('millimetre values and long records: labels readable, every extreme of a spike kept', () => {
    const n = 50_000;
    const t = Float64Array.from({ length: n }, (_, i) => i * 1e-4);
    const v = t.map((s) => 0.0021 + 0.0004 * Math.sin(TWO_PI * s));
    v[31_234] = 0.0049; // one spike
    const svg = historySvg({ time: t, values: v, quantity: 'gap', unit: 'm' });
    expect(texts(svg, 'y-title')).toEqual(['gap [×10⁻³ m]']);
    const y = texts(svg, 'y-tick');
    expect(new Set(y).size).toBe(y.length);
    for (const l of y) expect(l.length).toBeLessThanOrEqual(4);
    // envelope: at most 4 points per pixel column, and the spike's height is drawn
    const d = /<path class="history" d="([^"]+)"/.exec(svg)![1]!;
    expect(d.split('L').length).toBeLessThanOrEqual(4 * 628 + 1);
    const ys = [...d.matchAll(/[ML][\d.]+ ([\d.]+)/g)].map((m) => Number(m[1]));
    expect(Math.min(...ys)).toBeCloseTo(30, 0); // top of the frame: the spike is the maximum
  });

  it('states its time-axis mapping on the root, so a drag in the app turns into times', () => {
    const svg = historySvg({ time, values, quantity: 'q', unit: '', width: 500 });
    const pixels = /data-x-pixels="([^"]+)"/.exec(svg)![1]!, range = /data-x-range="([^"]+)"/.exec(svg)![1]!;
    expect(pixels).toBe('74 482');
    expect(range).toBe('0 2');
    expect(plotTimeOfPixel({ pixels, range }, 74 + 408 * 0.75)).toBeCloseTo(1.5, 12);
  });

  it('a 95 % band wider than the data is clipped to the frame and does not stretch the value axis', () => {
    const svg = historySvg({ time, values, quantity: 'Quarter plane: Q', axisName: 'Q', unit: 'm³/s', mean: 1.5e6, halfWidth95: 5e7 });
    const band = /<rect class="band" x="[\d.]+" y="([\d.]+)" width="[\d.]+" height="([\d.]+)"/.exec(svg)!;
    expect(Number(band[1])).toBe(30);
    expect(Number(band[2])).toBe(300 - 46 - 30);
    expect(texts(svg, 'y-tick')).toContain('1.5');
    expect(texts(svg, 'y-title')).toEqual(['Q [×10⁶ m³/s]']);
    expect(texts(svg, 'title')).toEqual(['Quarter plane: Q']);
  });

  it('escapes text and refuses mismatched arrays', () => {
    const svg = historySvg({ time, values, quantity: 'a<b & "c"', unit: 'N' });
    expect(svg).toContain('a&lt;b &amp; &quot;c&quot;');
    expect(balanced(svg)).toBe(true);
    expect(() => historySvg({ time, values: new Float64Array(3), quantity: 'x', unit: '' }))
      .toThrow('history plot of x: 401 times and 3 values; expected the same non-zero count');
  });
});

describe('spectrum plot', () => {
  it('marks the dominant tone with its frequency, amplitude and Strouhal number', () => {
    const t = Float64Array.from({ length: 600 }, (_, i) => i * 0.01 + 0.002 * Math.sin(i));
    const v = t.map((s) => 0.8 * Math.sin(TWO_PI * 3.0 * s));
    const s = dominantFrequency(t, v)!;
    const svg = spectrumSvg({ frequencies: s.frequencies, power: s.power, quantity: 'cylinder.CL', unit: '', peak: { frequency: s.frequency, amplitude: s.amplitude, strouhal: 0.3 } });
    expect(balanced(svg)).toBe(true);
    expect(texts(svg, 'peak-label')).toEqual(['f = 3 Hz, amplitude 0.8, St = 0.3']);
    expect(texts(svg, 'x-title')).toEqual(['frequency [Hz]']);
    expect(texts(svg, 'y-title')).toEqual(['amplitude']);
    expect(texts(svg, 'title')).toEqual(['spectrum of cylinder.CL']);
    const x = texts(svg, 'x-tick');
    expect(new Set(x).size).toBe(x.length);
  });
});
