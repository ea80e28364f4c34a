/**
 * Re-runs tests/reference/xml_probe.py --check (Debian python3-vtk9): VTK 9.1's reading of the external
 * XML files and sets must equal the committed JSON in tests/reference/expected/xml/, which
 * tests/io/vtkXml.test.ts and tests/io/vtkSets.test.ts compare the XML readers against with Node only.
 */
import { resolve } from 'node:path';
import { expect, it } from 'vitest';
import { runVtkScript } from './requirements.ts';

it('VTK 9.1 reading of the XML files equals tests/reference/expected/xml', () => {
  const out = runVtkScript(resolve(__dirname, '../reference/xml_probe.py'), ['--check']);
  expect(out).toMatch(/16 files checked, 0 difference\(s\)/);
  expect(out).not.toMatch(/differs/);
});
