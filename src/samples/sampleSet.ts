/**
 * The sample files the generator writes, as pure data: each entry makes its bytes in memory, so the
 * generator (`makeFields.ts`) writes them and a test regenerates and compares them.
 *  - the committed set in `sample-fields/` (small, zlib-compressed `.vtu` plus one legacy `.vtk`);
 *  - the load-benchmark set in `sample-fields/large/` (about a million cells each, every encoding).
 */
import type { Dataset } from '../model/dataset.ts';
import { writeLegacyVtk } from '../io/writeLegacy.ts';
import { writeVtu } from '../io/writeVtu.ts';
import { ductCase } from './duct.ts';
import { PIPE_LEVELS, pipeCase, type PipeOptions } from './pipe.ts';
import { sphereCase, type SphereOptions } from './sphere.ts';

/** Which scenario a file shows (for the README). */
export type Scenario = 'pipe' | 'sphere-stokes' | 'sphere-potential' | 'duct';

/** One file of a set. */
export interface SampleEntry {
  /** File name inside the set's folder. */
  name: string;
  scenario: Scenario;
  /** One line for the README: mesh and data. */
  summary: string;
  /** The dataset the file holds. */
  dataset: () => Dataset;
  /** Encodes a dataset as this file's bytes. */
  encode: (d: Dataset) => Uint8Array;
}

const vtuZlib = (d: Dataset) => writeVtu(d, { encoding: 'zlib', headerType: 'UInt64', idType: 'Int64', level: 9 });

/** Options of the committed samples, exported so tests and docs build the same cases. */
export const COMMITTED_CASES = {
  pipeCoarse: { ...PIPE_LEVELS.coarse } as Partial<PipeOptions>,
  pipeMedium: { ...PIPE_LEVELS.medium } as Partial<PipeOptions>,
  pipeFine: { ...PIPE_LEVELS.fine } as Partial<PipeOptions>,
  pipeMediumCells: { ...PIPE_LEVELS.medium, association: 'cell' } as Partial<PipeOptions>,
  pipeWedgeCore: { ...PIPE_LEVELS.medium, core: 'wedge' } as Partial<PipeOptions>,
  sphereStokes: { flow: 'stokes', refinement: 2 } as Partial<SphereOptions>,
  sphereStokesCells: { flow: 'stokes', refinement: 1, association: 'cell' } as Partial<SphereOptions>,
  spherePotential: { flow: 'potential', refinement: 1 } as Partial<SphereOptions>,
} as const;

/** The committed set, written to `sample-fields/` (README.md comes from `sampleReadme`). */
export function committedSamples(): SampleEntry[] {
  const c = COMMITTED_CASES;
  return [
    { name: 'pipe-coarse.vtu', scenario: 'pipe', summary: 'coarse level: 16 around × 4 ring layers × 16 along, point data', dataset: () => pipeCase(c.pipeCoarse), encode: vtuZlib },
    { name: 'pipe-medium.vtu', scenario: 'pipe', summary: 'medium level: 24 × 6 × 24, point data', dataset: () => pipeCase(c.pipeMedium), encode: vtuZlib },
    { name: 'pipe-fine.vtu', scenario: 'pipe', summary: 'fine level: 36 × 9 × 36, point data', dataset: () => pipeCase(c.pipeFine), encode: vtuZlib },
    { name: 'pipe-medium-celldata.vtu', scenario: 'pipe', summary: 'medium level, cell data (values at cell centroids)', dataset: () => pipeCase(c.pipeMediumCells), encode: vtuZlib },
    { name: 'pipe-wedge-core.vtu', scenario: 'pipe', summary: 'medium level with wedges around the axis instead of the hex core, point data', dataset: () => pipeCase(c.pipeWedgeCore), encode: vtuZlib },
    {
      name: 'pipe-coarse.vtk', scenario: 'pipe', summary: 'the coarse level again as a legacy file (version 4.2, big-endian binary)',
      dataset: () => pipeCase(c.pipeCoarse), encode: (d) => writeLegacyVtk(d, { binary: true, version: '4.2', title: 'fieldtally sample: laminar flow in a coolant pipe (coarse)' }),
    },
    { name: 'sphere-stokes.vtu', scenario: 'sphere-stokes', summary: 'refinement 2 (12 divisions, 18 layers), point data', dataset: () => sphereCase(c.sphereStokes), encode: vtuZlib },
    { name: 'sphere-stokes-celldata.vtu', scenario: 'sphere-stokes', summary: 'refinement 1 (6 divisions, 9 layers), cell data', dataset: () => sphereCase(c.sphereStokesCells), encode: vtuZlib },
    { name: 'sphere-potential.vtu', scenario: 'sphere-potential', summary: 'refinement 1 (6 divisions, 9 layers), point data', dataset: () => sphereCase(c.spherePotential), encode: vtuZlib },
    { name: 'duct.vtu', scenario: 'duct', summary: '20 × 20 × 20 hexahedra, point data', dataset: () => ductCase(), encode: vtuZlib },
  ];
}

/** Options of the two benchmark meshes (fields in Float32, points in Float64). */
export const LARGE_CASES = {
  /** (32² core + 128 × 16 ring) per layer × 326 layers = 1 001 472 hexahedra, 1 025 799 points. */
  hex: { nTheta: 128, nRadial: 16, nAxial: 326, precision: 'Float32' } as Partial<PipeOptions>,
  /** 60 × 23² × 32 = 1 015 680 tetrahedra (+ 21 160 boundary triangles), 174 636 points. */
  tet: { flow: 'stokes', divisions: 23, layers: 32, precision: 'Float32' } as Partial<SphereOptions>,
} as const;

/** Encodings of every benchmark mesh: file suffix → encoder. */
export const LARGE_ENCODINGS: Readonly<Record<string, (d: Dataset) => Uint8Array>> = {
  'appended-raw.vtu': (d) => writeVtu(d, { encoding: 'appended-raw' }),
  'appended-zlib.vtu': (d) => writeVtu(d, { encoding: 'zlib' }),
  'base64.vtu': (d) => writeVtu(d, { encoding: 'base64' }),
  'ascii.vtu': (d) => writeVtu(d, { encoding: 'ascii' }),
  'legacy-binary.vtk': (d) => writeLegacyVtk(d, { binary: true, version: '5.1', title: 'fieldtally load benchmark' }),
};

/** The benchmark set, written to `sample-fields/large/` (git-ignored): two meshes × five encodings. */
export function largeSamples(): SampleEntry[] {
  const out: SampleEntry[] = [];
  const meshes: [string, Scenario, string, () => Dataset][] = [
    ['pipe-hex-1M', 'pipe', '1 001 472 hexahedra (pipe, 128 × 16 × 326), point data', () => pipeCase(LARGE_CASES.hex)],
    ['sphere-tet-1M', 'sphere-stokes', '1 015 680 tetrahedra + 21 160 triangles (Stokes sphere, 23 divisions, 32 layers), point data', () => sphereCase(LARGE_CASES.tet)],
  ];
  for (const [stem, scenario, summary, dataset] of meshes) {
    for (const [suffix, encode] of Object.entries(LARGE_ENCODINGS)) out.push({ name: `${stem}.${suffix}`, scenario, summary, dataset, encode });
  }
  return out;
}
