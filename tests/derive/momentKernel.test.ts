/**
 * The WebAssembly SIMD moment kernel (src/derive/momentKernel.ts, pairedFit.ts) against the JavaScript fit
 * (`useMomentKernel(false)`): every gradient the same to the bit — on every cell type including polyhedra,
 * boundary nodes refitted over the two-ring, chosen node lists of odd length, rings larger than the kernel's
 * first memory, neighbours coincident with the site (carrying NaN, which the fit must skip) and sites with no
 * neighbour. The generated module must be what bin/write-moment-kernel.mjs writes now. The method itself
 * (Barth & Frederickson 1990 quadratic least-squares fit) is checked for second order in quadraticGradient.test.ts.
 */
import { readFileSync } from 'node:fs';
import { afterEach, describe, expect, it } from 'vitest';
import { gradientInto, quadraticGradient } from '../../src/derive/quadraticGradient.ts';
import { momentKernel, useMomentKernel } from '../../src/derive/momentKernel.ts';
import { pointStencil, type Stencil } from '../../src/derive/stencils.ts';
import { pointStencilAround } from '../../src/derive/localStencil.ts';
import { smoothFields } from './smoothFields.ts';
import { tetrahedronFan } from './fanMesh.ts';
import { boxMesh, rng, type BoxKind } from '../cut/meshes.ts';
import { meshAtInto, meshInto } from '../../src/derive/pairedFit.ts';
import { holdMesh, isHeld, releaseMesh } from '../../src/derive/kernelMesh.ts';
import { HOLD_FOR_LIST_RATIO, pointGradientAt } from '../../src/derive/fieldGradient.ts';
import { nodeRanges } from '../../src/derive/rangeGradient.ts';
import type { Piece } from '../../src/model/piece.ts';
import type { FieldArray, NumericArray } from '../../src/model/fieldArray.ts';

afterEach(() => { useMomentKernel(true); });

/** Gradient with the kernel and without it; also the ring sizes each fit used. */
function both(positions: Float64Array, values: Float64Array, nc: number, st: Stencil, targets?: Int32Array) {
  const count = targets ? targets.length : positions.length / 3;
  const run = (on: boolean) => {
    expect(useMomentKernel(on)).toBe(on);
    const out = new Float64Array(3 * nc * count), sizes = new Int32Array(count);
    gradientInto(out, 0, positions, values, nc, st, targets, 0, count, sizes);
    return { out, sizes };
  };
  return { wasm: run(true), js: run(false) };
}

function differing(a: Float64Array, b: Float64Array): number {
  let bad = 0;
  for (let i = 0; i < a.length; i++) if (!Object.is(a[i], b[i])) bad++;
  return bad;
}

describe('WebAssembly moment kernel', () => {
  it('is present in Node and is what the generator writes', async () => {
    expect(momentKernel()).not.toBeNull();
    const gen = (await import('../../bin/write-moment-kernel.mjs' as string)) as { momentKernelSource(): string };
    expect(readFileSync(new URL('../../src/derive/momentKernelWasm.ts', import.meta.url), 'utf8')).toBe(gen.momentKernelSource());
  });

  for (const kind of ['tet', 'hex', 'wedge', 'pyramid', 'polyhedron', 'voxel'] as BoxKind[]) {
    it(`${kind}: every node, 3 and 1 components, bit for bit`, () => {
      const p = boxMesh(kind, 5, 4, 4, 0.3);
      const np = p.points.length / 3, st = pointStencil(p);
      const { u, s } = smoothFields(p);
      for (const [values, nc] of [[u, 3], [s, 1]] as const) {
        const { wasm, js } = both(p.points, values, nc, st);
        expect(js.out.some((v) => v !== 0 && Number.isFinite(v))).toBe(true);
        expect(differing(wasm.out, js.out)).toBe(0);
        expect(Array.from(wasm.sizes)).toEqual(Array.from(js.sizes));
      }
      // a chosen node list of odd length over the local rows (the wall's path)
      const nodes = Int32Array.from({ length: Math.min(37, np) }, (_, k) => (k * 7) % np);
      const local = pointStencilAround(p, nodes);
      const { wasm, js } = both(p.points, u, 3, local, nodes);
      expect(differing(wasm.out, js.out)).toBe(0);
      expect(differing(wasm.out, quadraticGradient(p.points, u, 3, st, nodes))).toBe(0);
    });
  }

  it('skips coincident neighbours (even with NaN values), grows for large rings, gives NaN without neighbours', () => {
    const r = rng(3), n = 3000;
    const pos = new Float64Array(3 * (n + 2)), val = new Float64Array(3 * (n + 2));
    for (let i = 0; i < n; i++) {
      for (let c = 0; c < 3; c++) pos[3 * i + c] = r() - 0.5;
      const x = pos[3 * i]!, y = pos[3 * i + 1]!, z = pos[3 * i + 2]!;
      val[3 * i] = x * x - y; val[3 * i + 1] = Math.sin(z + x); val[3 * i + 2] = x * y * z;
    }
    // node n sits on node 0 with a NaN value; node n+1 is alone
    pos[3 * n] = pos[0]!; pos[3 * n + 1] = pos[1]!; pos[3 * n + 2] = pos[2]!;
    val[3 * n] = NaN; val[3 * n + 1] = NaN; val[3 * n + 2] = NaN;
    pos[3 * n + 3] = 9;
    // rows: node 0 sees every other node (a ring of n, far beyond the first 64 kB of slots) and its twin;
    // nodes 1…20 see 30 nodes each; the twin and the lone node see nothing
    const rows: number[][] = [[...Array.from({ length: n - 1 }, (_, k) => k + 1), n]];
    for (let i = 1; i <= 20; i++) rows.push([0, n, ...Array.from({ length: 28 }, (_, k) => ((i * 31 + k * 17) % (n - 1)) + 1).filter((j) => j !== i)]);
    const offsets = new Int32Array(n + 3), ids: number[] = [];
    for (let i = 0; i < n + 2; i++) { ids.push(...(rows[i] ?? [])); offsets[i + 1] = ids.length; }
    const st = { offsets, ids: Int32Array.from(ids) };
    const targets = Int32Array.from([0, ...Array.from({ length: 20 }, (_, k) => k + 1), n + 1]);
    const { wasm, js } = both(pos, val, 3, st, targets);
    expect(Number.isFinite(js.out[0])).toBe(true);
    expect(Number.isNaN(js.out[js.out.length - 1])).toBe(true);
    expect(differing(wasm.out, js.out)).toBe(0);
    expect(Array.from(wasm.sizes)).toEqual(Array.from(js.sizes));
  });
});

describe('the kernel walking its own copy of the mesh (kernelMesh.ts, pairedFit.ts meshInto)', () => {
  /** The gradient of every node with rows built in JavaScript and the JavaScript fit, and the ring sizes. */
  function reference(p: Piece, values: NumericArray, nc: number) {
    useMomentKernel(false);
    const np = p.points.length / 3, out = new Float64Array(3 * nc * np), sizes = new Int32Array(np);
    gradientInto(out, 0, p.points, values, nc, pointStencil(p), undefined, 0, np, sizes);
    useMomentKernel(true);
    return { out, sizes };
  }

  /** The same from the kernel's walk, in `parts` node ranges. */
  function walked(p: Piece, values: NumericArray, nc: number, parts: number) {
    const K = momentKernel()!, np = p.points.length / 3, out = new Float64Array(3 * nc * np), sizes = new Int32Array(np);
    const b = nodeRanges(np, parts);
    for (let k = 0; k + 1 < b.length; k++) {
      const sub = new Int32Array(np);
      expect(meshInto(K, out, 3 * nc * b[k]!, p, values, nc, b[k]!, b[k + 1]!, sub)).toBe(true);
      sizes.set(sub.subarray(b[k]!, b[k + 1]!), b[k]!);
    }
    return { out, sizes };
  }

  for (const kind of ['tet', 'hex', 'wedge', 'pyramid', 'polyhedron', 'voxel'] as BoxKind[]) {
    it(`${kind}: every node in 1, 2 and 3 ranges, 3 and 1 components, then a new values array on the same mesh, bit for bit`, () => {
      const p = boxMesh(kind, 6, 5, 4, 0.3);
      const { u, s } = smoothFields(p);
      for (const [values, nc] of [[u, 3], [s, 1], [Float32Array.from(u, (x) => 2 * x), 3]] as const) {
        const ref = reference(p, values, nc);
        expect(ref.out.some((v) => v !== 0 && Number.isFinite(v))).toBe(true);
        for (const parts of [1, 2, 3]) {
          const got = walked(p, values, nc, parts);
          expect(differing(got.out, ref.out)).toBe(0);
          expect(Array.from(got.sizes)).toEqual(Array.from(ref.sizes));
        }
      }
    });
  }

  it('makes room for a ring larger than the memory it was given (a node in 1500 tetrahedra: a ring of 4500), same bits', () => {
    const n = 1500, { fan, u } = tetrahedronFan(n);
    const K = momentKernel()!, ref = reference(fan, u, 3);
    // held first: the fit itself must then find its slots short and move to a larger memory mid-way
    expect(holdMesh(K, fan, u, 3)).not.toBeNull();
    const memory = K.memory, got = walked(fan, u, 3, 1);
    expect(got.sizes[0]).toBe(3 * n);
    expect(K.memory).not.toBe(memory);
    expect(differing(got.out, ref.out)).toBe(0);
    expect(Array.from(got.sizes)).toEqual(Array.from(ref.sizes));
  });

  it('holds one mesh at a time (another mesh, then the first again), a twin node carrying NaN and a node in no cell', () => {
    const a = boxMesh('hex', 4, 4, 3, 0.2), b = boxMesh('tet', 3, 4, 3, 0.2);
    // a twin of node 0 in a copy of cell 0, its values NaN; a last node in no cell (its gradient NaN)
    const np = a.points.length / 3, first = Array.from(a.connectivity.subarray(a.offsets[0]!, a.offsets[1]!));
    const points = new Float64Array(3 * (np + 2));
    points.set(a.points); points.set(a.points.subarray(0, 3), 3 * np); points.set([9, 9, 9], 3 * np + 3);
    const connectivity = Int32Array.from([...a.connectivity, ...first.map((q) => (q === first[0] ? np : q))]);
    const offsets = Int32Array.from([...a.offsets, a.offsets[a.offsets.length - 1]! + first.length]);
    const odd: Piece = { ...a, points, connectivity, offsets, cellTypes: Uint8Array.from([...a.cellTypes, a.cellTypes[0]!]) };
    const u = new Float64Array(3 * (np + 2));
    for (let i = 0; i < np + 2; i++) { const x = points[3 * i]!, y = points[3 * i + 1]!, z = points[3 * i + 2]!; u.set([x * y, z - x * x, Math.sin(y)], 3 * i); }
    u.set([NaN, NaN, NaN], 3 * np);
    for (const p of [odd, b, odd]) {
      const values = p === odd ? u : smoothFields(p).u, ref = reference(p, values, 3), got = walked(p, values, 3, 2);
      expect(differing(got.out, ref.out)).toBe(0);
      expect(Array.from(got.sizes)).toEqual(Array.from(ref.sizes));
      if (p === odd) { expect(Number.isNaN(got.out[got.out.length - 1])).toBe(true); expect(Number.isFinite(got.out[0])).toBe(true); }
    }
  });
});

describe('node lists (a wall\'s nodes) on the held mesh (pairedFit.ts meshAtInto, fieldGradient.ts pointGradientAt)', () => {
  /** Boundary nodes of `p` (one-sided: refitted over the two-ring) and every seventh node, in a shuffled order. */
  function listOf(p: Piece): Int32Array {
    const np = p.points.length / 3, r = rng(5), xs = Array.from({ length: np }, (_, i) => p.points[3 * i]!);
    const lo = Math.min(...xs), hi = Math.max(...xs);
    const picked = Array.from({ length: np }, (_, i) => i).filter((i) => xs[i] === lo || xs[i] === hi || i % 7 === 3);
    for (let k = picked.length - 1; k > 0; k--) { const j = Math.floor(r() * (k + 1)); [picked[k], picked[j]] = [picked[j]!, picked[k]!]; }
    return Int32Array.from(picked);
  }

  for (const kind of ['tet', 'hex', 'wedge', 'pyramid', 'polyhedron', 'voxel'] as BoxKind[]) {
    it(`${kind}: a node list's gradient walked in the held mesh equals the JavaScript fit over its rows, 3 and 1 components`, () => {
      const p = boxMesh(kind, 6, 5, 4, 0.3), nodes = listOf(p), st = pointStencilAround(p, nodes);
      const { u, s } = smoothFields(p);
      for (const [values, nc] of [[u, 3], [s, 1]] as const) {
        useMomentKernel(false);
        const ref = new Float64Array(3 * nc * nodes.length);
        gradientInto(ref, 0, p.points, values, nc, st, nodes, 0, nodes.length);
        useMomentKernel(true);
        const got = new Float64Array(3 * nc * nodes.length);
        expect(meshAtInto(momentKernel()!, got, p, values, nc, nodes)).toBe(true);
        expect(ref.some((v) => v !== 0 && Number.isFinite(v))).toBe(true);
        expect(differing(got, ref)).toBe(0);
      }
    });
  }

  it('pointGradientAt holds a mesh for a list of at least 1/HOLD_FOR_LIST_RATIO of its nodes, not for a smaller one, with the same bits', () => {
    const p = boxMesh('hex', 8, 6, 5, 0.2), np = p.points.length / 3, { u } = smoothFields(p);
    const field: FieldArray = { name: 'velocity', association: 'point', components: 3, values: u, sourceType: 'Float64' };
    const large = listOf(p), small = large.slice(0, Math.floor(np / HOLD_FOR_LIST_RATIO) - 1);
    expect(large.length * HOLD_FOR_LIST_RATIO).toBeGreaterThanOrEqual(np);
    const reference = (nodes: Int32Array) => {
      useMomentKernel(false);
      const ref = new Float64Array(9 * nodes.length);
      gradientInto(ref, 0, p.points, u, 3, pointStencilAround(p, nodes), nodes, 0, nodes.length);
      useMomentKernel(true);
      return ref;
    };
    releaseMesh();
    expect(differing(pointGradientAt(p, field, small), reference(small))).toBe(0);
    expect(isHeld(p)).toBe(false);
    expect(differing(pointGradientAt(p, field, large), reference(large))).toBe(0);
    expect(isHeld(p)).toBe(true);
    // held now: a small list is walked there too
    expect(differing(pointGradientAt(p, field, small.slice(0, 5)), reference(small.slice(0, 5)))).toBe(0);
  });
});
