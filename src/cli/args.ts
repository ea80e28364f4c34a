/**
 * Command-line argument parsing shared by every verb: positional arguments and `--name value` or
 * `--flag` options, each declared by the verb. Unknown options and missing values are errors.
 */

export type OptionKind = 'string' | 'boolean';

export interface ParsedArgs {
  positional: string[];
  options: Record<string, string | boolean>;
  /** One-line notices for old option names that were used (the verb prints them on stderr). */
  notices: string[];
}

/**
 * Old option names still accepted for one version, old → current (without the `--`). They are not listed in
 * the help or in the "known options" of an error; using one gives a notice naming the current name.
 */
export type OptionAliases = Readonly<Record<string, string>>;

/** The notice for an old option name. */
export const renamedNotice = (verb: string, old: string, current: string): string =>
  `fieldtally ${verb}: --${old} is now --${current}; the old name will be removed in the next version`;

/** Parses `argv` against declared options; throws an Error with a one-line message on misuse. */
export function parseArgs(argv: string[], declared: Record<string, OptionKind>, verb: string, aliases: OptionAliases = {}): ParsedArgs {
  const positional: string[] = [];
  const options: Record<string, string | boolean> = {};
  const notices: string[] = [];
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i]!;
    if (a.startsWith('--')) {
      const eq = a.indexOf('=');
      let name = eq > 0 ? a.slice(2, eq) : a.slice(2);
      const current = Object.hasOwn(aliases, name) ? aliases[name]! : undefined;
      if (current !== undefined) {
        const notice = renamedNotice(verb, name, current);
        if (!notices.includes(notice)) notices.push(notice);
        name = current;
      }
      const kind = Object.hasOwn(declared, name) ? declared[name] : undefined;
      if (!kind) throw new Error(`${verb}: unknown option --${name} (known: ${Object.keys(declared).map((k) => '--' + k).join(', ') || 'none'})`);
      if (kind === 'boolean') { options[name] = true; continue; }
      const value = eq > 0 ? a.slice(eq + 1) : argv[++i];
      if (value === undefined) throw new Error(`${verb}: option --${name} needs a value`);
      options[name] = value;
    } else {
      positional.push(a);
    }
  }
  return { positional, options, notices };
}

/** Parses `x,y,z` into three finite numbers, or throws naming the option. */
export function parseVec3(text: string, option: string): [number, number, number] {
  const parts = text.split(',').map((s) => Number(s.trim()));
  if (parts.length !== 3 || parts.some((v) => !Number.isFinite(v))) {
    throw new Error(`--${option}: expected three numbers x,y,z, got "${text}"`);
  }
  return parts as [number, number, number];
}

/** Parses a finite number, or throws naming the option. */
export function parseNumber(text: string, option: string): number {
  const v = Number(text);
  if (text.trim() === '' || !Number.isFinite(v)) throw new Error(`--${option}: expected a number, got "${text}"`);
  return v;
}

/** A string option's value, or undefined. */
export function str(args: ParsedArgs, name: string): string | undefined {
  const v = args.options[name];
  return typeof v === 'string' ? v : undefined;
}
