/**
 * Re-runs tests/reference/legacy_group_names.py --check (Debian python3-vtk9): VTK 9.1's legacy reader must
 * read the committed tests/fixtures/group-names/tank-*.vtk as recorded in
 * tests/reference/expected/legacy_group_names.json, which tests/surface/legacyGroupNames.test.ts compares
 * our reader against.
 */
import { resolve } from 'node:path';
import { expect, it } from 'vitest';
import { runVtkScript } from './requirements.ts';

it('VTK 9.1 reading of the legacy group-name fixtures equals tests/reference/expected/legacy_group_names.json', () => {
  const out = runVtkScript(resolve(__dirname, '../reference/legacy_group_names.py'), ['--check']);
  expect(out).toMatch(/legacy group names: same/);
});
