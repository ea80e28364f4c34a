/**
 * Re-runs tests/reference/iso_reference.py --check (Debian python3-vtk9): VTK 9.1's contour filter on the
 * sample fields must still give the committed tests/reference/expected/iso JSON, which
 * tests/iso/isoReference.test.ts compares fieldtally's iso-surfaces with.
 */
import { resolve } from 'node:path';
import { expect, it } from 'vitest';
import { runVtkScript } from './requirements.ts';

it('VTK 9.1 contour filter on the sample fields equals tests/reference/expected/iso', () => {
  const out = runVtkScript(resolve(__dirname, '../reference/iso_reference.py'), ['--check']);
  expect(out).not.toMatch(/differs/);
}, 120_000);
