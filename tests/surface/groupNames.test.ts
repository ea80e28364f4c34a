import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { loadDatasetFile } from '../../src/io/nodeFiles.ts';
import { pieceLabels } from '../../src/io/vtkSets.ts';
import { cellCount, type Piece } from '../../src/model/piece.ts';
import { datasetOf, hexGrid, pieceFromCells, tetGrid } from '../../src/model/meshBuild.ts';
import { seededRandom } from '../../src/model/seededRandom.ts';
import { boundaryFaces } from '../../src/surface/boundaryFaces.ts';
import { groupNameTable } from '../../src/surface/groupNames.ts';
import { resolveGroups, surfaceGroups } from '../../src/surface/surfaceGroups.ts';
import type { Dataset } from '../../src/model/dataset.ts';

const FIXTURES = 'tests/fixtures/group-names';
// What VTK 9.1 (python3-vtk9) reads back from the fixtures it wrote (tests/reference/group_names.py).
const VTK = JSON.parse(readFileSync('tests/reference/expected/group_names.json', 'utf8')) as Record<string, { 'zone names'?: string[]; leaves?: { name: string; cells: number }[] }>;

/** The unit-cube sides by centroid, as the group summary gives them (rounded). */
const centre = (c: readonly number[]) => c.map((v) => Math.round(v * 1e9) / 1e9).join(',');

describe('group names from the file', () => {
  for (const enc of ['ascii', 'binary', 'appended']) {
    it(`the group array's name table of a VTK-written file (${enc}) names the groups; other sides are ranked feature parts`, async () => {
      const d = await loadDatasetFile(`${FIXTURES}/tank-names-${enc}.vtu`);
      const names = VTK[`tank-names-${enc}.vtu`]!['zone names']!;
      expect(d.fieldStrings).toEqual([{ name: 'zone names', values: names }]);
      const g = surfaceGroups(d, boundaryFaces(d));
      expect(g.groupArray).toBe('zone');
      // values 1 and 2 in a table of two names: 1-based
      expect(g.groups.map((x) => [x.id, x.name, x.nameFrom ?? null, x.source])).toEqual([
        [1, 'filler neck', 'name-table', 'cell-array'], [2, 'drain', 'name-table', 'cell-array'],
        [3, 'part 3', null, 'feature-angle'], [4, 'part 4', null, 'feature-angle'], [5, 'part 5', null, 'feature-angle'], [6, 'part 6', null, 'feature-angle'],
      ]);
      expect(centre(g.groups[0]!.centroid)).toBe('0,0.5,0.5');
      expect(centre(g.groups[1]!.centroid)).toBe('1,0.5,0.5');
      // ranked by centroid x, then y, then z: y = 0, z = 0, z = 1, y = 1
      expect(g.groups.slice(2).map((x) => centre(x.centroid))).toEqual(['0.5,0,0.5', '0.5,0.5,0', '0.5,0.5,1', '0.5,1,0.5']);
      expect(resolveGroups(g, ['drain'])).toEqual([1]);
    });
  }

  it('block names of a VTK-written .vtm label the groups of its surface blocks', async () => {
    const d = await loadDatasetFile(`${FIXTURES}/tank-blocks.vtm`);
    const leaves = VTK['tank-blocks.vtm']!.leaves!;
    expect(d.pieceNames).toEqual(leaves.map((l) => l.name));
    expect(d.pieces.map(cellCount)).toEqual(leaves.map((l) => l.cells));
    const g = surfaceGroups(d, boundaryFaces(d));
    expect(g.groups.map((x) => [x.id, x.name, x.source, x.faces])).toEqual([
      [0, 'filler neck', 'block-name', 4], [1, 'drain', 'block-name', 4],
      [2, 'part 2', 'feature-angle', 4], [3, 'part 3', 'feature-angle', 4], [4, 'part 4', 'feature-angle', 4], [5, 'part 5', 'feature-angle', 4],
    ]);
    expect(g.groups[0]!.area).toBeCloseTo(1, 14);
    expect(centre(g.groups[1]!.centroid)).toBe('1,0.5,0.5');
    // ignoring group arrays ignores block names too
    expect(surfaceGroups(d, boundaryFaces(d), { groupArray: false }).groups.every((x) => x.source === 'feature-angle')).toBe(true);
  });

  it('piece labels: the innermost block name unless two leaves share it', () => {
    expect(pieceLabels(['fluid', 'walls/inlet', 'walls/outlet'])).toEqual(['fluid', 'inlet', 'outlet']);
    expect(pieceLabels(['body/wall', 'nose/wall', '', 'sting'])).toEqual(['body/wall', 'nose/wall', '', 'sting']);
  });

  it('name tables: an id array says which value each name has; 0-based; a table that fits no values is left out with a note', () => {
    const base: Dataset = datasetOf([hexGrid(1, 1, 1)], 'names.vtu');
    const d = (strings: string[], ids?: number[]): Dataset => ({
      ...base, fieldStrings: [{ name: 'Zone_Names', values: strings }],
      fieldData: ids ? [{ name: 'zone ids', association: 'dataset', components: 1, values: new Int32Array(ids), sourceType: 'Int32' }] : [],
    });
    const t1 = groupNameTable(d(['a', 'b'], [7, 3]), 'zone', [3, 7]);
    expect(t1 && 'names' in t1 ? [...t1.names] : t1).toEqual([[7, 'a'], [3, 'b']]);
    const t0 = groupNameTable(d(['a', 'b', 'c']), 'zone', [0, 2]);
    expect(t0 && 'names' in t0 ? [t0.matched, [...t0.names]] : t0).toEqual(['0-based', [[0, 'a'], [1, 'b'], [2, 'c']]]);
    const bad = groupNameTable(d(['a', 'b']), 'zone', [5, 9]);
    expect(bad && 'note' in bad ? bad.note : bad).toMatch(/names\.vtu: name table "Zone_Names" of group array "zone" not used: its 2 names cannot name values 5 … 9/);
    expect(groupNameTable(base, 'zone', [1])).toBeUndefined();
  });
});

/** The same mesh with its cells (and points) renumbered by a seeded shuffle. */
function permuted(p: Piece, seed: number): Piece {
  const rnd = seededRandom(seed), n = cellCount(p), np = p.points.length / 3;
  const shuffle = (k: number) => { const a = Array.from({ length: k }, (_, i) => i); for (let i = k - 1; i > 0; i--) { const j = Math.floor(rnd() * (i + 1)); [a[i], a[j]] = [a[j]!, a[i]!]; } return a; };
  const cells = shuffle(n), pts = shuffle(np), newOfOld = new Int32Array(np);
  pts.forEach((old, i) => { newOfOld[old] = i; });
  const points = new Float64Array(3 * np);
  pts.forEach((old, i) => points.set(p.points.subarray(3 * old, 3 * old + 3), 3 * i));
  const nodes = cells.map((c) => Array.from(p.connectivity.subarray(p.offsets[c]!, p.offsets[c + 1]!), (q) => newOfOld[q]!));
  return pieceFromCells(points, { types: cells.map((c) => p.cellTypes[c]!), nodes });
}

describe('feature-part ids do not depend on cell order', () => {
  // Reference: geometry of a 2 × 1 × 0.5 box (sides of area 0.5, 1 and 2 in pairs) and of a unit cube.
  const box = (x: number, y: number, z: number): [number, number, number] => [2 * x, y, 0.5 * z];
  for (const [label, piece] of [['hexahedra', hexGrid(4, 3, 2, box)], ['tetrahedra', tetGrid(3, 2, 2, box)]] as const) {
    it(`${label}: the same side gets the same id after the cells and points are shuffled`, () => {
      const a = datasetOf([piece]), ga = surfaceGroups(a, boundaryFaces(a));
      // by centroid x, then y, then z
      expect(ga.groups.map((g) => [g.id, Math.round(g.area * 1e12) / 1e12, centre(g.centroid)])).toEqual([
        [0, 0.5, '0,0.5,0.25'], [1, 1, '1,0,0.25'], [2, 2, '1,0.5,0'], [3, 2, '1,0.5,0.5'], [4, 1, '1,1,0.25'], [5, 0.5, '2,0.5,0.25'],
      ]);
      for (const seed of [1, 2, 3]) {
        const b = datasetOf([permuted(piece, seed)]), gb = surfaceGroups(b, boundaryFaces(b));
        expect(gb.groups.map((g) => [g.id, g.faces, centre(g.centroid)])).toEqual(ga.groups.map((g) => [g.id, g.faces, centre(g.centroid)]));
      }
    });
  }
});
