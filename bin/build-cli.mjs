#!/usr/bin/env node
// Bundles the command line (src/cli/run.ts and everything it imports, fflate included) into one file,
// dist-cli/fieldtally.cjs (run by bin/runBundle.mjs with a V8 code cache), so the installed command starts without compiling TypeScript and needs no
// dependencies. Run by `npm pack` (the `prepack` script) or by hand: `node bin/build-cli.mjs`.
// Verb and bench-stage names are written in as constants: the bundle has no folder to list.
// Each Node worker (compute shares, series runs, zlib blocks) is bundled beside it (dist-cli/<kind>Worker.mjs,
// found by src/parallel/workerEntry.ts), so the installed command's workers start with no TypeScript loader.
// The esbuild options live in bin/cliBundle.mjs, shared with the clone's cached bundle (bin/fieldtally.mjs).
import { readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { writeBundle } from './cliBundle.mjs';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
// a fresh folder: npm pack ships all of it, so no file of an earlier layout may stay behind
rmSync(join(root, 'dist-cli'), { recursive: true, force: true });
const { version, verbs, bytes, inputs } = await writeBundle(root, join(root, 'dist-cli'));

// The licence texts of the packages bundled in travel with the bundle.
const packages = new Set();
for (const input of inputs) {
  const m = /node_modules\/((?:@[^/]+\/)?[^/]+)\//.exec(input);
  if (m) packages.add(m[1]);
}
const notices = [...packages].sort().map((name) => {
  const dir = join(root, 'node_modules', name);
  const pkg = JSON.parse(readFileSync(join(dir, 'package.json'), 'utf8'));
  const file = readdirSync(dir).find((f) => /^(licen[cs]e|copying)(\.|$)/i.test(f));
  if (!file) throw new Error(`build-cli: bundled package ${name} has no licence file in ${dir}`);
  return `${name} ${pkg.version} (${pkg.license ?? 'see below'})\n\n${readFileSync(join(dir, file), 'utf8').trim()}\n`;
});
writeFileSync(join(root, 'dist-cli/THIRD-PARTY-NOTICES.txt'),
  `Packages bundled into fieldtally.cjs and its worker files, with their licences.\n\n${notices.join('\n' + '-'.repeat(72) + '\n\n')}`);

process.stdout.write(`bundled fieldtally ${version}: ${verbs.length} verbs, ${(bytes / 1024).toFixed(0)} KiB\n`);
