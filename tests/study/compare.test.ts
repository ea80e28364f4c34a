/**
 * Comparing a baseline and a variant: differences are variant − baseline in the quantity's unit, relative
 * differences divide by |baseline|; a probe that failed on one side shows its message, never a zero difference.
 * Reference: the definitions themselves (arithmetic).
 */
import { describe, expect, it } from 'vitest';
import { compareEvaluations, comparisonCsv, percent } from '../../src/study/compare.ts';
import type { ProbeOutcome, SetEvaluation } from '../../src/study/evaluate.ts';

const outcome = (id: string, values: Record<string, number>, ok = true): ProbeOutcome => ({
  id, kind: 'cut-plane', label: id.toUpperCase(), ok, error: ok ? null : 'the plane misses every 3D cell of the mesh',
  quantities: Object.entries(values).map(([key, value]) => ({ key, label: key, value, unit: key === 'K' ? '1' : 'kg/s' })), notes: [], anchor: null, definition: '',
});
const ev = (source: string, probes: ProbeOutcome[]): SetEvaluation => ({ source, probes, failed: probes.filter((p) => !p.ok).length, lengthUnit: 'm', reference: {} });

describe('compareEvaluations', () => {
  it('absolute and relative differences per quantity', () => {
    const c = compareEvaluations(ev('a.vtu', [outcome('p1', { m: 2, K: 0 })]), ev('b.vtu', [outcome('p1', { m: 2.5, K: 0.1 })]));
    expect(c.baseline).toBe('a.vtu');
    expect(c.rows).toEqual([
      { probe: 'p1', probeLabel: 'P1', key: 'm', label: 'm', unit: 'kg/s', baseline: 2, variant: 2.5, difference: 0.5, relative: 0.25, note: null },
      { probe: 'p1', probeLabel: 'P1', key: 'K', label: 'K', unit: '1', baseline: 0, variant: 0.1, difference: 0.1, relative: null, note: 'baseline is zero: no relative difference' },
    ]);
    expect(percent(0.25)).toBe('+25.00 %');
    expect(percent(-0.0123)).toBe('-1.23 %');
    expect(percent(null)).toBe('—');
  });

  it('a negative baseline: the relative difference keeps the sign of the change', () => {
    const c = compareEvaluations(ev('a', [outcome('p', { m: -4 })]), ev('b', [outcome('p', { m: -3 })]));
    expect(c.rows[0]!.difference).toBe(1);
    expect(c.rows[0]!.relative).toBe(0.25);
  });

  it('a probe that failed on one side: listed, with the other side\'s value and a note, no difference', () => {
    const c = compareEvaluations(ev('a', [outcome('p', { m: 1 }), outcome('q', { m: 3 })]), ev('b', [outcome('p', {}, false), outcome('q', { m: 3 }), outcome('r', { m: 1 })]));
    expect(c.failures).toEqual(['variant b: P [p] — the plane misses every 3D cell of the mesh']);
    expect(c.rows.find((r) => r.probe === 'p')).toMatchObject({ baseline: 1, variant: null, difference: null, relative: null, note: 'variant failed: the plane misses every 3D cell of the mesh' });
    expect(c.rows.find((r) => r.probe === 'q')).toMatchObject({ difference: 0, relative: 0, note: null });
    expect(c.rows.find((r) => r.probe === 'r')).toMatchObject({ baseline: null, variant: 1, note: 'probe not on the baseline' });
    const csv = comparisonCsv(c, 'CAUTION TEXT').split('\n');
    expect(csv[1]).toBe('# Caution: CAUTION TEXT');
    expect(csv[2]).toBe('probe,label,quantity,symbol,unit,baseline,variant,difference,relative,note');
    expect(csv[3]).toBe('p,P,m,m,kg/s,1,,,,variant failed: the plane misses every 3D cell of the mesh');
  });
});
