/**
 * Bundled for a Web Worker by tests/system/momentKernel.test.ts: the quadratic gradient of the cases it is sent
 * (points, field values and stencils made in Node, so both realms fit the same bits: the browser's engine may
 * round Math.sin or Math.cos differently from Node's), with the WebAssembly kernel and with it switched off,
 * posted back.
 */
import { gradientInto } from '../../src/derive/quadraticGradient.ts';
import { momentKernel, useMomentKernel } from '../../src/derive/momentKernel.ts';
import type { Stencil } from '../../src/derive/stencils.ts';

type Case = { points: Float64Array; values: Float64Array; nc: number; stencil: Stencil };
const scope = self as unknown as { onmessage: (e: { data: Case[] }) => void; postMessage: (m: unknown) => void };
scope.onmessage = (e) => {
  const present = momentKernel() !== null;
  const results = e.data.map(({ points, values, nc, stencil }) => {
    const count = points.length / 3, run = (on: boolean) => {
      useMomentKernel(on);
      const out = new Float64Array(3 * nc * count);
      gradientInto(out, 0, points, values, nc, stencil, undefined, 0, count);
      return out;
    };
    return { kernel: run(true), js: run(false) };
  });
  scope.postMessage({ present, results });
};
