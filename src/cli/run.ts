/** Entry of the bundled command (`bin/build-cli.mjs` bundles from here): runs the command line on argv. */
import { main } from './main.ts';

process.exitCode = await main(process.argv.slice(2));
