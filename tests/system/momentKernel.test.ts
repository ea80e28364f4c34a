/**
 * The WebAssembly SIMD moment kernel of the quadratic gradient fit in Debian's chromium: in a Web Worker (where
 * the app computes) the kernel compiles and runs, and its gradients equal, bit for bit, the JavaScript fit's in
 * the same worker and Node's JavaScript fit (the arithmetic is IEEE double in both engines, with no fused
 * multiply-add). Node's own comparison is tests/derive/momentKernel.test.ts.
 */
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { build } from 'esbuild';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { gradientInto } from '../../src/derive/quadraticGradient.ts';
import { useMomentKernel } from '../../src/derive/momentKernel.ts';
import { REPO, launch, serveFolder, type Browser } from './browser.ts';
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
    const got = await browser.page.evaluate(() => new Promise<{ present: boolean; results: { kernel: number[]; js: number[] }[] }>((resolve) => {
      const w = new Worker('worker.js');
      w.onmessage = (e) => resolve({
        present: e.data.present,
        results: e.data.results.map((r: { kernel: Float64Array; js: Float64Array }) => ({ kernel: Array.from(r.kernel), js: Array.from(r.js) })),
      });
      w.postMessage(0);
    }));
    expect(got.present).toBe(true);
    useMomentKernel(false);
    const cases = kernelCases();
    expect(got.results.length).toBe(cases.length);
    cases.forEach(({ p, values, nc, stencil }, k) => {
      const count = p.points.length / 3, node = new Float64Array(3 * nc * count);
      gradientInto(node, 0, p.points, values, nc, stencil, undefined, 0, count);
      const { kernel, js } = got.results[k]!;
      expect(node.some((v) => v !== 0 && Number.isFinite(v))).toBe(true);
      let bad = 0;
      for (let i = 0; i < node.length; i++) if (!Object.is(kernel[i], node[i]) || !Object.is(js[i], node[i])) bad++;
      expect(bad).toBe(0);
    });
    useMomentKernel(true);
    expect(browser.errors).toEqual([]);
  }, 120_000);
});
