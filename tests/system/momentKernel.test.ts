/**
 * The WebAssembly SIMD moment kernel of the quadratic gradient fit in Debian's chromium: in a Web Worker (where
 * the app computes) the kernel compiles and runs, and its gradients equal, bit for bit, the JavaScript fit's in
 * the same worker and Node's JavaScript fit (the arithmetic is IEEE double in both engines, with no fused
 * multiply-add). In the built app's compute worker — under the page's Content-Security-Policy — the kernel's
 * module compiles and fits a neighbour set to the same bits as in Node. Node's own comparison is
 * tests/derive/momentKernel.test.ts.
 */
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { build } from 'esbuild';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { gradientInto } from '../../src/derive/quadraticGradient.ts';
import { useMomentKernel } from '../../src/derive/momentKernel.ts';
import { REPO, launch, serveFolder, type Browser } from './browser.ts';
import { openAppForTests } from './appPage.ts';
import { KERNEL_LAYOUT, MOMENT_KERNEL_BASE64 } from '../../src/derive/momentKernelWasm.ts';
import { momentKernel } from '../../src/derive/momentKernel.ts';
import type { Page } from 'playwright-core';
import { kernelCases } from './momentKernelCases.ts';

let browser: Browser;
let server: Awaited<ReturnType<typeof serveFolder>>;
let dir = '';

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'fieldtally-kernel-'));
  await build({ entryPoints: [join(REPO, 'tests/system/momentKernelWorker.ts')], bundle: true, format: 'iife', outfile: join(dir, 'worker.js'), logLevel: 'silent' });
  writeFileSync(join(dir, 'index.html'), '<!doctype html><title>kernel</title>');
  server = await serveFolder(dir);
  browser = await launch();
  await browser.page.goto(server.url);
}, 120_000);

afterAll(async () => {
  await browser?.close();
  await server?.close();
  if (dir) rmSync(dir, { recursive: true, force: true });
});

describe('moment kernel in chromium', () => {
  it('runs in a worker and matches the JavaScript fit bit for bit', async () => {
    // The inputs are made here and sent: Chromium's engine may round Math.sin/Math.cos (used to make the fields)
    // differently from Node's, and the claim under test is about the fit's arithmetic, not theirs.
    const cases = kernelCases();
    const sent = cases.map(({ p, values, nc, stencil }) => ({ points: Array.from(p.points), values: Array.from(values), nc, offsets: Array.from(stencil.offsets), ids: Array.from(stencil.ids) }));
    const got = await browser.page.evaluate((input) => new Promise<{ present: boolean; results: { kernel: number[]; js: number[] }[] }>((resolve) => {
      const w = new Worker('worker.js');
      w.onmessage = (e) => resolve({
        present: e.data.present,
        results: e.data.results.map((r: { kernel: Float64Array; js: Float64Array }) => ({ kernel: Array.from(r.kernel), js: Array.from(r.js) })),
      });
      w.postMessage(input.map((c) => ({ points: new Float64Array(c.points), values: new Float64Array(c.values), nc: c.nc, stencil: { offsets: new Int32Array(c.offsets), ids: new Int32Array(c.ids) } })));
    }), sent);
    expect(got.present).toBe(true);
    useMomentKernel(false);
    expect(got.results.length).toBe(cases.length);
    try {
    cases.forEach(({ p, values, nc, stencil }, k) => {
      const count = p.points.length / 3, node = new Float64Array(3 * nc * count);
      gradientInto(node, 0, p.points, values, nc, stencil, undefined, 0, count);
      const { kernel, js } = got.results[k]!;
      expect(node.some((v) => v !== 0 && Number.isFinite(v))).toBe(true);
      let bad = 0;
      for (let i = 0; i < node.length; i++) if (!Object.is(kernel[i], node[i]) || !Object.is(js[i], node[i])) bad++;
      expect(bad).toBe(0);
    });
    } finally { useMomentKernel(true); }
    expect(browser.errors).toEqual([]);
  }, 120_000);
});

/**
 * One neighbour set of two sites fitted by the kernel's `fit3` in whatever realm runs this (stringified into the
 * app's worker): 30 slots of offsets and value differences (`slots`, made once in Node by `slotValues`: the
 * browser's engine may round Math.sin differently), scales 2 and 0.5.
 */
function fitOnce(b64: string, layout: typeof KERNEL_LAYOUT, slots: number[]): number[] {
  const s = atob(b64), bytes = new Uint8Array(s.length);
  for (let i = 0; i < s.length; i++) bytes[i] = s.charCodeAt(i);
  // the kernel's memory is the caller's (env.memory); its slots start where the word at configAt says
  const memory = new WebAssembly.Memory({ initial: 1 });
  const e = new WebAssembly.Instance(new WebAssembly.Module(bytes), { env: { memory } }).exports as unknown as { fit3(n: number): void };
  const F = new Float64Array(memory.buffer), n = 30;
  new Int32Array(memory.buffer)[layout.configAt / 4] = layout.slotsAt;
  F[layout.scaleAt / 8] = 2; F[layout.scaleAt / 8 + 1] = 0.5;
  F[layout.toleranceAt / 8] = 1e-9; F[layout.toleranceAt / 8 + 1] = 1e-9;
  for (let k = 0; k < 12 * n; k++) F[layout.slotsAt / 8 + k] = slots[k]!;
  e.fit3(n);
  return Array.from(F.subarray(layout.resultAt / 8, layout.resultAt / 8 + 20));
}

/** The 30 slots' offsets and value differences of `fitOnce`, from a fixed recipe. */
function slotValues(): number[] {
  const v: number[] = [];
  for (let t = 0; t < 30; t++) for (let e2 = 0; e2 < 12; e2++) v.push(Math.sin(1.7 * t + 0.9 * e2 + 0.3) * (1 + (e2 % 3)));
  return v;
}

describe('moment kernel in the app', () => {
  let page: Page;
  openAppForTests((app) => { ({ page } = app); });

  it('compiles and fits in the compute worker under the page\'s security policy', async () => {
    expect(momentKernel()).not.toBeNull();
    const worker = page.workers().find((w) => /compute/.test(w.url()));
    expect(worker, page.workers().map((w) => w.url()).join(', ')).toBeDefined();
    const got = await worker!.evaluate(`(${fitOnce.toString()})(${JSON.stringify(MOMENT_KERNEL_BASE64)}, ${JSON.stringify(KERNEL_LAYOUT)}, ${JSON.stringify(slotValues())})`) as number[];
    const here = fitOnce(MOMENT_KERNEL_BASE64, KERNEL_LAYOUT, slotValues());
    expect(here.every((v) => Number.isFinite(v))).toBe(true);
    expect(got.map((v, i) => Object.is(v, here[i]))).toEqual(here.map(() => true));
  }, 120_000);
});
