/**
 * Re-runs the VTK probe reference script (vtkLineSource + vtkProbeFilter, Debian python3-vtk9) and checks
 * that VTK's line probes today equal the committed JSON in tests/reference/expected/probe/, which
 * tests/locate/probeReference.test.ts compares fieldtally against with Node only.
 */
import { resolve } from 'node:path';
import { expect, it } from 'vitest';
import { runVtkScript } from './requirements.ts';

it('VTK 9.1 line probes equal tests/reference/expected/probe', () => {
  const script = resolve(__dirname, '../reference/probe_reference.py');
  const out = runVtkScript(script, ['--check']);
  expect(out).toMatch(/7 files checked, 0 difference\(s\)/);
  expect(out).not.toMatch(/differs/);
});
