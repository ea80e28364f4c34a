/**
 * The pieces layer without files: for every volume cell type (polyhedra included), a unit cube in four pieces
 * is evaluated whole, and again from the partial documents of 2 and 3 tasks (footprint, sub-pieces, JSON text,
 * read back, assembled). Every probe's numbers and notes must agree; a plane on the cube's boundary face, a
 * line and a point through faces between pieces, and force and flux totals over the whole boundary are among
 * them. Published values: for a linear pressure p = 3x + 2y + z the pressure force on a closed surface is
 * ∮p n dA = ∫∇p dV (Gauss's divergence theorem), |F| = √14 for the unit cube; a divergence-free velocity has
 * zero net flux through it.
 */
import { describe, expect, it } from 'vitest';
import { datasetBounds, type Bounds } from '../../src/model/bounds.ts';
import { cellStarts, type Dataset } from '../../src/model/dataset.ts';
import { datasetOf, field, withFields } from '../../src/model/meshBuild.ts';
import type { Piece } from '../../src/model/piece.ts';
import { assembleParts } from '../../src/pieces/assemble.ts';
import { encodeTask } from '../../src/pieces/encodeTask.ts';
import { PARTIAL_FORMAT, PARTIAL_VERSION, taskShare, type PartialDoc } from '../../src/pieces/partialDoc.ts';
import { readPartial } from '../../src/pieces/readPartial.ts';
import { subPiece } from '../../src/pieces/subPiece.ts';
import { evaluateProbeSet } from '../../src/study/evaluate.ts';
import type { ProbeSet } from '../../src/study/probeSet.ts';
import { meshesOfEveryType } from '../locate/meshes.ts';

/** Linear fields on a piece: velocity (1 + y, 2 + z, 3 + x) (divergence-free), p = 3x + 2y + z, and a cell number. */
function withFlow(p: Piece): Piece {
  const n = p.points.length / 3, u = new Float64Array(3 * n), pr = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const x = p.points[3 * i]!, y = p.points[3 * i + 1]!, z = p.points[3 * i + 2]!;
    u[3 * i] = 1 + y; u[3 * i + 1] = 2 + z; u[3 * i + 2] = 3 + x; pr[i] = 3 * x + 2 * y + z;
  }
  return withFields(p, [field('velocity', 'point', 3, u), field('p', 'point', 1, pr)],
    [field('cellNumber', 'cell', 1, Float64Array.from({ length: p.cellTypes.length }, (_, c) => c))]);
}

/** The piece cut into `n` bands of x by cell vertex average. */
function bandsOfX(p: Piece, n: number): Piece[] {
  const lists: number[][] = Array.from({ length: n }, () => []);
  let xMax = 0;
  for (let i = 0; i < p.points.length; i += 3) xMax = Math.max(xMax, p.points[i]!);
  for (let c = 0; c < p.cellTypes.length; c++) {
    let x = 0;
    for (let q = p.offsets[c]!; q < p.offsets[c + 1]!; q++) x += p.points[3 * p.connectivity[q]!]!;
    lists[Math.min(n - 1, Math.floor((x / (p.offsets[c + 1]! - p.offsets[c]!) / xMax) * n))]!.push(c);
  }
  return lists.map((cells) => subPiece(p, Int32Array.from(cells), new Float64Array(0)).piece);
}

/** The probe set on a mesh filling the box `b` (points given as fractions of the box). */
const setFor = (b: Bounds): ProbeSet => {
  const at = (u: number, v: number, w: number) => [b[0] + u * (b[1] - b[0]), b[2] + v * (b[3] - b[2]), b[4] + w * (b[5] - b[4])];
  return {
  format: 'fieldtally-probe-set', version: 2,
  probes: [
    { id: 'oblique', kind: 'cut-plane', label: 'Oblique', geometry: { origin: at(0.5, 0.5, 0.5), normal: [1, 0.3, 0.2] }, fields: { velocity: 'velocity', pressure: 'p', density: 2 } },
    { id: 'bottom', kind: 'cut-plane', label: 'On the bottom face', geometry: { origin: at(0, 0, 0), normal: [0, 0, 1] }, fields: { velocity: 'velocity', pressure: 'p', density: null } },
    { id: 'line', kind: 'line', label: 'Diagonal', geometry: { from: at(0.05, 0.1, 0.2), to: at(0.95, 0.9, 0.7) }, options: { samples: 33 } },
    { id: 'crossings', kind: 'line', label: 'Along x', geometry: { from: at(0, 0.37, 0.41), to: at(1, 0.37, 0.41) }, options: { spacing: 'cell-crossings' } },
    { id: 'point', kind: 'point', label: 'At a piece face', geometry: { at: at(0.5, 0.52, 0.48) } },
    { id: 'box', kind: 'force', label: 'Whole boundary', geometry: { surfaces: [0, 1, 2, 3, 4, 5] }, options: { viscous: 'none' }, fields: { pressure: 'p' } },
    { id: 'flux', kind: 'mass-balance', label: 'Closed box', geometry: { planes: [], surfaces: [0, 1, 2, 3, 4, 5] }, fields: { velocity: 'velocity', density: null } },
  ],
  } as unknown as ProbeSet;
};

/** The whole set evaluated from the documents of `tasks` tasks, each holding a contiguous share of the pieces. */
function viaParts(whole: Dataset, tasks: number, set: ProbeSet): Dataset {
  const parts = Array.from({ length: tasks }, (_, i) => {
    const { firstLeaf, endLeaf } = taskShare(i, tasks, whole.pieces.length);
    const d: Dataset = { ...whole, pieces: whole.pieces.slice(firstLeaf, endLeaf) };
    const doc: PartialDoc = {
      format: PARTIAL_FORMAT, version: PARTIAL_VERSION, tool: { name: 'fieldtally', version: 'test' }, createdAt: '',
      set: { file: 'cube.pvtu', source: 'cube.pvtu', sha256: '0'.repeat(64), leaves: whole.pieces.length },
      task: { index: i, count: tasks, firstLeaf, endLeaf },
      probeSet: { name: 'set.json', sha256: '1'.repeat(64), bytes: 0, role: 'probe set', fromVersion: 2, text: '' },
      units: null, inputs: [], ...encodeTask(d, set),
    };
    return readPartial(JSON.stringify(doc), `part-${i}.json`);
  });
  return assembleParts(parts.reverse()).dataset;
}

describe('assembled parts evaluate like the whole set', () => {
  for (const { name, dataset } of meshesOfEveryType(4)) {
    it(`${name}: four pieces, 2 and 3 tasks`, () => {
      const whole = datasetOf(bandsOfX(withFlow(dataset.pieces[0]!), 4), 'cube.pvtu');
      // every mesh fills a box (the voxels' is 1.5 × 1 × 0.7): |F| = √14 × volume, bottom face dx·dy
      const b = datasetBounds(whole), volume = (b[1] - b[0]) * (b[3] - b[2]) * (b[5] - b[4]);
      const SET = setFor(b);
      const a = evaluateProbeSet(whole, SET);
      expect(a.probes.filter((p) => !p.ok).map((p) => `${p.id}: ${p.error}`)).toEqual([]);
      const force = a.probes.find((p) => p.id === 'box')!.quantities;
      const f = ['force.x', 'force.y', 'force.z'].map((k) => force.find((q) => q.key === k)!.value);
      expect(Math.hypot(...f)).toBeCloseTo(Math.sqrt(14) * volume, 10);
      expect(a.probes.find((p) => p.id === 'flux')!.quantities.find((q) => q.key === 'net')!.value).toBeCloseTo(0, 12);
      expect(a.probes.find((p) => p.id === 'bottom')!.quantities.find((q) => q.key === 'area')!.value).toBeCloseTo((b[1] - b[0]) * (b[3] - b[2]), 12);
      for (const tasks of [2, 3]) {
        const assembled = viaParts(whole, tasks, SET);
        expect(cellStarts(assembled).at(-1)!).toBeLessThanOrEqual(cellStarts(whole).at(-1)!);
        const b = evaluateProbeSet(assembled, SET);
        b.probes.forEach((p, i) => {
          const q = a.probes[i]!;
          expect([p.id, p.ok, p.error, p.notes, p.quantities.map((x) => x.key)]).toEqual([q.id, q.ok, q.error, q.notes, q.quantities.map((x) => x.key)]);
          p.quantities.forEach((x, k) => {
            const y = q.quantities[k]!.value;
            if (!(Math.abs(x.value - y) <= 1e-12 * Math.max(Math.abs(y), 1e-3))) expect.fail(`${name}, ${tasks} tasks, ${p.id}.${x.key}: whole ${y}, assembled ${x.value}`);
          });
        });
      }
    });
  }
});
