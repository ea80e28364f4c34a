#!/usr/bin/env node
// Runs a TypeScript file from source: `node bin/run-ts.mjs <file.ts> [args…]`. Registers the tsx loader,
// then imports the file with process.argv set as if it had been run directly (argv[1] = the file).
import { register } from 'tsx/esm/api';
import { resolve } from 'node:path';
import { pathToFileURL } from 'node:url';

const [script, ...rest] = process.argv.slice(2);
if (!script) {
  process.stderr.write('usage: node bin/run-ts.mjs <file.ts> [args…]\n');
  process.exit(2);
}
register();
const full = resolve(script);
process.argv = [process.argv[0], full, ...rest];
await import(pathToFileURL(full).href);
