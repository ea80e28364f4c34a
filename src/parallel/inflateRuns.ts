/**
 * The pure parts of inflating one batch of zlib blocks on several threads (the browser's helper workers,
 * workers/inflateHelpers.ts): splitting the batch into contiguous runs of blocks about equal in compressed
 * bytes, one per thread, and inflating a run from one buffer into another by a job list. No threads here,
 * so Node tests run them as they are.
 */
import type { InflateBlock } from '../io/loadOptions.ts';

/**
 * Splits blocks of compressed sizes `sizes` (bytes) into at most `lanes` contiguous runs `[first, end)`,
 * about equal in compressed bytes, in order, none empty; together they cover every block once.
 */
export function splitRuns(sizes: readonly number[], lanes: number): [number, number][] {
  let total = 0;
  for (const s of sizes) total += s;
  const runs: [number, number][] = [];
  const per = total / Math.max(1, lanes);
  let start = 0, acc = 0;
  for (let i = 0; i < sizes.length; i++) {
    acc += sizes[i]!;
    if (acc >= per * (runs.length + 1) && runs.length < lanes - 1) { runs.push([start, i + 1]); start = i + 1; }
  }
  if (start < sizes.length) runs.push([start, sizes.length]);
  return runs;
}

/**
 * Inflates the blocks a job list names: job `j` is `[inStart, inLength, outStart, outLength]` (bytes) at
 * `jobs[4j…]`, block `input[inStart, inStart + inLength)` into `output[outStart, outStart + outLength)`.
 * Per block, what `inflate` returns (the bytes the stream holds) or the message of the Error it throws.
 */
export function inflateRun(input: Uint8Array, output: Uint8Array, jobs: ArrayLike<number>, inflate: InflateBlock): (number | string)[] {
  const got: (number | string)[] = [];
  for (let j = 0; j + 3 < jobs.length; j += 4) {
    const a = jobs[j]!, n = jobs[j + 1]!, o = jobs[j + 2]!, m = jobs[j + 3]!;
    try {
      got.push(inflate(input.subarray(a, a + n), output.subarray(o, o + m)));
    } catch (e) {
      got.push(e instanceof Error ? e.message : String(e));
    }
  }
  return got;
}
