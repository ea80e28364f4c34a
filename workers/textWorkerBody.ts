// A text worker of the parallel loader under Node (src/parallel/textPool.ts): parses the numbers of the ASCII
// windows it is given, from one shared buffer into another, with the reader's own parser (parseWindow in
// src/io/asciiWindows.ts). Started through workers/textWorker.node.mjs from source, or bundled as
// dist-cli/textWorker.mjs (bin/build-cli.mjs).
import { parentPort } from 'node:worker_threads';
import { parseWindow } from '../src/io/asciiWindows.ts';

const port = parentPort!;
port.on('message', ({ id, text, values, jobs }: { id: number; text: SharedArrayBuffer; values: SharedArrayBuffer; jobs: number[] }) => {
  const t = new Uint8Array(text), v = new Float64Array(values), got: (number | string)[] = [];
  // jobs: [textStart, textEnd, valuesStart] per window
  for (let j = 0; j < jobs.length; j += 3) got.push(parseWindow(t, jobs[j]!, jobs[j + 1]!, v, jobs[j + 2]!));
  port.postMessage({ id, got });
});
