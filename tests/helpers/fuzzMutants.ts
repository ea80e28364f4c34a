/**
 * Seeded mutants of VTK files for the fuzz tests: truncations, byte flips, huge and negative numbers,
 * wrong type names and component counts, NaN/Inf, deep nesting, long lines, misspelled tags, inserted
 * comments and blanks. Each mutant says whether its mutation can legitimately change what the file
 * holds: when it cannot (`keepsCounts`), a load that succeeds must find the same points, cells and
 * arrays as the original — anything else is silently dropped data.
 */
import { seededRandom } from '../../src/model/seededRandom.ts';

export interface Mutant {
  /** What was done, for messages. */
  label: string;
  bytes: Uint8Array;
  /** The mutation cannot change the counts: the mutant must fail or load the original's counts. */
  keepsCounts: boolean;
}

const latin1 = (b: Uint8Array) => new TextDecoder('latin1').decode(b);
const bytesOf = (s: string) => Uint8Array.from(s, (c) => c.charCodeAt(0) & 0xff);
const splice = (b: Uint8Array, at: number, remove: number, insert: Uint8Array) => {
  const out = new Uint8Array(b.length - remove + insert.length);
  out.set(b.subarray(0, at)); out.set(insert, at); out.set(b.subarray(at + remove), at + insert.length);
  return out;
};

/** End of the part of a file that is XML markup or legacy text (before appended or binary data). */
function textEnd(b: Uint8Array): number {
  const s = latin1(b.subarray(0, Math.min(b.length, 1 << 20)));
  const app = s.indexOf('<AppendedData');
  if (app >= 0) return app;
  if (/^\s*# vtk DataFile[^\n]*\n[^\n]*\n\s*BINARY/i.test(s)) {
    const first = /\n(POINTS|CELLS|POLYGONS)[^\n]*\n/.exec(s);
    return first ? first.index + first[0].length : Math.min(b.length, 200);
  }
  return b.length;
}

type Make = (b: Uint8Array, r: () => number) => Mutant | undefined;

const pick = <T>(r: () => number, xs: readonly T[]): T => xs[Math.floor(r() * xs.length)]!;
const isXml = (b: Uint8Array) => /<VTKFile/.test(latin1(b.subarray(0, 4096)));

/** A random match of `re` in the text part, or undefined. */
function randomMatch(b: Uint8Array, r: () => number, re: RegExp): RegExpExecArray | undefined {
  const s = latin1(b.subarray(0, textEnd(b)));
  const all = [...s.matchAll(new RegExp(re.source, re.flags.includes('g') ? re.flags : re.flags + 'g'))];
  return all.length ? all[Math.floor(r() * all.length)] : undefined;
}

const MAKERS: readonly [string, Make][] = [
  ['truncate', (b, r) => { const at = Math.floor(r() * b.length); return { label: `cut at ${at}`, bytes: b.slice(0, at), keepsCounts: false }; }],
  ['byte', (b, r) => { const o = b.slice(); const at = Math.floor(r() * o.length); o[at] = Math.floor(r() * 256); return { label: `byte ${at} = ${o[at]}`, bytes: o, keepsCounts: false }; }],
  ['flip run', (b, r) => { const o = b.slice(); const at = Math.floor(r() * o.length); for (let i = at; i < Math.min(o.length, at + 16); i++) o[i] = o[i]! ^ 0xff; return { label: `16 bytes flipped at ${at}`, bytes: o, keepsCounts: false }; }],
  ['huge number', (b, r) => { const m = randomMatch(b, r, /\b\d{1,6}\b/); return m && { label: `"${m[0]}" → 99999999999 at ${m.index}`, bytes: splice(b, m.index, m[0].length, bytesOf('99999999999')), keepsCounts: false }; }],
  ['negative number', (b, r) => { const m = randomMatch(b, r, /\b\d{1,6}\b/); return m && { label: `"${m[0]}" → -${m[0]} at ${m.index}`, bytes: splice(b, m.index, 0, bytesOf('-')), keepsCounts: false }; }],
  ['type name', (b, r) => { const m = randomMatch(b, r, /\b(Float32|Float64|Int32|Int64|UInt8|UInt32|UInt64|float|double|int|vtkIdType)\b/); return m && { label: `type ${m[0]} → ${m[0]}x`, bytes: splice(b, m.index + m[0].length, 0, bytesOf('x')), keepsCounts: false }; }],
  ['components', (b, r) => { const m = randomMatch(b, r, /NumberOfComponents="(\d+)"/); return m && { label: `${m[0]} → 7`, bytes: splice(b, m.index, m[0].length, bytesOf('NumberOfComponents="7"')), keepsCounts: false }; }],
  ['nan', (b, r) => { const m = randomMatch(b, r, /-?\d+\.\d+(e[-+]?\d+)?/); return m && { label: `${m[0]} → ${pick(r, ['nan', 'inf', '-Infinity', 'NaN'])}`, bytes: splice(b, m.index, m[0].length, bytesOf(pick(r, ['nan', 'inf', '-Infinity', 'NaN']))), keepsCounts: false }; }],
  ['deep nesting', (b, r) => { if (!isXml(b)) return undefined; const m = randomMatch(b, r, />/); return m && { label: `100000 nested <x> after byte ${m.index}`, bytes: splice(b, m.index + 1, 0, bytesOf('<x>'.repeat(100_000))), keepsCounts: false }; }],
  ['long line', (b, r) => { const m = randomMatch(b, r, /\n/); return m && { label: `2 MB of "9" at ${m.index}`, bytes: splice(b, m.index + 1, 0, bytesOf('9'.repeat(2 << 20))), keepsCounts: false }; }],
  ['misspelled tag', (b, r) => {
    const m = randomMatch(b, r, /<(DataArray|Piece|PointData|CellData|Points|Cells|DataSet|Block|PDataArray)\b/);
    if (!m) return undefined;
    const name = m[1]!, bad = name.slice(0, -1) + name.slice(-1).toLowerCase() + 'e';
    const s = latin1(b);
    // the start tag and, when there is one, its matching end tag, so the XML stays well formed
    let out = splice(b, m.index + 1, name.length, bytesOf(bad));
    const close = s.indexOf(`</${name}>`, m.index);
    const selfClosing = /^[^>]*\/>/.test(s.slice(m.index, s.indexOf('>', m.index) + 1));
    if (!selfClosing && close >= 0) out = splice(out, close + 2 + (bad.length - name.length), name.length, bytesOf(bad));
    return { label: `<${name}> → <${bad}>`, bytes: out, keepsCounts: true };
  }],
  ['comment', (b, r) => {
    if (!isXml(b)) return undefined;
    const m = randomMatch(b, r, />\s*(?=<)/);
    return m && { label: `comment after byte ${m.index}`, bytes: splice(b, m.index + 1, 0, bytesOf(`<!-- ${'c'.repeat(Math.floor(r() * 5000))} -->`)), keepsCounts: true };
  }],
  ['blanks', (b, r) => {
    const xml = isXml(b);
    const m = xml ? randomMatch(b, r, />(?=\s*<)/) : randomMatch(b, r, /\n(?=[A-Z_]+ )/);
    return m && { label: `blank run after byte ${m.index}`, bytes: splice(b, m.index + 1, 0, bytesOf((xml ? ' ' : '\n').repeat(1 + Math.floor(r() * 300_000)))), keepsCounts: true };
  }],
];

/** Names of the mutation kinds, in the order they are cycled through. */
export const MUTATION_KINDS = MAKERS.map(([k]) => k);

/**
 * `count` seeded mutants of `original` (seed `seed`), cycling through the mutation kinds; a kind that
 * does not apply to the file (no such text) is replaced by a truncation.
 */
export function mutants(original: Uint8Array, seed: number, count: number): Mutant[] {
  const r = seededRandom(seed);
  const out: Mutant[] = [];
  for (let k = 0; k < count; k++) {
    const [kind, make] = MAKERS[k % MAKERS.length]!;
    const m = make(original, r) ?? MAKERS[0]![1](original, r)!;
    out.push({ ...m, label: `${kind}: ${m.label}` });
  }
  return out;
}
