/**
 * Entry of the bundled command (`bin/cliBundle.mjs` bundles from here; `bin/runBundle.mjs` loads the bundle
 * and calls `runCommand`, the clone's tsx fallback imports this file and does the same).
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

/** Runs the command line `argv` (the arguments after the command's name), then ends the process with its exit code once stdout and stderr are flushed. */
export async function runCommand(argv: string[]): Promise<never> {
  const code = await main(argv);
  await Promise.all([flushed(process.stdout), flushed(process.stderr)]);
  process.exit(code);
}
