/**
 * The committed sample series of the decaying vortex cell (taylorGreen.ts), written two ways so both
 * series inputs are exercised:
 *  - `vortex-cell/cells.pvd` listing `cells-<n>.vtu` (zlib XML) — times from the collection, uneven;
 *  - `vortex-cell-numbered/cells_<nnnn>.vtu` (zlib XML, 32-bit headers) — times from each file's `TimeValue` field data.
 * Plus a README and the probe set `vortex-cell.probes.json` (in examples/) that the tests and docs use.
 */
import { writeVtu } from '../io/writeVtu.ts';
import { VORTEX_DEFAULTS, VORTEX_TIMES, velocityDecayRate, vortexMesh, vortexStep, wavenumber } from './taylorGreen.ts';

/** Folders (inside sample-fields/) of the two forms. */
export const VORTEX_PVD_DIR = 'vortex-cell';
export const VORTEX_NUMBERED_DIR = 'vortex-cell-numbered';

/** Every file of the sample series: path relative to sample-fields/ → bytes. */
export function vortexSeriesFiles(): Record<string, Uint8Array> {
  const o = VORTEX_DEFAULTS, mesh = vortexMesh(o), enc = new TextEncoder();
  const out: Record<string, Uint8Array> = {};
  const lines = ['<?xml version="1.0"?>', '<VTKFile type="Collection" version="0.1" byte_order="LittleEndian">', '  <Collection>'];
  VORTEX_TIMES.forEach((t, i) => {
    const name = `cells-${i}.vtu`;
    out[`${VORTEX_PVD_DIR}/${name}`] = writeVtu(vortexStep(t, o, mesh, name), { encoding: 'zlib', level: 9 });
    lines.push(`    <DataSet timestep="${t}" group="" part="0" file="${name}"/>`);
    const numbered = `cells_${String(i + 1).padStart(4, '0')}.vtu`;
    out[`${VORTEX_NUMBERED_DIR}/${numbered}`] = writeVtu(vortexStep(t, o, mesh, numbered), { encoding: 'zlib', headerType: 'UInt32', idType: 'Int32', level: 9 });
  });
  lines.push('  </Collection>', '</VTKFile>', '');
  out[`${VORTEX_PVD_DIR}/cells.pvd`] = enc.encode(lines.join('\n'));
  const readme = [
    '# Decaying vortex cell (sample series)',
    '',
    'A thin layer of water in a square tray cell, stirred into a lattice of counter-rotating vortices and left to',
    'decay: the Taylor–Green vortex, an exact solution of the Navier–Stokes equations (Taylor & Green 1937,',
    'Proc. R. Soc. Lond. A 158, 499–521):',
    '',
    '    u = U sin(kx) cos(ky) e^(−2νk²t),  v = −U cos(kx) sin(ky) e^(−2νk²t),  w = 0',
    '    p = (ρU²/4)(cos 2kx + cos 2ky) e^(−4νk²t)',
    '',
    `L = ${o.side} m (one period, k = 2π/L = ${wavenumber(o).toPrecision(6)} 1/m), layer ${o.thickness} m thick, U = ${o.speed} m/s,`,
    `ν = ${o.nu} m²/s, ρ = ${o.rho} kg/m³; ${o.cells}×${o.cells}×1 hexahedra. Velocities decay at 2νk² = ${velocityDecayRate(o).toPrecision(6)} 1/s,`,
    `pressure at 4νk² = ${(2 * velocityDecayRate(o)).toPrecision(6)} 1/s. Uneven steps at t = ${VORTEX_TIMES.join(', ')} s.`,
    '',
    `- \`${VORTEX_PVD_DIR}/cells.pvd\`: collection file (times from its timestep attributes) over zlib-compressed .vtu files.`,
    `- \`${VORTEX_NUMBERED_DIR}/cells_0001.vtu …\`: the same steps as numbered zlib .vtu files, each with its time in`,
    '  `TimeValue` field data.',
    '',
    'Try: `npx fieldtally history sample-fields/vortex-cell/cells.pvd --probes examples/vortex-cell.probes.json --csv`',
    '',
    'Invented scenario for demonstration and checks; regenerate with `npm run make-fields`.',
    '',
  ].join('\n');
  out[`${VORTEX_PVD_DIR}/README.md`] = enc.encode(readme);
  return out;
}
