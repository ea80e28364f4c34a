/**
 * Small meshes of every volume cell type for the locate tests, built from a lattice with its interior
 * nodes randomly moved (seeded, so every run sees the same meshes).
 */
import { CELL_FACES, CellType } from '../../src/model/cellTypes.ts';
import { datasetOf, hexGrid, pieceFromCells, tetGrid, type LatticeMap } from '../../src/model/meshBuild.ts';
import type { Dataset } from '../../src/model/dataset.ts';
import type { Piece } from '../../src/model/piece.ts';

import { seededRandom as rng } from '../../src/model/seededRandom.ts';

export { rng };

/** A map of the unit cube that moves interior lattice nodes by up to `amp` lattice steps (boundary nodes stay). */
export function jitter(n: number, amp: number, seed: number): LatticeMap {
  const r = rng(seed);
  const cache = new Map<string, [number, number, number]>();
  return (u, v, w) => {
    const key = `${u},${v},${w}`;
    let p = cache.get(key);
    if (!p) {
      const inside = (q: number) => q > 1e-12 && q < 1 - 1e-12;
      const d = amp / n;
      p = [u + (inside(u) ? (2 * r() - 1) * d : 0), v + (inside(v) ? (2 * r() - 1) * d : 0), w + (inside(w) ? (2 * r() - 1) * d : 0)];
      cache.set(key, p);
    }
    return p;
  };
}

/** Lattice of hexahedra with jittered interior nodes. */
export function jitteredHex(n: number, amp = 0.2, seed = 1): Piece {
  return hexGrid(n, n, n, jitter(n, amp, seed));
}

/** Lattice of tetrahedra (six per lattice cell) with jittered interior nodes. */
export function jitteredTet(n: number, amp = 0.15, seed = 2): Piece {
  return tetGrid(n, n, n, jitter(n, amp, seed));
}

/** Axis-aligned voxels with uneven spacing (x², y^1.5, z mapped), VTK voxel node order. */
export function voxelGrid(n: number): Piece {
  const h = hexGrid(n, n, n, (u, v, w) => [u * u + 0.5 * u, v ** 1.5, 0.3 + 0.7 * w]);
  const nodes: number[][] = [];
  for (let c = 0; c < h.cellTypes.length; c++) {
    const q = Array.from(h.connectivity.subarray(8 * c, 8 * c + 8));
    nodes.push([q[0]!, q[1]!, q[3]!, q[2]!, q[4]!, q[5]!, q[7]!, q[6]!]);
  }
  return pieceFromCells(h.points, { types: nodes.map(() => CellType.VOXEL), nodes });
}

/** Each lattice cell split into two wedges along z (positively oriented), interior nodes jittered. */
export function jitteredWedge(n: number, amp = 0.2, seed = 3): Piece {
  const h = hexGrid(n, n, n, jitter(n, amp, seed));
  const nodes: number[][] = [];
  for (let c = 0; c < h.cellTypes.length; c++) {
    const q = Array.from(h.connectivity.subarray(8 * c, 8 * c + 8));
    nodes.push([q[0]!, q[3]!, q[1]!, q[4]!, q[7]!, q[5]!], [q[1]!, q[3]!, q[2]!, q[5]!, q[7]!, q[6]!]);
  }
  return pieceFromCells(h.points, { types: nodes.map(() => CellType.WEDGE), nodes });
}

/** Each lattice cell split into six pyramids on its faces with the apex at its centre, interior nodes jittered. */
export function jitteredPyramid(n: number, amp = 0.2, seed = 4): Piece {
  const h = hexGrid(n, n, n, jitter(n, amp, seed));
  const pts = Array.from(h.points);
  const nodes: number[][] = [];
  for (let c = 0; c < h.cellTypes.length; c++) {
    const q = Array.from(h.connectivity.subarray(8 * c, 8 * c + 8));
    const centre = pts.length / 3;
    for (let k = 0; k < 3; k++) pts.push(q.reduce((s, id) => s + h.points[3 * id + k]!, 0) / 8);
    // Hexahedron faces point outward; a pyramid's base must point toward its apex, so reverse them.
    for (const f of CELL_FACES[CellType.HEXAHEDRON]!) nodes.push([...f.map((i) => q[i]!).reverse(), centre]);
  }
  return pieceFromCells(pts, { types: nodes.map(() => CellType.PYRAMID), nodes });
}

/** Each lattice cell as a polyhedron (type 42) with its six quadrilateral faces, interior nodes jittered. */
export function jitteredPolyhedron(n: number, amp = 0.2, seed = 5): Piece {
  const h = hexGrid(n, n, n, jitter(n, amp, seed));
  const nodes: number[][] = [], faces: number[][][] = [];
  for (let c = 0; c < h.cellTypes.length; c++) {
    const q = Array.from(h.connectivity.subarray(8 * c, 8 * c + 8));
    nodes.push(q);
    faces.push(CELL_FACES[CellType.HEXAHEDRON]!.map((f) => f.map((i) => q[i]!)));
  }
  return pieceFromCells(h.points, { types: nodes.map(() => CellType.POLYHEDRON), nodes, polyFaces: faces });
}

/** One mesh per volume type, each as a dataset. */
export function meshesOfEveryType(n = 3): { name: string; type: number; dataset: Dataset }[] {
  return [
    { name: 'tetra', type: CellType.TETRA, dataset: datasetOf([jitteredTet(n)]) },
    { name: 'hexahedron', type: CellType.HEXAHEDRON, dataset: datasetOf([jitteredHex(n)]) },
    { name: 'voxel', type: CellType.VOXEL, dataset: datasetOf([voxelGrid(n)]) },
    { name: 'wedge', type: CellType.WEDGE, dataset: datasetOf([jitteredWedge(n)]) },
    { name: 'pyramid', type: CellType.PYRAMID, dataset: datasetOf([jitteredPyramid(n)]) },
    { name: 'polyhedron', type: CellType.POLYHEDRON, dataset: datasetOf([jitteredPolyhedron(n)]) },
  ];
}
