import { describe, expect, it } from 'vitest';
import { axisTicks, axisTitle } from '../../src/study/axisTicks.ts';
import { seededRandom } from '../../src/model/seededRandom.ts';

/** The value a label stands for: label × 10^exponent + offset. */
function labelValue(label: string, exponent: number, offset: number): number {
  return Number(label.replace('−', '-')) * 10 ** exponent + offset;
}

describe('axis ticks: distinct, readable labels at any scale', () => {
  it('millimetre scale: shared ×10⁻³ in the title, short labels', () => {
    const t = axisTicks(0.0012, 0.0047);
    expect(t.exponent).toBe(-3);
    expect(t.labels).toEqual(['2', '3', '4']);
    expect(axisTitle('gap', 'm', t)).toBe('gap [×10⁻³ m]');
    const fine = axisTicks(0.00101, 0.00109);
    expect(new Set(fine.labels).size).toBe(fine.labels.length);
    expect(fine.labels.every((l) => l.length <= 6)).toBe(true);
  });

  it('mega scale: shared ×10⁶', () => {
    const t = axisTicks(2.1e6, 8.3e6);
    expect(t.exponent).toBe(6);
    expect(t.labels).toEqual(['4', '6', '8']);
    expect(axisTitle('thrust', 'N', t)).toBe('thrust [×10⁶ N]');
    const neg = axisTicks(-5e7, -1e7);
    expect(neg.labels).toEqual(['−50', '−40', '−30', '−20', '−10']);
  });

  it('narrow range far from zero: labels relative to a round offset named in the title', () => {
    const t = axisTicks(101325.001, 101325.004);
    expect(t.offset).toBe(101325);
    expect(t.exponent).toBe(-3);
    expect(t.labels[0]).toBe('1.0');
    expect(axisTitle('p', 'Pa', t)).toBe('p − 101\u2009325 [×10⁻³ Pa]');
  });

  it('ordinary ranges stay plain; zero is never "−0"', () => {
    expect(axisTicks(-0.3, 0.7).labels).toEqual(['−0.2', '0.0', '0.2', '0.4', '0.6']);
    expect(axisTicks(1500, 8800).labels).toEqual(['2000', '4000', '6000', '8000']);
    expect(axisTitle('t', 's', axisTicks(0, 10))).toBe('t [s]');
  });

  it('over 2000 random ranges from 10⁻¹² to 10¹²: every label distinct, short, and standing for its tick', () => {
    const r = seededRandom(17);
    for (let i = 0; i < 2000; i++) {
      const scale = 10 ** (24 * r() - 12);
      const centre = (r() - 0.5) * scale * (r() < 0.3 ? 1e6 : 2);
      const span = scale * (0.01 + r());
      const t = axisTicks(centre - span / 2, centre + span / 2);
      expect(t.values.length).toBeGreaterThanOrEqual(2);
      expect(t.values.length).toBeLessThanOrEqual(12);
      expect(new Set(t.labels).size).toBe(t.labels.length);
      for (const l of t.labels) expect(l.length).toBeLessThanOrEqual(8);
      t.values.forEach((v, k) => {
        expect(v).toBeGreaterThanOrEqual(centre - span / 2 - 1e-9 * Math.abs(span));
        expect(Math.abs(labelValue(t.labels[k]!, t.exponent, t.offset) - v)).toBeLessThanOrEqual(1e-6 * span);
      });
    }
  });

  it('a constant or non-finite range still gives an axis', () => {
    expect(axisTicks(3, 3).values.length).toBeGreaterThanOrEqual(2);
    expect(axisTicks(0, 0).labels.length).toBeGreaterThanOrEqual(2);
    expect(axisTicks(NaN, Infinity).labels.length).toBeGreaterThanOrEqual(2);
  });
});
