/**
 * Derived fields through the worker contract: `deriveFields` attaches them to the held dataset, the
 * description lists them, and the surface is coloured by them. Check: Hagen–Poiseuille flow
 * (REFERENCES §1; Hagen 1839, Poiseuille 1840), u_z = 2V(1 − r²/R²), so |ω| = |du_z/dr| = 4Vr/R², largest
 * at the wall, 4V/R; the quadratic profile is reproduced exactly by the quadratic gradient fit.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { Worker } from 'node:worker_threads';
import * as Comlink from 'comlink';
// @ts-expect-error the adapter ships its types beside the .min.mjs only; typed below
import nodeEndpointUntyped from 'comlink/dist/esm/node-adapter.mjs';
import { afterAll, beforeAll, expect, it } from 'vitest';
import { pipeExact } from '../../src/samples/pipe.ts';
import type { ComputeApi } from '../../workers/api.ts';

const nodeEndpoint = nodeEndpointUntyped as (w: Worker) => Comlink.Endpoint;
const PIPE = join(__dirname, '../../sample-fields/pipe-medium.vtu');
let worker: Worker;
let api: Comlink.Remote<ComputeApi>;

beforeAll(() => {
  worker = new Worker(new URL('./nodeWorker.mjs', import.meta.url));
  api = Comlink.wrap<ComputeApi>(nodeEndpoint(worker));
});
afterAll(async () => { api[Comlink.releaseProxy](); await worker.terminate(); });

it('attaches vorticity magnitude and cp, lists them, and colours the wall by them', async () => {
  await api.load({ kind: 'files', main: { path: 'pipe-medium.vtu', data: new Uint8Array(readFileSync(PIPE)) }, others: [] });
  await expect(api.deriveFields({ names: ['cp'] })).rejects.toThrow(/cp" needs a positive reference density and speed/);
  const d = await api.deriveFields({ names: ['vorticity-magnitude', 'cp'], reference: { density: 998.207, speed: 0.05, pressure: 0 } });
  const e = pipeExact();
  const w = d.report.pointData.find((a) => a.name === 'vorticity-magnitude')!;
  expect(w.components).toBe(1);
  expect(w.range![1] / (4 * e.V / e.R)).toBeCloseTo(1, 9);
  expect(d.report.pointData.some((a) => a.name === 'cp')).toBe(true);
  const v = await api.surfaceValues({ name: 'vorticity-magnitude', association: 'point', component: -1 });
  expect(v.range[1] / (4 * e.V / e.R)).toBeCloseTo(1, 6);
  // the boundary groups found at load are kept
  expect(d.groups.length).toBe(3);
});
