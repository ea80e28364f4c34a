/**
 * Re-runs the VTK cut reference (tests/reference/cut_reference.py: vtkCutter + vtkIntegrateAttributes on the
 * sample fields, Debian python3-vtk9) and checks fieldtally's cut integrals against the fresh numbers, and
 * that the committed tests/reference/expected/cut/cut_reference.json still equals what VTK computes today.
 * Fails with "install with: apt-get install -y python3-vtk9" when VTK's Python bindings are missing.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { expect, it } from 'vitest';
import { integratePlane } from '../../src/cut/planeIntegrals.ts';
import { cutCases } from '../reference/cutInputs.ts';
import { compareWithVtk, readReference } from '../cut/vtkCompare.ts';
import { runVtkScript } from './requirements.ts';

it('VTK 9 cut-plane integrals of the sample fields: fresh run agrees with fieldtally and with the committed JSON', () => {
  const dir = mkdtempSync(join(tmpdir(), 'fieldtally-cut-'));
  try {
    const fresh = join(dir, 'cut_reference.json');
    runVtkScript(resolve(__dirname, '../reference/cut_reference.py'), [fresh]);
    const now = readReference(fresh);
    const committed = readReference(resolve(__dirname, '../reference/expected/cut/cut_reference.json'));
    expect(now.cases.map((c) => c.name)).toEqual(committed.cases.map((c) => c.name));
    now.cases.forEach((c, i) => c.planes.forEach((p, j) => {
      const q = committed.cases[i]!.planes[j]!;
      expect(Math.abs(p.area / q.area - 1), `${c.name}#${j} area, fresh vs committed`).toBeLessThan(1e-12);
    }));
    for (const c of cutCases()) {
      const ref = now.cases.find((x) => x.name === c.name)!;
      c.planes.forEach((p, i) => compareWithVtk(`${c.name}#${i}`, integratePlane(c.dataset, { origin: p.origin, normal: p.normal }).integrals, ref.planes[i]!));
    }
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
});
