#!/usr/bin/env node
// Entry of the `fieldtally` command: registers the TypeScript loader, then runs the CLI from source,
// so `npx fieldtally …` works right after `npm ci` with no build step.
import { register } from 'tsx/esm/api';
register();
const { main } = await import('../src/cli/main.ts');
process.exitCode = await main(process.argv.slice(2));
