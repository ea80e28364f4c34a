/**
 * Command-line argument parsing shared by every verb: positional arguments and `--name value` or
 * `--flag` options, each declared by the verb. Unknown options and missing values are errors.
 */

import { quoteText } from '../io/messageText.ts';

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
      if (name in options) throw new Error(`${verb}: option --${name} is given twice; give it once`);
      if (kind === 'boolean') {
        if (eq > 0) throw new Error(`${verb}: option --${name} is a switch and takes no value (got ${quoteArg(a)})`);
        options[name] = true;
        continue;
      }
      const value = eq > 0 ? a.slice(eq + 1) : argv[++i];
      if (value === undefined) throw new Error(`${verb}: option --${name} needs a value`);
      options[name] = value;
    } else {
      positional.push(a);
    }
  }
  return { positional, options, notices };
}

/** A decimal number as the command line accepts it: optional sign, digits with an optional point, optional exponent. */
const DECIMAL = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

/** Parses `x,y,z` into three finite numbers (each written as a decimal number), or throws naming the option. */
export function parseVec3(text: string, option: string): [number, number, number] {
  const parts = text.split(',');
  if (parts.length !== 3) throw new Error(`--${option}: expected three numbers x,y,z, got ${quoteArg(text)}`);
  return parts.map((p, i) => strictNumber(p, option, `component ${'xyz'[i]} of x,y,z`, text)) as [number, number, number];
}

/**
 * Parses a direction `x,y,z` (a plane normal, a drag or lift direction): three numbers whose length is
 * well above rounding level, so that it can be normalised (1e-300 or a denormal is refused).
 */
export function parseDirection(text: string, option: string): [number, number, number] {
  const v = parseVec3(text, option);
  const scale = Math.max(Math.abs(v[0]), Math.abs(v[1]), Math.abs(v[2]));
  if (!(scale >= 1e-150 && scale <= 1e150)) {
    throw new Error(`--${option}: the direction ${quoteArg(text)} has ${scale === 0 ? 'zero length' : 'a length too close to 0 or too large to normalise'}; expected a vector such as 0,0,1`);
  }
  return v;
}

/** Parses a finite decimal number (no hex, no blanks, no overflow), or throws naming the option. */
export function parseNumber(text: string, option: string): number {
  return strictNumber(text, option, 'a number', text);
}

/** A positive finite number, or throws naming the option and what it means. */
export function parsePositive(text: string, option: string, what = 'a positive number'): number {
  const v = parseNumber(text, option);
  if (!(v > 0)) throw new Error(`--${option}: expected ${what} (> 0), got ${quoteArg(text)}`);
  return v;
}

function strictNumber(part: string, option: string, what: string, whole: string): number {
  const t = part.trim();
  if (!DECIMAL.test(t)) throw new Error(`--${option}: expected ${what} written as a decimal number, got ${quoteArg(whole)}`);
  const v = Number(t);
  if (!Number.isFinite(v)) throw new Error(`--${option}: ${quoteArg(whole)} is out of range (expected a finite number of magnitude below 1.8e308)`);
  return v;
}

/**
 * Reference values for coefficients, checked: each positive, and the reference force ½ρV²A (and moment
 * ½ρV²AL) finite, so a coefficient is never divided by an overflowed 0 or ∞.
 */
export function checkReferenceScale(r: { rho: number; speed: number; area: number; length?: number }): void {
  for (const [k, v] of Object.entries(r)) if (!(v > 0)) throw new Error(`--${k}: expected a positive reference value, got ${v}`);
  const force = 0.5 * r.rho * r.speed * r.speed * r.area;
  const moment = force * (r.length ?? 1);
  if (!(Number.isFinite(moment) && moment > 0 && Number.isFinite(1 / force) && Number.isFinite(1 / moment))) {
    throw new Error(`reference values out of range: ½·ρ·V²·A${r.length !== undefined ? '·L' : ''} = ${moment} (ρ ${r.rho}, V ${r.speed}, A ${r.area}${r.length !== undefined ? `, L ${r.length}` : ''}); expected a finite, non-zero reference force`);
  }
}

/** An argument quoted for a message: escaped and cut. */
export function quoteArg(text: string): string {
  return quoteText(text, 60);
}

/** A string option's value, or undefined. */
export function str(args: ParsedArgs, name: string): string | undefined {
  const v = args.options[name];
  return typeof v === 'string' ? v : undefined;
}
