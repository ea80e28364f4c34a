/**
 * Bundled for a Web Worker by tests/system/momentKernel.test.ts: the quadratic gradient of two fields on a
 * polyhedral and a hexahedral box, with the WebAssembly kernel and with it switched off, posted back.
 */
import { gradientInto } from '../../src/derive/quadraticGradient.ts';
import { momentKernel, useMomentKernel } from '../../src/derive/momentKernel.ts';
import { kernelCases } from './momentKernelCases.ts';

const scope = self as unknown as { onmessage: () => void; postMessage: (m: unknown) => void };
scope.onmessage = () => {
  const present = momentKernel() !== null;
  const results = kernelCases().map(({ p, values, nc, stencil }) => {
    const count = p.points.length / 3, run = (on: boolean) => {
      useMomentKernel(on);
      const out = new Float64Array(3 * nc * count);
      gradientInto(out, 0, p.points, values, nc, stencil, undefined, 0, count);
      return out;
    };
    return { kernel: run(true), js: run(false) };
  });
  scope.postMessage({ present, results });
};
