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
}
