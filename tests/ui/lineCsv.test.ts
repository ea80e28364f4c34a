/**
 * Line-probe CSV: headers carry units, numbers are in shortest round-trip form (reading a cell back gives
 * the same double), samples outside the mesh are empty, the caution is in a comment line.
 */
import { describe, expect, it } from 'vitest';
import type { LineReply } from '../../workers/api.ts';
import { lineSamplesCsv } from '../../src/ui/lineCsv.ts';
import { OUTLINE_FACE_LIMIT, outlinesShownFor } from '../../src/ui/viewDefaults.ts';

function reply(): LineReply {
  const s = new Float64Array([0, 0.1 + 0.2, 0.05]);
  return {
    length: 0.05, count: 3, validCount: 2, outside: false, s, x: new Float64Array([0, 0, 0]), y: new Float64Array(3), z: new Float64Array([0.05, 0.05, 0.05]),
    valid: new Uint8Array([1, 1, 0]),
    fields: [
      { name: 'velocity', association: 'point', components: 3, labels: ['velocity_x', 'velocity_y', 'velocity_z'], columns: [new Float64Array([1, 2, NaN]), new Float64Array(3), new Float64Array(3)] },
      { name: 'swirlTag', association: 'cell', components: 1, labels: ['swirlTag'], columns: [new Float64Array([7, 8, NaN])] },
    ],
    stats: { coveredLength: 0.05, gaps: [], series: [] } as unknown as LineReply['stats'],
  };
}

describe('lineSamplesCsv', () => {
  it('heads every column with its unit (none where the name tells none)', () => {
    const lines = lineSamplesCsv('Line 1', [0, 0, 0.05], [0.05, 0, 0.05], reply()).trim().split('\n');
    expect(lines[0]).toBe('# fieldtally line probe "Line 1": (0, 0, 0.05) → (0.05, 0, 0.05) m; values in the file\'s units (SI assumed); samples outside the mesh have valid = 0 and empty values');
    expect(lines[1]).toMatch(/^# Caution: These numbers are only as good as the simulation/);
    expect(lines[2]).toBe('s [m],x [m],y [m],z [m],valid,velocity_x [m/s],velocity_y [m/s],velocity_z [m/s],swirlTag');
  });

  it('writes the shortest text that reads back as the same double', () => {
    const rows = lineSamplesCsv('L', [0, 0, 0], [1, 0, 0], reply()).trim().split('\n').slice(3).map((r) => r.split(','));
    expect(rows[1]![0]).toBe('0.30000000000000004');
    expect(Number(rows[1]![0])).toBe(0.1 + 0.2);
    expect(rows[2]![0]).toBe('0.05');
    expect(rows[2]![3]).toBe('0.05');
    expect(rows[2]!.slice(4)).toEqual(['0', '', '0', '0', '']);
  });
});

describe('view defaults', () => {
  it('face outlines start off above 200 000 boundary faces', () => {
    expect(OUTLINE_FACE_LIMIT).toBe(200_000);
    expect(outlinesShownFor(200_000)).toBe(true);
    expect(outlinesShownFor(200_001)).toBe(false);
  });
});
