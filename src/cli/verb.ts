/**
 * The shape of a command-line verb. Each verb lives in `src/cli/verbs/<name>.ts` and default-exports a
 * `Verb`; `main.ts` finds it by name, so adding a verb touches no other file.
 */
import type { OptionAliases, OptionKind } from './args.ts';

export interface Verb {
  /** One line for the verb list. */
  summary: string;
  /** Usage line(s), printed by `fieldtally <verb> --help`. */
  usage: string;
  options: Record<string, OptionKind>;
  /** Old option names accepted for one version with a notice (old → current), not shown in the help. */
  aliases?: OptionAliases;
  /** Runs the verb; returns the exit code. Throwing an Error prints its message as a one-line error. */
  run(argv: string[], io: VerbIO): Promise<number>;
}

/** Where a verb writes; tests capture it. */
export interface VerbIO {
  out: (text: string) => void;
  err: (text: string) => void;
  /**
   * Writes one part of a large output as it is (no newline added), waiting while the consumer catches up;
   * when absent, parts go to `out` one by one. Large outputs (millions of samples) are written this way,
   * never built as one string.
   */
  write?: (part: string) => Promise<void>;
}

/** Writes `parts` in order through `io.write`, or `io.out` when the IO has no `write`. */
export async function writeParts(io: VerbIO, parts: Iterable<string>): Promise<void> {
  if (io.write) { for (const p of parts) await io.write(p); return; }
  let pending = '';
  for (const p of parts) pending += p;
  io.out(pending);
}
