/**
 * The formula language: a small expression syntax of our own for new fields, parsed by hand (no `eval`,
 * no `Function`) into a tree the evaluator walks once over whole arrays.
 *
 *   expression := sum
 *   sum        := product (('+' | '-') product)*
 *   product    := unary (('*' | '/') unary)*
 *   unary      := '-' unary | power
 *   power      := postfix ('^' unary)?            (right-associative: 2^3^2 = 2^9)
 *   postfix    := primary ('.' ('x' | 'y' | 'z'))*
 *   primary    := number | name | '[' any text but ']' ']' | 'ref.' name | name '(' arguments ')' | '(' expression ')'
 *
 * Names: a field of the file or a derived field (`velocity`, `p`; names with other characters in
 * brackets, `[q-criterion]`, `[static pressure]`), `pi`, reference values `ref.density`, `ref.viscosity`,
 * `ref.speed`, `ref.pressure`, `ref.area`, `ref.length`. Functions: sqrt abs exp log log10 sin cos tan min
 * max, mag(v), dot(a, b), cross(a, b), vec(x, y, z). Errors name the position (1-based column) and what
 * was expected there.
 */

export type Node =
  | { kind: 'number'; value: number; at: number }
  | { kind: 'field'; name: string; at: number }
  | { kind: 'ref'; name: string; at: number }
  | { kind: 'unary'; op: '-'; arg: Node; at: number }
  | { kind: 'binary'; op: '+' | '-' | '*' | '/' | '^'; left: Node; right: Node; at: number }
  | { kind: 'component'; arg: Node; index: 0 | 1 | 2; at: number }
  | { kind: 'call'; name: string; args: Node[]; at: number };

/** Functions and their argument counts. */
export const FUNCTIONS: Readonly<Record<string, number>> = {
  sqrt: 1, abs: 1, exp: 1, log: 1, log10: 1, sin: 1, cos: 1, tan: 1, min: 2, max: 2, mag: 1, dot: 2, cross: 2, vec: 3,
};

/** Reference values a formula may name as `ref.<name>`, with their SI units. */
export const REFERENCE_NAMES: Readonly<Record<string, string>> = {
  density: 'kg/m³', viscosity: 'Pa·s', speed: 'm/s', pressure: 'Pa', area: 'm²', length: 'm',
};

/** A formula error: one line with the column and what was expected. */
export class FormulaError extends Error {}

interface Token { t: 'num' | 'name' | 'bracket' | 'op' | 'end'; v: string; at: number }

function tokens(src: string): Token[] {
  const out: Token[] = [];
  let i = 0;
  while (i < src.length) {
    const c = src[i]!;
    if (c === ' ' || c === '\t' || c === '\n' || c === '\r') { i++; continue; }
    const at = i + 1;
    const num = /^(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?/.exec(src.slice(i));
    if (num) { out.push({ t: 'num', v: num[0], at }); i += num[0].length; continue; }
    const name = /^[A-Za-z_][A-Za-z0-9_]*/.exec(src.slice(i));
    if (name) { out.push({ t: 'name', v: name[0], at }); i += name[0].length; continue; }
    if (c === '[') {
      const j = src.indexOf(']', i + 1);
      if (j < 0) throw new FormulaError(`column ${at}: "[" opens a field name that is never closed: expected "]"`);
      const inner = src.slice(i + 1, j).trim();
      if (!inner) throw new FormulaError(`column ${at}: empty field name in brackets`);
      out.push({ t: 'bracket', v: inner, at }); i = j + 1; continue;
    }
    if ('+-*/^().,'.includes(c)) { out.push({ t: 'op', v: c, at }); i++; continue; }
    throw new FormulaError(`column ${at}: unexpected character "${c}": expected a number, a name, an operator (+ - * / ^) or a bracket`);
  }
  out.push({ t: 'end', v: '', at: src.length + 1 });
  return out;
}

/** Parses a formula's text into a tree, or throws a FormulaError naming the column. */
export function parseFormula(src: string): Node {
  if (src.length > 10000) throw new FormulaError(`formula of ${src.length} characters: at most 10000`);
  const tk = tokens(src);
  let k = 0;
  let depth = 0;
  const peek = () => tk[k]!;
  const describe = (t: Token) => (t.t === 'end' ? 'the end of the formula' : `"${t.t === 'bracket' ? `[${t.v}]` : t.v}"`);
  const expect = (v: string, what: string): Token => {
    const t = peek();
    if (t.t !== 'op' || t.v !== v) throw new FormulaError(`column ${t.at}: expected ${what}, found ${describe(t)}`);
    k++;
    return t;
  };
  const deeper = (at: number) => { if (++depth > 200) throw new FormulaError(`column ${at}: formula nested more than 200 levels deep`); };

  function sum(): Node {
    let left = product();
    for (let t = peek(); t.t === 'op' && (t.v === '+' || t.v === '-'); t = peek()) {
      k++;
      left = { kind: 'binary', op: t.v as '+' | '-', left, right: product(), at: t.at };
    }
    return left;
  }
  function product(): Node {
    let left = unary();
    for (let t = peek(); t.t === 'op' && (t.v === '*' || t.v === '/'); t = peek()) {
      k++;
      left = { kind: 'binary', op: t.v as '*' | '/', left, right: unary(), at: t.at };
    }
    return left;
  }
  function unary(): Node {
    const t = peek();
    if (t.t === 'op' && t.v === '-') { k++; deeper(t.at); const arg = unary(); depth--; return { kind: 'unary', op: '-', arg, at: t.at }; }
    if (t.t === 'op' && t.v === '+') { k++; return unary(); }
    return power();
  }
  function power(): Node {
    const base = postfix();
    const t = peek();
    if (t.t === 'op' && t.v === '^') { k++; deeper(t.at); const right = unary(); depth--; return { kind: 'binary', op: '^', left: base, right, at: t.at }; }
    return base;
  }
  function postfix(): Node {
    let node = primary();
    for (let t = peek(); t.t === 'op' && t.v === '.'; t = peek()) {
      k++;
      const c = peek();
      const index = c.t === 'name' ? ['x', 'y', 'z'].indexOf(c.v) : -1;
      if (index < 0) throw new FormulaError(`column ${c.at}: expected a component x, y or z after ".", found ${describe(c)}`);
      k++;
      node = { kind: 'component', arg: node, index: index as 0 | 1 | 2, at: t.at };
    }
    return node;
  }
  function primary(): Node {
    const t = peek();
    if (t.t === 'num') { k++; return { kind: 'number', value: Number(t.v), at: t.at }; }
    if (t.t === 'bracket') { k++; return { kind: 'field', name: t.v, at: t.at }; }
    if (t.t === 'op' && t.v === '(') {
      k++; deeper(t.at);
      const e = sum();
      depth--;
      expect(')', `")" to close the "(" at column ${t.at}`);
      return e;
    }
    if (t.t === 'name') {
      k++;
      if (t.v === 'ref' && peek().t === 'op' && peek().v === '.') {
        k++;
        const n = peek();
        if (n.t !== 'name' || !(n.v in REFERENCE_NAMES)) throw new FormulaError(`column ${n.at}: expected a reference value (${Object.keys(REFERENCE_NAMES).join(', ')}) after "ref.", found ${describe(n)}`);
        k++;
        return { kind: 'ref', name: n.v, at: t.at };
      }
      if (peek().t === 'op' && peek().v === '(') {
        const arity = FUNCTIONS[t.v];
        if (arity === undefined) throw new FormulaError(`column ${t.at}: unknown function "${t.v}" (known: ${Object.keys(FUNCTIONS).join(', ')})`);
        const open = peek();
        k++; deeper(open.at);
        const args: Node[] = [sum()];
        while (peek().t === 'op' && peek().v === ',') { k++; args.push(sum()); }
        depth--;
        expect(')', `"," or ")" in the arguments of ${t.v}( at column ${open.at}`);
        if (args.length !== arity) throw new FormulaError(`column ${t.at}: ${t.v}() takes ${arity} argument${arity > 1 ? 's' : ''}, found ${args.length}`);
        return { kind: 'call', name: t.v, args, at: t.at };
      }
      if (t.v === 'pi') return { kind: 'number', value: Math.PI, at: t.at };
      return { kind: 'field', name: t.v, at: t.at };
    }
    throw new FormulaError(`column ${t.at}: expected a number, a field name, a function or "(", found ${describe(t)}`);
  }

  const tree = sum();
  if (peek().t !== 'end') throw new FormulaError(`column ${peek().at}: expected an operator or the end of the formula, found ${describe(peek())}`);
  return tree;
}

/** Field names a formula tree uses (bracketed names as written, without brackets). */
export function formulaFields(n: Node, out: Set<string> = new Set()): Set<string> {
  switch (n.kind) {
    case 'field': out.add(n.name); break;
    case 'unary': case 'component': formulaFields(n.arg, out); break;
    case 'binary': formulaFields(n.left, out); formulaFields(n.right, out); break;
    case 'call': for (const a of n.args) formulaFields(a, out); break;
    default: break;
  }
  return out;
}
