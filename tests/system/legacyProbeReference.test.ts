/**
 * Re-runs tests/reference/legacy_probe.py --check (Debian python3-vtk9): VTK 9.1's reading of the
 * external legacy files and of the VTK-written fixtures in tests/reference/expected/legacy/fixtures must
 * equal the committed JSON that tests/io/vtkLegacy.test.ts compares the legacy reader against.
 */
import { resolve } from 'node:path';
import { expect, it } from 'vitest';
import { runVtkScript } from './requirements.ts';

it('VTK 9.1 reading of the legacy files equals tests/reference/expected/legacy', () => {
  const out = runVtkScript(resolve(__dirname, '../reference/legacy_probe.py'), ['--check']);
  expect(out).toMatch(/20 files checked, 0 difference\(s\)/);
  expect(out).not.toMatch(/differs/);
});
