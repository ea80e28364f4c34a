/**
 * Point probes and sensor files.
 * References: linear-field reproduction (mathematical identity) for the values; the CSV rules stated in
 * src/locate/sensorCsv.ts for the parser.
 */
import { describe, expect, it } from 'vitest';
import { datasetOf, field, hexGrid, pointFieldFrom, withFields } from '../../src/model/meshBuild.ts';
import { probePoint, probePoints } from '../../src/locate/pointProbe.ts';
import { parseSensorCsv } from '../../src/locate/sensorCsv.ts';
import { jitteredWedge } from './meshes.ts';

const lin = (x: number, y: number, z: number) => 4 - x + 0.5 * y + 2 * z;

describe('point probe', () => {
  const p = jitteredWedge(3);
  const d = datasetOf([withFields(p, [pointFieldFrom(p, 'T', 1, (x, y, z, o) => { o[0] = lin(x, y, z); })], [field('zone', 'cell', 1, new Float64Array(p.cellTypes.length).map((_, i) => i))])]);

  it('values at one point: interpolated point data, the holding cell\'s cell data', () => {
    const r = probePoint(d, 0.3, 0.6, 0.2);
    expect(r.count).toBe(1);
    expect(r.valid[0]).toBe(1);
    expect(r.fields.map((f) => f.name)).toEqual(['T', 'zone']);
    expect(r.fields[0]!.columns[0]![0]).toBeCloseTo(lin(0.3, 0.6, 0.2), 12);
    expect(r.fields[1]!.columns[0]![0]).toBe(r.cell[0]);
  });

  it('many points with labels; points outside are flagged with NaN values', () => {
    const r = probePoints(d, [0.1, 0.1, 0.1, 2, 2, 2, 0.9, 0.5, 0.99], { labels: ['a', 'b', 'c'], fields: ['T'] });
    expect(Array.from(r.valid)).toEqual([1, 0, 1]);
    expect(r.validCount).toBe(2);
    expect(r.labels).toEqual(['a', 'b', 'c']);
    expect(r.fields[0]!.columns[0]![1]).toBeNaN();
    expect(r.cell[1]).toBe(-1);
    expect(r.fields[0]!.columns[0]![2]).toBeCloseTo(lin(0.9, 0.5, 0.99), 12);
  });

  it('rejects malformed input at the edge', () => {
    expect(() => probePoints(d, [1, 2])).toThrow(/not a multiple of 3/);
    expect(() => probePoints(d, [0, 0, 0], { labels: ['a', 'b'] })).toThrow(/2 labels for 1 points/);
    expect(() => probePoints(d, [0, Infinity, 0])).toThrow(/point 0 has a non-finite coordinate/);
  });

  it('a hexahedral mesh: trilinear interpolation of a trilinear field at sensor points', () => {
    const h = hexGrid(3, 3, 3, (u, v, w) => [2 * u, v, 3 * w]);
    const f = (x: number, y: number, z: number) => 1 + x * y * z - 2 * x * z;
    const hd = datasetOf([withFields(h, [pointFieldFrom(h, 'q', 1, (x, y, z, o) => { o[0] = f(x, y, z); })])]);
    const r = probePoints(hd, [0.3, 0.4, 0.5, 1.9, 0.1, 2.9, 1, 0.5, 1.5]);
    for (let i = 0; i < 3; i++) expect(r.fields[0]!.columns[0]![i]).toBeCloseTo(f(r.x[i]!, r.y[i]!, r.z[i]!), 12);
  });
});

describe('sensor CSV', () => {
  it('x,y,z without a header', () => {
    const s = parseSensorCsv('0,0,1\n 1.5 , 2, -3\n\n# comment\n4,5,6\n', 's.csv');
    expect(s.labels).toBeNull();
    expect(Array.from(s.points)).toEqual([0, 0, 1, 1.5, 2, -3, 4, 5, 6]);
  });

  it('label,x,y,z without a header (numeric labels too), and with a header in any order', () => {
    expect(parseSensorCsv('P1,0,0,1\n7,1,2,3', 's.csv').labels).toEqual(['P1', '7']);
    const s = parseSensorCsv('Z,Name,X,Y\r\n1,"inlet tap",2,3\r\n4,outlet,5,6\r\n', 's.csv');
    expect(s.labels).toEqual(['inlet tap', 'outlet']);
    expect(Array.from(s.points)).toEqual([2, 3, 1, 5, 6, 4]);
    expect(parseSensorCsv('x,y,z\n1,2,3', 's.csv').labels).toBeNull();
  });

  it('errors name the file and the line', () => {
    expect(() => parseSensorCsv('x,y,z\n1,2,3\n4,5', 'taps.csv')).toThrow('taps.csv line 3: expected 3 fields as in the header, found 2');
    expect(() => parseSensorCsv('1,2,3\n\n4,five,6', 'taps.csv')).toThrow('taps.csv line 3: y is "five", expected a number');
    expect(() => parseSensorCsv('a,b,c\n1,2,3', 'taps.csv')).toThrow('taps.csv line 1: header must name columns x,y,z or label,x,y,z, found "a,b,c"');
    expect(() => parseSensorCsv('1,2', 'taps.csv')).toThrow('taps.csv line 1: expected 3 fields (x,y,z) or 4 (label,x,y,z), found 2');
    expect(() => parseSensorCsv('# nothing\n', 'taps.csv')).toThrow('taps.csv: no sensor positions found');
  });
});
