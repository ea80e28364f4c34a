#!/usr/bin/env node
// Bundles the command line (src/cli/run.ts and everything it imports, fflate included) into one file,
// dist-cli/fieldtally.mjs, so the installed command starts without compiling TypeScript and needs no
// dependencies. Run by `npm pack` (the `prepack` script) or by hand: `node bin/build-cli.mjs`.
// Verb and bench-stage names are written in as constants: the bundle has no folder to list.
// Each Node worker (compute shares, series runs, zlib blocks) is bundled beside it (dist-cli/<kind>Worker.mjs,
// found by src/parallel/workerEntry.ts), so the installed command's workers start with no TypeScript loader.
import { build } from 'esbuild';
import { readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const { version } = JSON.parse(readFileSync(join(root, 'package.json'), 'utf8'));
const tsNames = (dir) => readdirSync(join(root, dir)).filter((f) => f.endsWith('.ts')).map((f) => f.slice(0, -3)).sort();
const verbs = tsNames('src/cli/verbs');
const stages = tsNames('src/cli/benchStages').filter((n) => n !== 'stage');

const common = {
  bundle: true,
  platform: 'node',
  format: 'esm',
  target: 'node20',
  legalComments: 'eof',
  logLevel: 'warning',
  define: {
    FIELDTALLY_VERSION: JSON.stringify(version),
    FIELDTALLY_VERBS: JSON.stringify(verbs),
    FIELDTALLY_BENCH_STAGES: JSON.stringify(stages),
    FIELDTALLY_BUNDLED: 'true',
  },
  // some bundled CommonJS code may call require() for Node built-ins
  banner: { js: "import { createRequire as fieldtallyRequire } from 'node:module'; const require = fieldtallyRequire(import.meta.url);" },
  metafile: true,
};
const result = await build({ ...common, entryPoints: [join(root, 'src/cli/run.ts')], outfile: join(root, 'dist-cli/fieldtally.mjs') });
const workerEntries = { share: 'workers/shareWorkerBody.ts', series: 'workers/seriesWorkerBody.ts', inflate: 'workers/inflateWorker.node.mjs', text: 'workers/textWorkerBody.ts' };
const workerInputs = [];
for (const [kind, entry] of Object.entries(workerEntries)) {
  const w = await build({ ...common, entryPoints: [join(root, entry)], outfile: join(root, `dist-cli/${kind}Worker.mjs`) });
  workerInputs.push(...Object.keys(w.metafile.inputs));
}

// The licence texts of the packages bundled in travel with the bundle.
const packages = new Set();
for (const input of [...Object.keys(result.metafile.inputs), ...workerInputs]) {
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
  `Packages bundled into fieldtally.mjs and its worker files, with their licences.\n\n${notices.join('\n' + '-'.repeat(72) + '\n\n')}`);

const out = Object.entries(result.metafile.outputs).find(([k]) => k.endsWith('.mjs'));
process.stdout.write(`bundled fieldtally ${version}: ${verbs.length} verbs, ${(out[1].bytes / 1024).toFixed(0)} KiB\n`);
