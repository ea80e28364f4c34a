/**
 * The small kit the probe-set checkers are written with: each check reads one value at a path of the
 * document, records an issue (path, what was expected, what was found) when it does not fit, and returns
 * the value typed, or undefined. Checking goes on after an issue so that one pass lists them all.
 */

/** One problem in a document: where (`probes[2].geometry.normal`), what was expected, what was found. */
export interface Issue {
  path: string;
  expected: string;
  found: string;
}

/** A refused document: the message names the first issue (and how many more there are). */
export class DocumentError extends Error {
  constructor(readonly source: string, readonly issues: readonly Issue[]) {
    const first = issues[0]!;
    const more = issues.length > 1 ? ` (and ${issues.length - 1} more problem${issues.length > 2 ? 's' : ''})` : '';
    super(`${source}: ${first.path || 'document'}: expected ${first.expected}, found ${first.found}${more}`);
    this.name = 'DocumentError';
  }

  /** Every issue, one per line. */
  get details(): string {
    return this.issues.map((i) => `${i.path || 'document'}: expected ${i.expected}, found ${i.found}`).join('\n');
  }
}

/** Short text of a found value for messages. */
export function describeValue(v: unknown): string {
  if (v === undefined) return 'nothing';
  if (v === null) return 'null';
  if (typeof v === 'number') return Number.isFinite(v) ? String(v) : String(v);
  if (typeof v === 'string') return JSON.stringify(v.length > 40 ? v.slice(0, 40) + '…' : v);
  if (typeof v === 'boolean') return String(v);
  if (Array.isArray(v)) {
    const t = JSON.stringify(v);
    return t.length > 48 ? `an array of ${v.length} items` : t;
  }
  return 'an object';
}

/** Joins a path and a member name or index. */
export function at(path: string, key: string | number): string {
  return typeof key === 'number' ? `${path}[${key}]` : path ? `${path}.${key}` : key;
}

/** Collects issues while a document is checked. */
export class Checks {
  readonly issues: Issue[] = [];

  fail(path: string, expected: string, value: unknown): undefined {
    this.issues.push({ path, expected, found: describeValue(value) });
    return undefined;
  }

  /** A plain object holding only `allowed` members and every `required` one. */
  object(v: unknown, path: string, allowed: readonly string[], required: readonly string[] = []): Record<string, unknown> | undefined {
    if (typeof v !== 'object' || v === null || Array.isArray(v)) return this.fail(path, 'an object', v);
    const o = v as Record<string, unknown>;
    for (const k of Object.keys(o)) {
      if (!allowed.includes(k)) this.issues.push({ path: at(path, k), expected: `one of the members ${allowed.join(', ')}`, found: `an unknown member "${k}"` });
    }
    for (const k of required) if (o[k] === undefined) this.fail(at(path, k), `a value (required)`, undefined);
    return o;
  }

  string(v: unknown, path: string, o: { pattern?: RegExp; patternText?: string; maxLength?: number; minLength?: number } = {}): string | undefined {
    if (typeof v !== 'string') return this.fail(path, 'a string', v);
    if (o.minLength !== undefined && v.length < o.minLength) return this.fail(path, `a string of at least ${o.minLength} character${o.minLength === 1 ? '' : 's'}`, v);
    if (o.maxLength !== undefined && v.length > o.maxLength) return this.fail(path, `a string of at most ${o.maxLength} characters`, v);
    if (o.pattern && !o.pattern.test(v)) return this.fail(path, o.patternText ?? `a string matching ${o.pattern}`, v);
    return v;
  }

  number(v: unknown, path: string, o: { min?: number; max?: number; above?: number; below?: number; integer?: boolean } = {}): number | undefined {
    if (typeof v !== 'number' || !Number.isFinite(v)) return this.fail(path, o.integer ? 'a whole number' : 'a finite number', v);
    if (o.integer && !Number.isInteger(v)) return this.fail(path, 'a whole number', v);
    const bounds = [
      o.min !== undefined ? `≥ ${o.min}` : '', o.above !== undefined ? `> ${o.above}` : '',
      o.max !== undefined ? `≤ ${o.max}` : '', o.below !== undefined ? `< ${o.below}` : '',
    ].filter(Boolean).join(' and ');
    if ((o.min !== undefined && v < o.min) || (o.above !== undefined && v <= o.above) || (o.max !== undefined && v > o.max) || (o.below !== undefined && v >= o.below)) {
      return this.fail(path, `a${o.integer ? ' whole' : ''} number ${bounds}`, v);
    }
    return v;
  }

  boolean(v: unknown, path: string): boolean | undefined {
    return typeof v === 'boolean' ? v : this.fail(path, 'true or false', v);
  }

  oneOf<T extends string | number>(v: unknown, path: string, values: readonly T[]): T | undefined {
    return (values as readonly unknown[]).includes(v) ? (v as T) : this.fail(path, `one of ${values.map((x) => JSON.stringify(x)).join(', ')}`, v);
  }

  /** Three finite numbers; `nonZero` refuses (0, 0, 0). */
  vec3(v: unknown, path: string, nonZero = false): [number, number, number] | undefined {
    if (!Array.isArray(v) || v.length !== 3 || !v.every((x) => typeof x === 'number' && Number.isFinite(x))) {
      return this.fail(path, 'an array of 3 finite numbers [x, y, z]', v);
    }
    if (nonZero && v.every((x) => x === 0)) return this.fail(path, 'a non-zero vector', v);
    return v as [number, number, number];
  }

  /** An array with at least `min` items, each checked by `item`. */
  array<T>(v: unknown, path: string, item: (x: unknown, p: string) => T | undefined, min = 0): T[] | undefined {
    if (!Array.isArray(v)) return this.fail(path, 'an array', v);
    if (v.length < min) return this.fail(path, `an array of at least ${min} item${min === 1 ? '' : 's'}`, v);
    const out: T[] = [];
    v.forEach((x, i) => { const r = item(x, at(path, i)); if (r !== undefined) out.push(r); });
    return out;
  }

  /** Checks `o[key]` with `f` when present. */
  optional<T>(o: Record<string, unknown>, key: string, path: string, f: (v: unknown, p: string) => T | undefined): void {
    if (o[key] !== undefined) f(o[key], at(path, key));
  }
}
