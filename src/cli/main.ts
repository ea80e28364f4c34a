/**
 * The `fieldtally` command: dispatches to a verb module by name. Exit code 0 on success; on failure a
 * one-line error on stderr and a non-zero code.
 */
import { existsSync, readdirSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { oneLineMessage } from '../io/messageText.ts';
import { ALLOW_LARGE, defaultMemoryLimit, setMemoryLimit } from './memoryLimit.ts';
import type { Verb, VerbIO } from './verb.ts';
import { toolVersion } from './version.ts';

const VERB_DIR = join(dirname(fileURLToPath(import.meta.url)), 'verbs');

/** Verb names written in by the bundler (`bin/build-cli.mjs`); from source, `src/cli/verbs` is listed. */
declare const FIELDTALLY_VERBS: readonly string[] | undefined;

/** Old verb names accepted for one version with a notice (old → current); not listed. */
export const VERB_ALIASES: Readonly<Record<string, string>> = { probes: 'check-probes' };

/** Names of the verbs present in `src/cli/verbs`. */
export function verbNames(): string[] {
  if (typeof FIELDTALLY_VERBS !== 'undefined') return [...FIELDTALLY_VERBS];
  return readdirSync(VERB_DIR).filter((f) => f.endsWith('.ts')).map((f) => f.slice(0, -3)).sort();
}

/** Loads a verb by name, or undefined if there is none. */
export async function loadVerb(name: string): Promise<Verb | undefined> {
  if (!/^[a-z][a-z-]*$/.test(name)) return undefined;
  if (typeof FIELDTALLY_VERBS !== 'undefined' ? !FIELDTALLY_VERBS.includes(name) : !existsSync(join(VERB_DIR, `${name}.ts`))) return undefined;
  return ((await import(`./verbs/${name}.ts`)) as { default: Verb }).default;
}

const stdio: VerbIO = {
  out: (t) => process.stdout.write(t.endsWith('\n') ? t : t + '\n'),
  err: (t) => process.stderr.write(t.endsWith('\n') ? t : t + '\n'),
  write: async (t) => {
    if (!process.stdout.write(t)) await new Promise<void>((r) => process.stdout.once('drain', () => r()));
  },
};

async function usage(io: VerbIO): Promise<void> {
  const lines = ['usage: fieldtally <verb> [arguments] (fieldtally <verb> --help for details; fieldtally --version)', '', 'verbs:'];
  lines.splice(1, 0, `  ${ALLOW_LARGE} (any verb): go ahead with a load or output above the memory limit (by default 3/4 of the machine's memory)`);
  for (const n of verbNames()) lines.push(`  ${n.padEnd(13)} ${(await loadVerb(n))!.summary}`);
  io.out(lines.join('\n'));
}

/** Runs the command line; returns the process exit code. */
export async function main(argv: string[], io: VerbIO = stdio): Promise<number> {
  const allowLarge = argv.includes(ALLOW_LARGE);
  let [name, ...rest] = argv.filter((a) => a !== ALLOW_LARGE);
  if (name === '--version' || name === '-V') { io.out(`fieldtally ${toolVersion()}`); return 0; }
  setMemoryLimit(allowLarge ? undefined : defaultMemoryLimit());
  if (!name || name === '--help' || name === '-h' || name === 'help') { await usage(io); return name ? 0 : 2; }
  if (Object.hasOwn(VERB_ALIASES, name)) {
    io.err(`fieldtally: the verb "${name}" is now "${VERB_ALIASES[name]}"; the old name will be removed in the next version`);
    name = VERB_ALIASES[name]!;
  }
  const verb = await loadVerb(name);
  if (!verb) { io.err(`fieldtally: unknown verb "${name}" (known: ${verbNames().join(', ')})`); return 2; }
  if (rest.includes('--help')) { io.out(verb.usage); return 0; }
  try {
    return await verb.run(rest, io);
  } catch (e) {
    io.err(`fieldtally ${name}: ${oneLineMessage(e)}`);
    if (process.env.FIELDTALLY_DEBUG && e instanceof Error && e.stack) io.err(e.stack);
    return 1;
  }
}
