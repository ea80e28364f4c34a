// A text worker of the parallel loader under Node (src/parallel/textPool.ts): parses the numbers of the ASCII
// windows it is given, from one shared buffer into another, with the reader's own parser (parseWindow in
// src/io/asciiWindows.ts), or decodes base64 windows (decodeWindow in src/io/base64Windows.ts). Started through workers/textWorker.node.mjs from source, or bundled as
// dist-cli/textWorker.mjs (bin/build-cli.mjs).
import { parentPort } from 'node:worker_threads';
import { parseWindow } from '../src/io/asciiWindows.ts';
import { decodeWindow } from '../src/io/base64Windows.ts';

const port = parentPort!;
port.on('message', ({ id, kind, text, values, jobs }: { id: number; kind: 'numbers' | 'base64'; text: SharedArrayBuffer; values: SharedArrayBuffer; jobs: number[] }) => {
  const t = new Uint8Array(text), got: (number | string)[] = [];
  if (kind === 'numbers') {
    // jobs: [textStart, textEnd, valuesStart] per window
    const v = new Float64Array(values);
    for (let j = 0; j < jobs.length; j += 3) got.push(parseWindow(t, jobs[j]!, jobs[j + 1]!, v, jobs[j + 2]!));
  } else {
    // jobs: [textStart, textEnd, outStart, outBytes] per window
    const b = new Uint8Array(values);
    for (let j = 0; j < jobs.length; j += 4) got.push(decodeWindow(t, jobs[j]!, jobs[j + 1]!, b, jobs[j + 2]!, jobs[j + 3]!));
  }
  port.postMessage({ id, got });
});
