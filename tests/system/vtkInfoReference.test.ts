/**
 * Re-runs the VTK reference script (Debian python3-vtk9) over tests/fixtures/external and checks
 * that what VTK reads today equals the committed expected JSON that `npm test` compares against.
 */
import { resolve } from 'node:path';
import { expect, it } from 'vitest';
import { runVtkScript } from './requirements.ts';

it('VTK 9.1 load reports of the external files equal tests/reference/expected/info', () => {
  const script = resolve(__dirname, '../reference/vtk_info.py');
  const out = runVtkScript(script, ['--check']);
  expect(out).not.toMatch(/differs/);
});
