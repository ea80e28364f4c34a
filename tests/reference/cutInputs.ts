/**
 * Inputs of the cut reference (`cut_reference.py`): sample fields built in memory and the planes to cut
 * them with. The Node comparison (`tests/cut/cutReference.test.ts`) imports `cutCases()`; run as a script
 * (`node bin/run-ts.mjs tests/reference/cutInputs.ts <folder>`) it writes each case as a .vtu plus
 * `cases.json` (files and planes) into <folder>, for VTK to read.
 *
 * Every case keeps point and cell arrays under different names: VTK 9.1's attribute integration shadows a
 * point array by a cell array of the same name.
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import type { Dataset } from '../../src/model/dataset.ts';
import { datasetOf, field, pointFieldFrom, withFields } from '../../src/model/meshBuild.ts';
import { writeVtu } from '../../src/io/writeVtu.ts';
import { ductCase } from '../../src/samples/duct.ts';
import { pipeCase } from '../../src/samples/pipe.ts';
import { sphereCase } from '../../src/samples/sphere.ts';
import { SKEW, boxMesh, type BoxKind } from '../cut/meshes.ts';

export interface CutCase {
  name: string;
  dataset: Dataset;
  planes: { origin: [number, number, number]; normal: [number, number, number] }[];
}

/** A skewed box of five cell kinds in five pieces, with a linear and a quadratic point field and a cell field. */
function mixedBox(): Dataset {
  const pieces = (['hex', 'wedge', 'pyramid', 'polyhedron', 'tet'] as BoxKind[]).map((k, i) => {
    const slab = { m: SKEW.m.map((v, j) => (j % 3 === 0 ? v / 5 : v)), t: [SKEW.m[0]! * i / 5 + SKEW.t[0], SKEW.m[3]! * i / 5 + SKEW.t[1], SKEW.m[6]! * i / 5 + SKEW.t[2]] as [number, number, number] };
    const p = boxMesh(k, 1, 3, 3, 0, slab);
    return withFields(p, [
      pointFieldFrom(p, 'linear', 1, (x, y, z, o) => { o[0] = 1 + 2 * x - y + 0.5 * z; }),
      pointFieldFrom(p, 'swirl', 3, (x, y, z, o) => { o[0] = y * z; o[1] = -x; o[2] = 1 + x * x; }),
    ], [field('cellValue', 'cell', 1, Float64Array.from(p.cellTypes, (_, c) => 10 * i + (c % 7)))]);
  });
  return datasetOf(pieces, 'mixed skewed box');
}

/** The reference cases (deterministic: the same meshes and fields on every call). */
export function cutCases(): CutCase[] {
  return [
    { name: 'pipe_hex_point', dataset: pipeCase({ nTheta: 24, nRadial: 6, nAxial: 12 }),
      planes: [{ origin: [0, 0, 0.0437], normal: [0, 0, 1] }, { origin: [0, 0, 0.05], normal: [0.2, -0.1, 1] }, { origin: [0.001, 0.002, 0.05], normal: [1, 0.3, 0] }] },
    { name: 'pipe_wedge_cell', dataset: pipeCase({ nTheta: 20, nRadial: 5, nAxial: 10, core: 'wedge', association: 'cell' }),
      planes: [{ origin: [0, 0, 0.031], normal: [0, 0, 1] }, { origin: [0, 0.001, 0.06], normal: [0.1, 0.3, 1] }] },
    { name: 'duct_point', dataset: ductCase({ nx: 12, ny: 12, nz: 6 }),
      planes: [{ origin: [0, 0, 0.0371], normal: [0, 0, 1] }, { origin: [0.001, 0, 0.05], normal: [1, 0.2, 0.3] }] },
    { name: 'sphere_stokes_tets', dataset: sphereCase({ refinement: 0 }),
      planes: [{ origin: [0, 0, 0], normal: [0, 0, 1] }, { origin: [0.0003, 0.0002, 0.0001], normal: [1, 1, 0.5] }] },
    { name: 'mixed_box', dataset: mixedBox(),
      planes: [{ origin: [1.2, -0.4, 2.9], normal: [0.3, 1, -0.2] }, { origin: [1.1, -0.2, 2.6], normal: [1, 0, 0] }] },
  ];
}

const isMain = import.meta.url === `file://${process.argv[1]}`;
if (isMain) {
  const dir = process.argv[2];
  if (!dir) throw new Error('usage: node bin/run-ts.mjs tests/reference/cutInputs.ts <folder>');
  mkdirSync(dir, { recursive: true });
  const manifest = cutCases().map((c) => {
    writeFileSync(join(dir, `${c.name}.vtu`), writeVtu(c.dataset, { encoding: 'appended-raw' }));
    return { name: c.name, file: `${c.name}.vtu`, planes: c.planes };
  });
  writeFileSync(join(dir, 'cases.json'), JSON.stringify(manifest, null, 2));
}
