/**
 * The moment kernel over one shared memory (src/derive/sharedKernelMesh.ts): a mesh held once, fitted from
 * several areas (as the pool's workers do, here in one thread one area after another), gives every node's
 * gradient bit for bit as the JavaScript fit over the whole mesh's rows — on every cell type, 1 and 3 components,
 * node ranges and node lists, a new values array on the same mesh, and a ring larger than an area's slots (the
 * memory grows and the slots move). The method (Barth & Frederickson 1990 quadratic least-squares fit) is checked
 * for second order in quadraticGradient.test.ts.
 */
import { afterEach, describe, expect, it } from 'vitest';
import { gradientInto } from '../../src/derive/quadraticGradient.ts';
import { useMomentKernel } from '../../src/derive/momentKernel.ts';
import { pointStencil } from '../../src/derive/stencils.ts';
import { attachKernelMesh, holdsMesh, isAttached, loadValues, makeSharedKernelMesh, sharedMeshInto } from '../../src/derive/sharedKernelMesh.ts';
import { nodeRanges } from '../../src/derive/rangeGradient.ts';
import { smoothFields } from './smoothFields.ts';
import { tetrahedronFan } from './fanMesh.ts';
import { boxMesh, type BoxKind } from '../cut/meshes.ts';
import type { Piece } from '../../src/model/piece.ts';
import type { NumericArray } from '../../src/model/fieldArray.ts';

afterEach(() => { useMomentKernel(true); });

/** Every node's gradient with rows built in JavaScript and the JavaScript fit (or, with `nodes`, those nodes'). */
function reference(p: Piece, values: NumericArray, nc: number, nodes?: Int32Array): Float64Array {
  useMomentKernel(false);
  const n = nodes ? nodes.length : p.points.length / 3, out = new Float64Array(3 * nc * n);
  gradientInto(out, 0, p.points, values, nc, pointStencil(p), nodes, 0, n);
  useMomentKernel(true);
  return out;
}

function differing(a: Float64Array, b: Float64Array): number {
  expect(a.length).toBe(b.length);
  let bad = 0;
  for (let i = 0; i < a.length; i++) if (!Object.is(a[i], b[i])) bad++;
  return bad;
}

describe('a kernel mesh held once in shared memory, fitted from several areas', () => {
  for (const kind of ['tet', 'hex', 'wedge', 'pyramid', 'polyhedron', 'voxel'] as BoxKind[]) {
    it(`${kind}: every node in 3 areas' ranges and a node list, 3 and 1 components, then new values, bit for bit`, () => {
      const p = boxMesh(kind, 6, 5, 4, 0.3), np = p.points.length / 3, { u, s } = smoothFields(p);
      const m = makeSharedKernelMesh(p, 3)!;
      expect(m).not.toBeNull();
      expect(holdsMesh(m, p, 3)).toBe(true);
      expect(holdsMesh(m, p, 4)).toBe(false);
      for (const [values, nc] of [[u, 3], [s, 1], [Float32Array.from(u, (x) => 2 * x), 3]] as const) {
        loadValues(m, values, nc);
        const ref = reference(p, values, nc), got = new Float64Array(3 * nc * np), b = nodeRanges(np, 3);
        for (let w = 0; w < 3; w++) {
          expect(attachKernelMesh(m.ref, m.ref.areas[w]!)).toBe(true);
          expect(isAttached(m.ref.id)).toBe(true);
          sharedMeshInto(got, 3 * nc * b[w]!, nc, undefined, b[w]!, b[w + 1]!);
        }
        expect(ref.some((v) => v !== 0 && Number.isFinite(v))).toBe(true);
        expect(differing(got, ref)).toBe(0);
        // a node list (every fifth node, backwards) from the last area
        const nodes = Int32Array.from({ length: Math.ceil(np / 5) }, (_, k) => np - 1 - 5 * k), at = new Float64Array(3 * nc * nodes.length);
        sharedMeshInto(at, 0, nc, nodes, 0, nodes.length);
        expect(differing(at, reference(p, values, nc, nodes))).toBe(0);
      }
    });
  }

  it('a ring larger than an area\'s slots (a node in 1500 tetrahedra: a ring of 4500) grows the memory, moves the slots, same bits', () => {
    const n = 1500, np = 1 + 3 * n, { fan, u } = tetrahedronFan(n);
    const m = makeSharedKernelMesh(fan, 2)!, bytes = m.ref.memory.buffer.byteLength;
    loadValues(m, u, 3);
    const got = new Float64Array(9 * np);
    // the first area's slots move past the second area; the second then fits as before
    for (const [w, from, to] of [[0, 0, 2], [1, 2, np], [0, 0, np]] as const) {
      expect(attachKernelMesh(m.ref, m.ref.areas[w]!)).toBe(true);
      sharedMeshInto(got, 9 * from, 3, undefined, from, to);
    }
    expect(m.ref.memory.buffer.byteLength).toBeGreaterThan(bytes);
    expect(differing(got, reference(fan, u, 3))).toBe(0);
  });
});
