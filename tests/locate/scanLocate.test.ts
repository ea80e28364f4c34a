/**
 * Line samples located by a scan of cell blocks (cellBlocks.ts, scanLocate.ts, lineSamples.ts) against the
 * tree path they replace (locatePoint along the line with the previous sample's cell as hint, as lineProbe.ts
 * did) and against brute force (every volume cell evaluated at every sample, the tie rule of locatePoint.ts
 * applied in full). Reference: exhaustive comparison — every sample's cell and every value the same, to
 * 1e-12 (they are the same evaluation, so in practice bit for bit), on every linear volume cell type, on
 * real files written by others (tests/fixtures/external, see its SOURCES.md), on points on faces and nodes
 * and outside the mesh, on meshes whose cells are scattered, and on overlapping cells (where the scan must
 * hand the line to the tree).
 */
import { readdirSync, statSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { loadDatasetFile } from '../../src/io/nodeFiles.ts';
import { cellDimension } from '../../src/model/cellTypes.ts';
import { datasetBounds } from '../../src/model/bounds.ts';
import { cellStarts, type Dataset } from '../../src/model/dataset.ts';
import { datasetOf, hexGrid, pieceFromCells, tetGrid, tetsWithTriangles } from '../../src/model/meshBuild.ts';
import type { Piece } from '../../src/model/piece.ts';
import { BLOCK, buildCellBlocks, getCellBlocks, GROUP } from '../../src/locate/cellBlocks.ts';
import { getCellTree, hasCellTree } from '../../src/locate/cellTree.ts';
import { probeLine, type LineProbeResult } from '../../src/locate/lineProbe.ts';
import { createLocation, evaluateCell, locatePoint } from '../../src/locate/locatePoint.ts';
import { allocateColumns, resolveProbeFields, writeSample } from '../../src/locate/probeFields.ts';
import { scanLineSamples, type Vec3 } from '../../src/locate/scanLocate.ts';
import { jitteredHex, jitteredTet, meshesOfEveryType, rng } from './meshes.ts';

const TOL = 1e-6;

/** The copy of a dataset's geometry with fresh arrays (no cached tree or blocks), with a linear point field and a cell field. */
function fresh(d: Dataset): Dataset {
  const pieces = d.pieces.map((p): Piece => {
    const np = p.points.length / 3, nc = p.cellTypes.length;
    const lin = new Float64Array(np), vec = new Float64Array(3 * np), cid = new Float64Array(nc);
    for (let i = 0; i < np; i++) {
      const x = p.points[3 * i]!, y = p.points[3 * i + 1]!, z = p.points[3 * i + 2]!;
      lin[i] = 1.5 + 2 * x - 3 * y + 0.7 * z; vec[3 * i] = y; vec[3 * i + 1] = -x; vec[3 * i + 2] = x * z;
    }
    for (let c = 0; c < nc; c++) cid[c] = c;
    return {
      points: p.points.slice(), cellTypes: p.cellTypes.slice(), offsets: p.offsets.slice(), connectivity: p.connectivity.slice(),
      ...(p.polyFaces ? { polyFaces: { cellFaceStart: p.polyFaces.cellFaceStart.slice(), faceOffsets: p.polyFaces.faceOffsets.slice(), faceConnectivity: p.polyFaces.faceConnectivity.slice() } } : {}),
      pointData: [{ name: 'lin', association: 'point', components: 1, values: lin, sourceType: 'Float64' }, { name: 'swirl', association: 'point', components: 3, values: vec, sourceType: 'Float64' }],
      cellData: [{ name: 'id', association: 'cell', components: 1, values: cid, sourceType: 'Float64' }],
    };
  });
  return { ...d, pieces, fieldData: [] };
}

/** A piece moved by dx along x. */
function moved(p: Piece, dx: number): Piece {
  const points = p.points.slice();
  for (let i = 0; i < points.length; i += 3) points[i] = points[i]! + dx;
  return { ...p, points };
}

/** The tree path: locatePoint sample after sample, the previous valid sample's cell as hint (lineProbe.ts before the scan). */
function treeLine(d: Dataset, from: Vec3, to: Vec3, n: number): { cell: Int32Array; values: Float64Array[] } {
  const tree = getCellTree(d), loc = createLocation();
  const fields = resolveProbeFields(d, ['lin', 'swirl', 'id']), cols = allocateColumns(fields, n);
  const cell = new Int32Array(n);
  let hint = -1;
  for (let i = 0; i < n; i++) {
    const t = i / (n - 1);
    const p = (a: number) => (t === 1 ? to[a]! : from[a]! + t * (to[a]! - from[a]!));
    const ok = locatePoint(tree, p(0), p(1), p(2), loc, TOL, hint);
    cell[i] = loc.cell;
    writeSample(fields, cols, i, loc);
    if (ok) hint = loc.cell;
  }
  return { cell, values: cols.flatMap((c) => c.columns) };
}

/** Brute force: every volume cell at every sample; smallest max(violation, 0) within the tolerance, ties to the lowest id. */
function bruteCells(d: Dataset, from: Vec3, to: Vec3, n: number): Int32Array {
  const starts = cellStarts(d), out = new Int32Array(n).fill(-1);
  for (let i = 0; i < n; i++) {
    const t = i / (n - 1);
    const p = (a: number) => (t === 1 ? to[a]! : from[a]! + t * (to[a]! - from[a]!));
    let best = Infinity;
    d.pieces.forEach((piece, k) => {
      for (let c = 0; c < piece.cellTypes.length; c++) {
        if (cellDimension(piece.cellTypes[c]!) !== 3) continue;
        const v = evaluateCell(piece, c, p(0), p(1), p(2)), s = v > 0 ? v : 0;
        if (!(s <= TOL)) continue;
        const g = starts[k]! + c;
        if (s < best || (s === best && g < out[i]!)) { best = s; out[i] = g; }
      }
    });
  }
  return out;
}

function columns(r: LineProbeResult): Float64Array[] {
  return r.fields.flatMap((f) => f.columns);
}

/** probeLine on a fresh copy (the scan path) against the tree path on another fresh copy, sample by sample. */
function expectSameAsTree(d: Dataset, from: Vec3, to: Vec3, n: number, brute = false, via: 'scan' | 'tree' | 'either' = 'either'): LineProbeResult {
  const a = fresh(d);
  const r = probeLine(a, from, to, { samples: n, fields: ['lin', 'swirl', 'id'] });
  if (via !== 'either') expect(hasCellTree(a)).toBe(via === 'tree');
  const ref = treeLine(fresh(d), from, to, n);
  if (r.count === 0) {
    expect(Array.from(ref.cell).every((c) => c < 0)).toBe(true);
    return r;
  }
  expect(Array.from(r.cell)).toEqual(Array.from(ref.cell));
  const got = columns(r);
  for (let c = 0; c < got.length; c++) {
    for (let i = 0; i < n; i++) {
      const x = got[c]![i]!, y = ref.values[c]![i]!;
      if (Number.isNaN(y)) expect(x).toBeNaN();
      else expect(Math.abs(x - y)).toBeLessThanOrEqual(1e-12 * Math.max(1, Math.abs(y)));
    }
  }
  if (brute) expect(Array.from(r.cell)).toEqual(Array.from(bruteCells(d, from, to, n)));
  return r;
}

/** Lines through a dataset's box: corner to corner, through nodes, along a face plane, partly and wholly outside. */
function linesFor(d: Dataset, seed: number): [Vec3, Vec3][] {
  const b = datasetBounds(d), r = rng(seed);
  const at = (fx: number, fy: number, fz: number): Vec3 => [b[0] + fx * (b[1] - b[0]), b[2] + fy * (b[3] - b[2]), b[4] + fz * (b[5] - b[4])];
  const p = d.pieces[0]!;
  const node = (i: number): Vec3 => [p.points[3 * i]!, p.points[3 * i + 1]!, p.points[3 * i + 2]!];
  const np = p.points.length / 3;
  const lines: [Vec3, Vec3][] = [
    [at(0, 0, 0), at(1, 1, 1)],
    [at(-0.3, 0.5, 0.5), at(1.3, 0.45, 0.55)],
    [at(0, 0.5, 0.5), at(1, 0.5, 0.5)],
    [at(0.5, 0.5, 0), at(0.5, 0.5, 1)],
    [at(0, 0, 0.5), at(1, 0, 0.5)],
    [at(2, 2, 2), at(3, 3, 3)],
    [node(0), node(np - 1)],
    [node(Math.floor(np / 3)), node(Math.floor((2 * np) / 3))],
  ];
  for (let k = 0; k < 4; k++) lines.push([at(r(), r(), r()), at(r(), r(), r())]);
  return lines;
}

describe('line samples by a scan of cell blocks', () => {
  for (const { name, dataset } of meshesOfEveryType(4)) {
    it(`${name}: every sample's cell and value as the tree path gives them, and as brute force`, () => {
      for (const [a, b] of linesFor(dataset, name.length)) {
        expectSameAsTree(dataset, a, b, 57, true, 'scan');
        // Samples on the lattice planes of the mesh (every 1/8 of the way, i.e. on faces and nodes before jitter).
        expectSameAsTree(dataset, a, b, 33, false, 'scan');
      }
    });
  }

  it('regular lattices: samples exactly on shared faces, edges and nodes go to the lowest cell id, as on the tree path', () => {
    for (const d of [datasetOf([hexGrid(5, 5, 5)]), datasetOf([tetGrid(4, 4, 4)])]) {
      expectSameAsTree(d, [0, 0, 0], [1, 1, 1], 21, true, 'scan');
      expectSameAsTree(d, [0, 0.4, 0.6], [1, 0.4, 0.6], 26, true, 'scan');
      expectSameAsTree(d, [0.2, 0, 0], [0.2, 1, 1], 11, true, 'scan');
      expectSameAsTree(d, [1, 1, 1], [1.5, 1.5, 1.5], 11, true, 'scan');
    }
  });

  it('pentagonal and hexagonal prisms stacked in a column: the same cells and values as the tree path and brute force', () => {
    for (const [type, m] of [[15, 5], [16, 6]] as const) {
      const pts: number[] = [], nodes: number[][] = [];
      for (let level = 0; level <= 4; level++) {
        for (let k = 0; k < m; k++) pts.push(Math.cos((2 * Math.PI * k) / m) + 0.05 * level, Math.sin((2 * Math.PI * k) / m), 0.4 * level);
      }
      for (let level = 0; level < 4; level++) nodes.push(Array.from({ length: 2 * m }, (_, i) => level * m + i));
      const d = datasetOf([pieceFromCells(pts, { types: nodes.map(() => type), nodes })]);
      expectSameAsTree(d, [0.1, 0.1, -0.2], [0.2, -0.1, 1.8], 41, true, 'scan');
      expectSameAsTree(d, [-1.2, 0.3, 0.8], [1.3, -0.2, 0.8], 50, true, 'scan');
      expectSameAsTree(d, [0, 0, 0], [0.2, 0, 1.6], 9, true, 'scan');
    }
  });

  it('a multi-piece dataset with 2D cells and a polyhedral piece: global ids as on the tree path and brute force', () => {
    const tri = pieceFromCells([0, 0, 0, 1, 0, 0, 0, 1, 0], { types: [5], nodes: [[0, 1, 2]] });
    const poly = meshesOfEveryType(3)[5]!.dataset.pieces[0]!;
    // Side by side along x, touching: samples on the shared planes go to the lower global id.
    const d = datasetOf([jitteredHex(4), tri, moved(poly, 1), moved(jitteredTet(3, 0.1, 7), 2)]);
    for (const [a, b] of linesFor(d, 9)) expectSameAsTree(d, a, b, 64, true, 'scan');
    // The same pieces on top of each other: cells of different pieces overlap, and the scan hands such lines to the tree.
    const overlapping = datasetOf([jitteredHex(4), tri, poly, jitteredTet(3, 0.1, 7)]);
    for (const [a, b] of linesFor(overlapping, 10)) expectSameAsTree(overlapping, a, b, 64);
    expectSameAsTree(overlapping, [0.1, 0.2, 0.3], [0.9, 0.8, 0.7], 64, false, 'tree');
  });

  it('a line whose blocks hold too many cells, and one after the scan budget, take the tree; the answer is the same', () => {
    // Cells in a scattered order: every block spans the whole mesh.
    const h = jitteredHex(12), nc = h.cellTypes.length, perm = Array.from({ length: nc }, (_, i) => i);
    const r = rng(3);
    for (let i = nc - 1; i > 0; i--) { const j = Math.floor(r() * (i + 1)); [perm[i], perm[j]] = [perm[j]!, perm[i]!]; }
    const nodes = perm.map((c) => Array.from(h.connectivity.subarray(8 * c, 8 * c + 8)));
    const scattered = datasetOf([pieceFromCells(h.points, { types: nodes.map(() => 12), nodes })]);
    const blocks = buildCellBlocks(scattered);
    expect(scanLineSamples(blocks, [0, 0, 0], [1, 1, 1], 50, TOL, nc / 8)).toBeNull();
    const a = fresh(scattered);
    expect(hasCellTree(a)).toBe(false);
    expectSameAsTree(scattered, [0, 0.1, 0.2], [1, 0.9, 0.8], 40);
    // In generator order a line scans a few blocks, and many lines later the budget runs out and the tree is built.
    const ordered = fresh(datasetOf([jitteredHex(12)]));
    probeLine(ordered, [0, 0.5, 0.5], [1, 0.5, 0.5], { samples: 30 });
    expect(hasCellTree(ordered)).toBe(false);
    for (let k = 0; k < 400 && !hasCellTree(ordered); k++) probeLine(ordered, [0, k / 400, 0], [1, k / 400, 1], { samples: 30 });
    expect(hasCellTree(ordered)).toBe(true);
  });

  it('overlapping cells (one cell twice): the scan reports the ambiguity and the line takes the tree path', () => {
    const h = hexGrid(3, 3, 3);
    const nodes: number[][] = [];
    for (let c = 0; c < h.cellTypes.length; c++) nodes.push(Array.from(h.connectivity.subarray(8 * c, 8 * c + 8)));
    nodes.push(nodes[13]!);
    const d = datasetOf([pieceFromCells(h.points, { types: nodes.map(() => 12), nodes })]);
    const s = scanLineSamples(buildCellBlocks(d), [0, 0.5, 0.5], [1, 0.5, 0.5], 31, TOL);
    expect(s!.ambiguous).toBe(true);
    const r = expectSameAsTree(d, [0, 0.5, 0.5], [1, 0.5, 0.5], 31, false, 'tree');
    expect(r.validCount).toBe(31);
  });

  it('block boxes hold every cell of their block, padded', () => {
    const d = datasetOf([jitteredTet(5), jitteredHex(4)]);
    const b = getCellBlocks(d);
    expect(b.pieceBlocks[2]).toBe(Math.ceil(d.pieces[0]!.cellTypes.length / BLOCK) + Math.ceil(d.pieces[1]!.cellTypes.length / BLOCK));
    d.pieces.forEach((p, k) => {
      for (let c = 0; c < p.cellTypes.length; c++) {
        const o = 6 * (b.pieceBlocks[k]! + Math.floor(c / BLOCK));
        for (let q = p.offsets[c]!; q < p.offsets[c + 1]!; q++) {
          for (let a = 0; a < 3; a++) {
            const v = p.points[3 * p.connectivity[q]! + a]!;
            expect(v).toBeGreaterThan(b.boxes[o + 2 * a]!);
            expect(v).toBeLessThan(b.boxes[o + 2 * a + 1]!);
          }
        }
      }
    });
  });

  it('group and super-group boxes are the unions of the boxes below them; the volume cells are counted', () => {
    // two pieces whose block counts are not multiples of GROUP, so a group straddles the pieces; 2D cells in the first
    const d = datasetOf([tetsWithTriangles(jitteredTet(5), 3), jitteredHex(4)]);
    const b = getCellBlocks(d);
    const union = (boxes: Float32Array, from: number, to: number): number[] => {
      const u = [Infinity, -Infinity, Infinity, -Infinity, Infinity, -Infinity];
      for (let j = from; j < to; j++) {
        if (!(boxes[6 * j]! <= boxes[6 * j + 1]!)) continue;
        for (let a = 0; a < 3; a++) { u[2 * a] = Math.min(u[2 * a]!, boxes[6 * j + 2 * a]!); u[2 * a + 1] = Math.max(u[2 * a + 1]!, boxes[6 * j + 2 * a + 1]!); }
      }
      return u;
    };
    const nb = b.boxes.length / 6, ng = b.groupBoxes.length / 6;
    expect(ng).toBe(Math.ceil(nb / GROUP));
    for (let g = 0; g < ng; g++) expect(Array.from(b.groupBoxes.subarray(6 * g, 6 * g + 6))).toEqual(union(b.boxes, g * GROUP, Math.min(nb, (g + 1) * GROUP)));
    for (let s = 0; s < b.superBoxes.length / 6; s++) expect(Array.from(b.superBoxes.subarray(6 * s, 6 * s + 6))).toEqual(union(b.groupBoxes, s * GROUP, Math.min(ng, (s + 1) * GROUP)));
    const volume = d.pieces.reduce((n, p) => n + p.cellTypes.filter((t) => cellDimension(t) === 3).length, 0);
    expect(b.volumeCellCount).toBe(volume);
    expect(b.volumeCellCount).toBeLessThan(b.cellCount);
  });
});

const EXTERNAL = resolve(__dirname, '../fixtures/external');

function externalFiles(dir: string): string[] {
  return readdirSync(dir).flatMap((f) => {
    const p = join(dir, f);
    if (statSync(p).isDirectory()) return externalFiles(p);
    return /\.(vtu|vtk|vtm|pvtu)$/.test(f) ? [p] : [];
  });
}

describe('line samples by a scan of cell blocks on real files', () => {
  it('every external file with volume cells: the same cells and values as the tree path', async () => {
    let checked = 0;
    for (const path of externalFiles(EXTERNAL)) {
      let d: Dataset;
      try { d = await loadDatasetFile(path); } catch { continue; } // files the readers refuse are tested in tests/io
      if (!d.pieces.some((p) => p.cellTypes.some((t) => cellDimension(t) === 3))) continue;
      for (const [a, b] of linesFor(d, checked + 1)) expectSameAsTree(d, a, b, 97);
      checked++;
    }
    expect(checked).toBeGreaterThanOrEqual(8);
  });
});
