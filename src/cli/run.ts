/**
 * Entry of the bundled command (`bin/build-cli.mjs` bundles from here; the clone's tsx fallback imports it
 * too): runs the command line on argv, then leaves as soon as stdout and stderr are flushed.
 *
 * Why `process.exit`: a verb returns once its work is done and its output written (pools closed, files
 * saved), so what is left — freeing a loaded field's arrays, tearing down the engine's heap and threads —
 * only delays the shell. Ending the natural way took 15–50 ms after the last line on a 1M-cell `cut`.
 */
import { main } from './main.ts';

/** Resolves once everything written to `stream` so far has been handed to the system. */
function flushed(stream: NodeJS.WriteStream): Promise<void> {
  return new Promise((done) => { stream.write('', () => done()); });
}

const code = await main(process.argv.slice(2));
await Promise.all([flushed(process.stdout), flushed(process.stderr)]);
process.exit(code);
