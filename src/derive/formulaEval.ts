/**
 * Evaluates a parsed formula (formulaParse.ts) over whole arrays: each tree node is computed once as a
 * scalar or 3-vector, either a constant or one Float64Array per component, so the cost is a few passes
 * over the tuples per operator. Units propagate as base-unit exponents (formulaUnits.ts) where the
 * inputs' units are known; adding or comparing unlike units, or taking exp/log/trig of a dimensional
 * value, is an error naming the column.
 */
import type { NumericArray } from '../model/fieldArray.ts';
import { FormulaError, REFERENCE_NAMES, type Node } from './formulaParse.ts';
import { addDims, dimsOf, isDimensionless, sameDims, scaleDims, type Dims } from './formulaUnits.ts';

/** A value: `c` (constant components) or `a` (an array per component), 1 or 3 components, with units. */
interface Val { c?: number[]; a?: Float64Array[]; dims: Dims }

/** What the evaluator needs from outside: the fields (one association), reference values, units. */
export interface FormulaInputs {
  /** Tuples of the association the formula runs on. */
  count: number;
  /** A field's values and components, or undefined when there is no such field. */
  field(name: string): { values: NumericArray; components: number; unit: string | undefined } | undefined;
  /** Reference values (SI) by name (see REFERENCE_NAMES); undefined when not set. */
  reference: Readonly<Record<string, number | undefined>>;
}

const width = (v: Val): number => (v.c ? v.c.length : v.a!.length);

/** Evaluates `tree`; returns the values (tuple-interleaved), components and SI unit label dims. */
export function evaluateFormula(tree: Node, inp: FormulaInputs): { values: Float64Array; components: number; dims: Dims } {
  const v = ev(tree, inp);
  const nc = width(v), n = inp.count, out = new Float64Array(n * nc);
  for (let c = 0; c < nc; c++) {
    if (v.c) { const x = v.c[c]!; for (let i = 0; i < n; i++) out[i * nc + c] = x; }
    else { const a = v.a![c]!; for (let i = 0; i < n; i++) out[i * nc + c] = a[i]!; }
  }
  return { values: out, components: nc, dims: v.dims };
}

function arr(v: Val, c: number, n: number): Float64Array {
  if (v.a) return v.a[c]!;
  return new Float64Array(n).fill(v.c![c]!);
}

/** Applies a scalar operation component-wise (broadcasting a scalar against a vector). */
function map2(a: Val, b: Val, n: number, f: (x: number, y: number) => number, dims: Dims): Val {
  const nc = Math.max(width(a), width(b));
  const pick = (v: Val, c: number) => (width(v) === 1 ? 0 : c);
  if (a.c && b.c) return { c: Array.from({ length: nc }, (_, c) => f(a.c![pick(a, c)]!, b.c![pick(b, c)]!)), dims };
  const out: Float64Array[] = [];
  for (let c = 0; c < nc; c++) {
    const o = new Float64Array(n);
    if (a.c) { const x = a.c[pick(a, c)]!, y = b.a![pick(b, c)]!; for (let i = 0; i < n; i++) o[i] = f(x, y[i]!); }
    else if (b.c) { const x = a.a![pick(a, c)]!, y = b.c[pick(b, c)]!; for (let i = 0; i < n; i++) o[i] = f(x[i]!, y); }
    else { const x = a.a![pick(a, c)]!, y = b.a![pick(b, c)]!; for (let i = 0; i < n; i++) o[i] = f(x[i]!, y[i]!); }
    out.push(o);
  }
  return { a: out, dims };
}

function map1(a: Val, n: number, f: (x: number) => number, dims: Dims): Val {
  if (a.c) return { c: a.c.map(f), dims };
  return { a: a.a!.map((x) => { const o = new Float64Array(n); for (let i = 0; i < n; i++) o[i] = f(x[i]!); return o; }), dims };
}

function ev(n: Node, inp: FormulaInputs): Val {
  const N = inp.count;
  switch (n.kind) {
    case 'number': return { c: [n.value], dims: [0, 0, 0, 0] };
    case 'ref': {
      const v = inp.reference[n.name];
      if (v === undefined || !Number.isFinite(v)) throw new FormulaError(`column ${n.at}: ref.${n.name} is not set: give the reference ${n.name}`);
      return { c: [v], dims: dimsOf(REFERENCE_NAMES[n.name]) };
    }
    case 'field': {
      const f = inp.field(n.name);
      if (!f) throw new FormulaError(`column ${n.at}: no field "${n.name}"`);
      if (f.components !== 1 && f.components !== 3) throw new FormulaError(`column ${n.at}: field "${n.name}" has ${f.components} components; formulas take scalars and 3-vectors`);
      const a: Float64Array[] = [];
      for (let c = 0; c < f.components; c++) {
        const o = new Float64Array(N);
        for (let i = 0; i < N; i++) o[i] = f.values[i * f.components + c]!;
        a.push(o);
      }
      return { a, dims: dimsOf(f.unit) };
    }
    case 'unary': { const a = ev(n.arg, inp); return map1(a, N, (x) => -x, a.dims); }
    case 'component': {
      const a = ev(n.arg, inp);
      if (width(a) !== 3) throw new FormulaError(`column ${n.at}: a component (.x, .y, .z) needs a vector, found a scalar`);
      return a.c ? { c: [a.c[n.index]!], dims: a.dims } : { a: [a.a![n.index]!], dims: a.dims };
    }
    case 'binary': {
      const a = ev(n.left, inp), b = ev(n.right, inp);
      if (n.op === '+' || n.op === '-') {
        if (width(a) !== width(b)) throw new FormulaError(`column ${n.at}: "${n.op}" between a scalar and a vector`);
        if (!sameDims(a.dims, b.dims)) throw new FormulaError(`column ${n.at}: "${n.op}" between unlike units`);
        return map2(a, b, N, n.op === '+' ? (x, y) => x + y : (x, y) => x - y, a.dims ?? b.dims);
      }
      if (n.op === '*') {
        if (width(a) === 3 && width(b) === 3) throw new FormulaError(`column ${n.at}: "*" between two vectors: use dot() or cross()`);
        return map2(a, b, N, (x, y) => x * y, addDims(a.dims, b.dims));
      }
      if (n.op === '/') {
        if (width(b) === 3) throw new FormulaError(`column ${n.at}: division by a vector`);
        return map2(a, b, N, (x, y) => x / y, addDims(a.dims, b.dims, -1));
      }
      if (width(a) !== 1 || width(b) !== 1) throw new FormulaError(`column ${n.at}: "^" takes scalars`);
      if (!isDimensionless(b.dims)) throw new FormulaError(`column ${n.at}: an exponent must be dimensionless`);
      const dims = b.c ? scaleDims(a.dims, b.c[0]!) : isDimensionless(a.dims) ? a.dims : null;
      return map2(a, b, N, Math.pow, dims);
    }
    case 'call': return call(n, n.args.map((x) => ev(x, inp)), N);
  }
}

const UNARY: Record<string, (x: number) => number> = {
  abs: Math.abs, exp: Math.exp, log: Math.log, log10: Math.log10, sin: Math.sin, cos: Math.cos, tan: Math.tan, sqrt: Math.sqrt,
};

function call(n: Extract<Node, { kind: 'call' }>, args: Val[], N: number): Val {
  const [a, b, c] = args as [Val, Val | undefined, Val | undefined];
  const scalarArgs = () => { for (const x of args) if (width(x) !== 1) throw new FormulaError(`column ${n.at}: ${n.name}() takes scalars`); };
  switch (n.name) {
    case 'sqrt': scalarArgs(); return map1(a, N, Math.sqrt, scaleDims(a.dims, 0.5));
    case 'abs': return map1(a, N, Math.abs, a.dims);
    case 'exp': case 'log': case 'log10': case 'sin': case 'cos': case 'tan':
      scalarArgs();
      if (!isDimensionless(a.dims)) throw new FormulaError(`column ${n.at}: ${n.name}() needs a dimensionless argument`);
      return map1(a, N, UNARY[n.name]!, a.dims);
    case 'min': case 'max':
      scalarArgs();
      if (!sameDims(a.dims, b!.dims)) throw new FormulaError(`column ${n.at}: ${n.name}() of unlike units`);
      return map2(a, b!, N, n.name === 'min' ? Math.min : Math.max, a.dims ?? b!.dims);
    case 'mag': {
      if (width(a) === 1) return map1(a, N, Math.abs, a.dims);
      const s = map2(map2(map2(comp(a, 0), comp(a, 0), N, (x, y) => x * y, null), map2(comp(a, 1), comp(a, 1), N, (x, y) => x * y, null), N, (x, y) => x + y, null),
        map2(comp(a, 2), comp(a, 2), N, (x, y) => x * y, null), N, (x, y) => x + y, null);
      return map1(s, N, Math.sqrt, a.dims);
    }
    case 'dot': {
      if (width(a) !== 3 || width(b!) !== 3) throw new FormulaError(`column ${n.at}: dot() takes two vectors`);
      const p = (k: 0 | 1 | 2) => map2(comp(a, k), comp(b!, k), N, (x, y) => x * y, null);
      const s = map2(map2(p(0), p(1), N, (x, y) => x + y, null), p(2), N, (x, y) => x + y, null);
      return { ...s, dims: addDims(a.dims, b!.dims) };
    }
    case 'cross': {
      if (width(a) !== 3 || width(b!) !== 3) throw new FormulaError(`column ${n.at}: cross() takes two vectors`);
      const m = (i: 0 | 1 | 2, j: 0 | 1 | 2) => map2(comp(a, i), comp(b!, j), N, (x, y) => x * y, null);
      const d = (p: Val, q: Val) => map2(p, q, N, (x, y) => x - y, null);
      const parts = [d(m(1, 2), m(2, 1)), d(m(2, 0), m(0, 2)), d(m(0, 1), m(1, 0))];
      return join(parts, N, addDims(a.dims, b!.dims));
    }
    default: { // vec
      scalarArgs();
      if (!sameDims(a.dims, b!.dims) || !sameDims(a.dims, c!.dims)) throw new FormulaError(`column ${n.at}: vec() of unlike units`);
      return join([a, b!, c!], N, a.dims ?? b!.dims ?? c!.dims);
    }
  }
}

const comp = (v: Val, k: number): Val => (v.c ? { c: [v.c[k]!], dims: v.dims } : { a: [v.a![k]!], dims: v.dims });

function join(parts: Val[], N: number, dims: Dims): Val {
  if (parts.every((p) => p.c)) return { c: parts.map((p) => p.c![0]!), dims };
  return { a: parts.map((p) => arr(p, 0, N)), dims };
}
