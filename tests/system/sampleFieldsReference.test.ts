/**
 * Re-runs tests/reference/sample_fields.py (Debian python3-vtk9) over sample-fields/ and checks that
 * what VTK reads today equals the committed tests/reference/expected/samples/sample-fields.json, which
 * tests/samples/vtkReference.test.ts compares against with Node only.
 */
import { resolve } from 'node:path';
import { expect, it } from 'vitest';
import { runVtkScript } from './requirements.ts';

it('VTK 9.1 reading of the committed sample files equals tests/reference/expected/samples', () => {
  const out = runVtkScript(resolve(__dirname, '../reference/sample_fields.py'), ['--check']);
  expect(out).not.toMatch(/differs/);
});
