/**
 * Re-runs tests/reference/gradient_reference.py --check (Debian python3-vtk9): VTK 9.1's gradient filter
 * on the sample fields must still give the committed tests/reference/expected/gradient JSON, which
 * tests/derive/gradientReference.test.ts compares fieldtally's gradients with.
 */
import { resolve } from 'node:path';
import { expect, it } from 'vitest';
import { runVtkScript } from './requirements.ts';

it('VTK 9.1 gradient filter on the sample fields equals tests/reference/expected/gradient', () => {
  const out = runVtkScript(resolve(__dirname, '../reference/gradient_reference.py'), ['--check']);
  expect(out).not.toMatch(/differs/);
});
