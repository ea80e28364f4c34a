/**
 * Re-runs tests/reference/dfg/dfg_vtk.py --check (Debian python3-vtk9): VTK 9.1 must still read the 2D-1 fields
 * of tests/fixtures/dfg/ as recorded in tests/reference/expected/dfg/dfg_vtk.json, which
 * tests/surface/dfgFields.test.ts compares fieldtally's reading with.
 */
import { resolve } from 'node:path';
import { expect, it } from 'vitest';
import { runVtkScript } from './requirements.ts';

it('VTK 9.1 reads the DFG 2D-1 fields as tests/reference/expected/dfg records', () => {
  const out = runVtkScript(resolve(__dirname, '../reference/dfg/dfg_vtk.py'), ['--check']);
  expect(out).not.toMatch(/differs/);
});
