/**
 * A helper worker of the browser's compute worker (workers/inflateHelpers.ts): inflates the zlib blocks it
 * is given from one SharedArrayBuffer into another with fflate, the compute worker's own inflater, so the
 * bytes and messages are those of a one-thread load.
 */
import { fflateInflate } from '../src/io/xmlBlocks.ts';
import { inflateRun } from '../src/parallel/inflateRuns.ts';

/** One run of blocks: the shared buffers and the job list (see `inflateRun`). */
interface InflateJob { id: number; input: SharedArrayBuffer; output: SharedArrayBuffer; jobs: number[] }

const scope = self as unknown as {
  postMessage(m: unknown): void;
  addEventListener(type: 'message', h: (e: MessageEvent<InflateJob>) => void): void;
};
scope.addEventListener('message', ({ data: { id, input, output, jobs } }) => {
  scope.postMessage({ id, got: inflateRun(new Uint8Array(input), new Uint8Array(output), jobs, fflateInflate) });
});
