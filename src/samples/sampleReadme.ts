/**
 * The text of `sample-fields/README.md`: what each committed file holds, its exact solution and the
 * numbers an analysis should reproduce. Built from the same options and exact-solution functions as the
 * files, so the numbers cannot drift from the data.
 */
import { totalCells, totalPoints, type Dataset } from '../model/dataset.ts';
import { cellVolumes } from './cellMeasures.ts';
import { ductExact, DUCT_DEFAULTS } from './duct.ts';
import { pipeExact, pipeOptions } from './pipe.ts';
import { COMMITTED_CASES, LARGE_CASES, type SampleEntry } from './sampleSet.ts';
import { sphereExact, sphereOptions } from './sphere.ts';

/** A number with 10 significant digits (exponent form outside 1e-3…1e6). */
const num = (v: number): string => {
  if (v === 0) return '0';
  const a = Math.abs(v);
  const s = a >= 1e-3 && a < 1e6 ? String(Number(v.toPrecision(10))) : v.toExponential(9).replace(/\.?0+e/, 'e');
  return s.replace('e-', ' × 10^-').replace('e+', ' × 10^');
};

const kb = (bytes: number): string => `${(bytes / 1024).toFixed(1)} KiB`;

/** Mesh facts of a dataset: cells, points, volume of its 3D cells (m³). */
function meshFacts(d: Dataset): { cells: number; points: number; volume: number } {
  let volume = 0;
  for (const p of d.pieces) for (const v of cellVolumes(p)) volume += v;
  return { cells: totalCells(d), points: totalPoints(d), volume };
}

/** The README text for the committed files with their datasets and sizes (bytes). */
export function sampleReadme(files: { entry: SampleEntry; dataset: Dataset; bytes: number }[]): string {
  const pipe = pipeExact(COMMITTED_CASES.pipeMedium), po = pipeOptions(COMMITTED_CASES.pipeMedium);
  const stokes = sphereExact(COMMITTED_CASES.sphereStokes), pot = sphereExact(COMMITTED_CASES.spherePotential);
  const duct = ductExact();
  const rows = files.map(({ entry, dataset, bytes }) => `| \`${entry.name}\` | ${entry.summary} | ${totalCells(dataset)} | ${totalPoints(dataset)} | ${kb(bytes)} |`);
  const total = files.reduce((s, f) => s + f.bytes, 0);
  const pipeLevels = files.filter((f) => f.entry.scenario === 'pipe' && f.entry.name.endsWith('.vtu')).map(({ entry, dataset }) => {
    const m = meshFacts(dataset), exact = Math.PI * pipe.R * pipe.R * pipe.L;
    return `| \`${entry.name}\` | ${m.cells} | ${num(Math.cbrt(m.volume / m.cells))} | ${num(m.volume)} | ${((m.volume / exact - 1) * 100).toFixed(4)} % |`;
  });
  const so = sphereOptions(COMMITTED_CASES.sphereStokes);
  return `# Sample fields

Result files with exact solutions, made by \`npm run make-fields\` (source: \`src/samples/\`). Do not edit
them by hand: \`tests/samples/committed.test.ts\` checks that every file here is byte for byte what the
generator makes now. The scenarios are our own; the exact solutions come from the published formulas listed
in \`docs/references.md\`.

Numbers computed from these files are only as good as the mesh and the interpolation: the fields are
exact at the nodes (or cell centroids), not between them. Check convergence on the coarse/medium/fine
set before trusting a figure; for real designs defer to the applicable codes and licensed professional review.

## Conventions

- SI units everywhere: m, s, kg, Pa; velocity in m/s; \`p\` in Pa relative to the scenario's reference
  (0 at the pipe and duct outlets, 0 in the far field of the sphere).
- Format: VTK XML UnstructuredGrid (version 1.0), appended raw data, zlib-compressed (UInt64 block
  headers, Int64 ids, level 9); one \`.vtk\` legacy file (version 4.2, big-endian binary).
- Points Float64; fields Float64. Arrays: \`velocity\` (3 components), \`p\` (1); the sphere files add
  \`skinFriction\` (3, the wall shear stress vector: the force per area the fluid exerts along the wall) and the
  Int32 cell array \`group\`.
- \`-celldata\` files hold the same quantities as cell data, evaluated at the cell centroid.

| file | content | cells | points | size |
|---|---|---|---|---|
${rows.join('\n')}

Total: ${kb(total)}.

## Laminar water flow in a straight coolant pipe (\`pipe-*\`)

A pipe of radius R = ${num(pipe.R)} m and length L = ${num(pipe.L)} m along +z (inlet z = 0, outlet z = L),
axis on the z-axis; water at 20 °C (ρ = ${num(pipe.rho)} kg/m³, μ = ${num(pipe.mu)} Pa·s). The flow is taken as
fully developed over the whole length (Hagen–Poiseuille, docs/references.md §1):

- u_z = 2V(1 − r²/R²), u_x = u_y = 0; p = G(L − z), zero at the outlet.
- Mean velocity V = ${num(pipe.V)} m/s; centre-line velocity ${num(pipe.uMax)} m/s; Re (diameter) = ${num(pipe.Re)}.
- Volume flow rate Q = πR²V = ${num(pipe.Q)} m³/s; mass flow rate ${num(pipe.massFlow)} kg/s.
- Pressure gradient G = 8μV/R² = ${num(pipe.G)} Pa/m; pressure drop over L: ${num(pipe.dp)} Pa
  (inlet pressure ${num(pipe.dp)} Pa, outlet 0).
- Wall shear stress 4μV/R = ${num(pipe.wallShearStress)} Pa; Darcy friction factor 64/Re = ${num(pipe.fDarcy)}.
- Kinetic-energy coefficient α = 2, momentum coefficient β = 4/3; mass-weighted mean axial velocity 4V/3 = ${num((4 * pipe.V) / 3)} m/s.

Mesh: an O-grid cross-section — a ring of hexahedra along the wall around a core block of hexahedra
with slightly bulged sides (\`pipe-wedge-core.vtu\`: wedges around the axis instead) — extruded along z.
Wall nodes lie on r = R; the faceted wall makes the mesh volume converge to πR²L at second order.
Levels refine every direction by 1.5 (coarse ${'→'} medium ${'→'} fine, cell count × 3.375):

| file | cells | h = (volume/cells)^(1/3) (m) | mesh volume (m³) | vs πR²L |
|---|---|---|---|---|
${pipeLevels.join('\n')}

(πR²L = ${num(Math.PI * pipe.R * pipe.R * pipe.L)} m³; the medium level has nTheta = ${po.nTheta}, nRadial = ${po.nRadial}, nAxial = ${po.nAxial}.)

## Slow viscous flow past a small sphere (\`sphere-stokes*\`)

A small bead settling slowly through a viscous syrup, seen from the bead (demo values of our own):
sphere radius a = ${num(stokes.a)} m at the origin, uniform stream U = ${num(stokes.U)} m/s along +x,
μ = ${num(stokes.mu)} Pa·s, ρ = ${num(stokes.rho)} kg/m³, Re (diameter) = ${num(stokes.Re)}. Stokes' solution (docs/references.md §3), p∞ = 0:

- u = U − (3a/4)(U/r + (U·x)x/r³) − (a³/4)(U/r³ − 3(U·x)x/r⁵); p = −(3/2)μa(U·x)/r³.
- On the wall: no slip; p = −(3μU/2a)cos θ (θ from +x), from +${num(stokes.wallShearMax)} Pa at the front
  stagnation point to −${num(stokes.wallShearMax)} Pa at the rear; wall shear stress (3μ/2a)(U − (U·n)n) (U the stream velocity vector), largest
  ${num(stokes.wallShearMax)} Pa at the equator; viscous normal stress zero.
- Drag (along +x): total 6πμaU = ${num(stokes.dragTotal)} N = pressure 2πμaU = ${num(stokes.dragPressure)} N
  + viscous 4πμaU = ${num(stokes.dragViscous)} N; lift and side force 0.
- Drag coefficient on πa² = ${num(stokes.frontalArea)} m² and ½ρU² = ${num(stokes.dynamicPressure)} Pa:
  C_D = 24/Re = ${num(stokes.CD)} (pressure ${num(stokes.CDPressure)}, viscous ${num(stokes.CDViscous)}).

Mesh: tetrahedra filling the shell a ≤ r ≤ ${num(stokes.outerRadius)} m (5a), conforming (no hanging
faces), built from a geodesic triangulation of the sphere repeated on concentric spheres whose radii
grow geometrically; \`sphere-stokes.vtu\` has ${so.divisions} divisions per icosahedron edge and ${so.layers} layers.
The files also hold triangle cells on the sphere wall and on the outer sphere, oriented out of the fluid
(into the sphere on the wall). Cell array \`group\`: 0 tetrahedra, 1 sphere wall, 2 outer boundary.
\`skinFriction\` is the exact value at wall nodes (wall triangles in the cell-data file), zero elsewhere.
Shell volume 4π(R_o³ − a³)/3 = ${num(stokes.shellVolume)} m³.

## Potential flow past a sphere (\`sphere-potential.vtu\`)

The inviscid idealisation of a ball of radius a = ${num(pot.a)} m in an air stream U = ${num(pot.U)} m/s along +x
(ISA sea-level air, ρ = ${num(pot.rho)} kg/m³), same kind of mesh (outer radius ${num(pot.outerRadius)} m). potential-flow sphere (Katz 2016), docs/references.md §4:

- u = ∇[(U·x)(1 + a³/2r³)]; p = ½ρ(U² − |u|²), p∞ = 0.
- Wall: Cp = 1 − (9/4)sin²θ: Cp = 1 (p = ${num(pot.dynamicPressure)} Pa) at both stagnation points, −1.25
  (p = ${num(-1.25 * pot.dynamicPressure)} Pa) on the equator, where the slip velocity is 1.5U = ${num(1.5 * pot.U)} m/s.
- Zero drag and zero lift (d'Alembert); \`skinFriction\` is zero (inviscid).

## Fully developed flow in a square duct (\`duct.vtu\`)

A square cooling channel of a cold plate, ${num(2 * duct.a)} m × ${num(2 * duct.b)} m (|x| ≤ a, |y| ≤ b, a = b = ${num(duct.a)} m),
length ${num(duct.L)} m along +z; water at 20 °C as above; ${DUCT_DEFAULTS.nx} × ${DUCT_DEFAULTS.ny} × ${DUCT_DEFAULTS.nz} hexahedra.
Series solution (docs/references.md §2), summed to better than 1e-12 relative:

- Mean velocity V = ${num(duct.V)} m/s; Q = ${num(duct.Q)} m³/s; mass flow rate ${num(duct.massFlow)} kg/s.
- Pressure gradient G = ${num(duct.G)} Pa/m; p = G(L − z), drop over the length ${num(duct.dp)} Pa.
- Hydraulic diameter D_h = ${num(duct.Dh)} m; Re = ${num(duct.Re)}; Darcy fRe = ${num(duct.fRe)} (Fanning ${num(duct.fReFanning)}).
- Centre-line velocity ${num(duct.uMax)} m/s (u_max/V = ${num(duct.uMax / duct.V)}); mean wall shear stress G·A/P = ${num(duct.wallShearStress)} Pa.

## Load-benchmark files (\`large/\`, not committed)

\`npm run make-fields -- --large\` writes about a million cells per mesh into \`sample-fields/large/\`
(git-ignored): a refined pipe (${LARGE_CASES.hex.nTheta} around × ${LARGE_CASES.hex.nRadial} ring layers × ${LARGE_CASES.hex.nAxial} along,
1 001 472 hexahedra) and a refined Stokes sphere (${LARGE_CASES.tet.divisions} divisions × ${LARGE_CASES.tet.layers} layers, 1 015 680 tetrahedra
plus 21 160 triangles), each as appended raw, appended zlib, inline base64 and ASCII \`.vtu\` (UInt64
headers, Int64 ids) and as legacy binary \`.vtk\` (version 5.1). Points Float64, fields Float32.
`;
}
