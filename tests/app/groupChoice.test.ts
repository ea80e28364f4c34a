/**
 * Surface groups chosen in the app by what they are: the fields read into a selector, with precise errors,
 * and the groups it picks among the open file's (the pipe sample's three parts: inlet end at z = 0, wall,
 * outlet end at z = 0.1 m; areas as `fieldtally surfaces sample-fields/pipe-medium.vtu` lists them).
 */
import { describe, expect, it } from 'vitest';
import { EMPTY_CHOICE, groupIdsOf, groupRef, groupsChosen, selectorFromText } from '../../src/app/groupChoice.ts';
import type { GroupInfo } from '../../workers/api.ts';

const group = (id: number, name: string, area: number, bounds: number[]): GroupInfo => ({
  id, fileId: id, name, source: 'feature-angle', area, faces: 1, centroid: [0, 0, (bounds[4]! + bounds[5]!) / 2], bounds: bounds as GroupInfo['bounds'],
});
const PIPE = [
  group(0, 'part 0', 3.10583e-4, [-0.01, 0.01, -0.01, 0.01, 0, 0]),
  group(1, 'part 1', 0.00626526, [-0.01, 0.01, -0.01, 0.01, 0, 0.1]),
  group(2, 'part 2', 3.10583e-4, [-0.01, 0.01, -0.01, 0.01, 0.1, 0.1]),
];
const text = (t: Partial<typeof EMPTY_CHOICE>) => ({ ...EMPTY_CHOICE, ...t });

describe('choosing surface groups by what they are', () => {
  it('reads name, box and area range into a selector; empty fields do not restrict', () => {
    expect(selectorFromText(text({ name: ' part 1 ' }))).toEqual({ name: 'part 1' });
    expect(selectorFromText(text({ box: '-1, 1; -1 1, 0.09, 0.11', areaTo: '1e-3' }))).toEqual({ within: [-1, 1, -1, 1, 0.09, 0.11], areaTo: 0.001 });
    expect(selectorFromText(text({ areaFrom: '0.005' }))).toEqual({ areaFrom: 0.005 });
  });

  it('refuses what it cannot read, naming the field and what it expected', () => {
    expect(() => selectorFromText(EMPTY_CHOICE)).toThrow('give a name, a box or an area range to choose surfaces by');
    expect(() => selectorFromText(text({ box: '0, 1, 0, 1' }))).toThrow('box: expected six numbers xmin, xmax, ymin, ymax, zmin, zmax, got "0, 1, 0, 1"');
    expect(() => selectorFromText(text({ box: '0, 1, 2, 1, 0, 1' }))).toThrow('box: ymin 2 is above ymax 1');
    expect(() => selectorFromText(text({ areaFrom: 'big' }))).toThrow('area from: expected a number ≥ 0 (file length unit²), got "big"');
    expect(() => selectorFromText(text({ areaFrom: '2', areaTo: '1' }))).toThrow('area: from 2 is above to 1');
  });

  it('picks the wall by its area, the outlet end by a box around it, both ends by an area range', () => {
    expect(groupsChosen(PIPE, { areaFrom: 0.005 })).toEqual([1]);
    expect(groupsChosen(PIPE, { within: [-1, 1, -1, 1, 0.09, 0.11] })).toEqual([2]);
    expect(groupsChosen(PIPE, { areaTo: 0.001 })).toEqual([0, 2]);
    expect(groupsChosen(PIPE, { name: 'part 0', areaTo: 0.001 })).toEqual([0]);
    expect(() => groupsChosen(PIPE, { name: 'outlet' })).toThrow('no surface group named "outlet" (known: 0 "part 0" (area 0.000310583), 1 "part 1" (area 0.00626526), 2 "part 2" (area 0.000310583))');
  });

  it('finds the groups a probe set names by name, id in the file or selector (force and wall tools); unknown or `nearest` is left to the worker', () => {
    const twin = [...PIPE, group(3, 'part 1', 1, [0, 1, 0, 1, 0, 1])];
    expect(groupIdsOf(PIPE, ['part 2', 0, { areaFrom: 0.005 }])).toEqual([2, 0, 1]);
    expect(groupIdsOf(PIPE, [{ areaTo: 0.001 }])).toEqual([0, 2]);
    expect(groupIdsOf(PIPE, ['outlet'])).toBeUndefined();
    expect(groupIdsOf(PIPE, [{ name: 'outlet' }])).toBeUndefined();
    expect(groupIdsOf(PIPE, [{ nearest: [0, 0, 0] }])).toBeUndefined();
    // a name two groups share is not a reference; their ids in the file are
    expect(groupIdsOf(twin, ['part 1'])).toBeUndefined();
    expect(groupIdsOf(twin, ['3'])).toEqual([3]);
    expect(groupRef(PIPE, PIPE[1]!)).toBe('part 1');
    expect(groupRef(twin, twin[3]!)).toBe(3);
  });
});
