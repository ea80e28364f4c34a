/** Result exports: every format carries the caution; CSV and JSON keep full precision and never invent numbers. */
import { describe, expect, it } from 'vitest';
import { CAUTION } from '../../src/study/caution.ts';
import { resultsAsCsv, resultsAsJson, resultsAsText, type ProbeResult } from '../../src/ui/results.ts';

const ctx = { tool: 'fieldtally', file: 'pipe, medium.vtu', createdAt: '2026-01-01T00:00:00.000Z' };
const results: ProbeResult[] = [
  {
    id: 'plane-1', kind: 'plane', label: 'Plane 1', anchor: [0, 0, 0.03], definition: 'origin (0, 0, 0.03) m', pinVisible: true,
    quantities: [{ key: 'massFlowRate', label: 'ṁ', value: 0.015427339042993798, unit: 'kg/s', pinned: true },
      { key: 'uniformityIndex', label: 'uniformity γ', value: NaN, unit: '', pinned: false }],
  },
  { id: 'line-1', kind: 'line', label: 'Line 1', anchor: [0, 0, 0], definition: 'a → b', pinVisible: false, quantities: [], notes: [{ text: 'the line lies wholly outside the mesh', level: 'warning' }] },
  {
    id: 'force-1', kind: 'force', label: 'Force total', anchor: [0, 0, 0], definition: 'group 1', pinVisible: true,
    notes: [{ text: 'centre of pressure undefined: the pressure force is zero or parallel to the axis', level: 'info' }],
    quantities: [{ key: 'CD', label: 'C_D', value: 27620.4, unit: '', pinned: true },
      { key: 'CL', label: 'C_L', value: -5.565e-14, unit: '', pinned: true, scale: { value: 27620.4, label: 'C_D' } }],
  },
];

describe('result exports', () => {
  it('CSV: caution, header, full precision, quoted commas, empty cell for a missing value', () => {
    const lines = resultsAsCsv(results, ctx).trim().split('\n');
    expect(lines[0]).toBe('# fieldtally results; file: pipe, medium.vtu; created: 2026-01-01T00:00:00.000Z');
    expect(lines[1]).toBe(`# Caution: ${CAUTION}`);
    expect(lines[2]).toBe('probe,kind,definition,quantity,label,value,unit');
    expect(lines[3]).toBe('Plane 1,plane,"origin (0, 0, 0.03) m",massFlowRate,ṁ,0.015427339042993798,kg/s');
    expect(lines[4]).toBe('Plane 1,plane,"origin (0, 0, 0.03) m",uniformityIndex,uniformity γ,,');
    expect(lines[5]).toBe('Line 1,line,a → b,note,the line lies wholly outside the mesh,,');
    // the file keeps the number as computed: no mark, no rounding
    expect(lines[7]).toBe('Force total,force,group 1,CL,C_L,-5.565e-14,');
  });
  it('JSON: caution and null for a missing value', () => {
    const j = JSON.parse(resultsAsJson(results, ctx));
    expect(j.caution).toBe(CAUTION);
    expect(j.probes[0].quantities[0].value).toBe(0.015427339042993798);
    expect(j.probes[0].quantities[1].value).toBeNull();
    expect(j.probes[1].note).toMatch(/outside/);
    expect(j.probes[2].notes).toEqual([{ text: 'centre of pressure undefined: the pressure force is zero or parallel to the axis', level: 'info' }]);
    expect(j.probes[2].quantities[1].value).toBe(-5.565e-14);
  });
  it('text: 4 significant figures with units, and the caution', () => {
    const t = resultsAsText(results, ctx);
    expect(t).toContain('ṁ             0.01543 kg/s');
    expect(t).toContain('  C_L  -5.565e-14 (≈ 0 relative to C_D)');
    expect(t.trim().endsWith(`Caution: ${CAUTION}`)).toBe(true);
  });
});
