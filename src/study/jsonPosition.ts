/**
 * Where JSON text goes wrong: the offset of the first character a JSON parser (RFC 8259 grammar) cannot
 * accept, found by a small recursive-descent scan. `JSON.parse` says what is wrong but, depending on the
 * engine, not always where; messages about a probe-set file give the line and column.
 */

/** Offset of the first invalid character (`text.length` for unexpected end), or -1 when the text is valid JSON. */
export function jsonErrorOffset(text: string): number {
  let i = 0;
  const ws = () => { while (i < text.length && ' \t\n\r'.includes(text[i]!)) i++; };
  const fail = (): never => { throw i; };
  const literal = (word: string) => { if (text.startsWith(word, i)) i += word.length; else fail(); };
  const string = () => {
    i++;
    while (i < text.length) {
      const c = text.charCodeAt(i);
      if (c === 34) { i++; return; }
      if (c < 32) fail();
      if (c === 92) {
        i++;
        const e = text[i];
        if (e === 'u') { if (!/^[0-9a-fA-F]{4}$/.test(text.slice(i + 1, i + 5))) fail(); i += 5; continue; }
        if (e === undefined || !'"\\/bfnrt'.includes(e)) fail();
      }
      i++;
    }
    fail();
  };
  const number = () => {
    const m = /^-?(0|[1-9]\d*)(\.\d+)?([eE][+-]?\d+)?/.exec(text.slice(i));
    if (!m || m[0] === '-' || m[0] === '') fail();
    i += m![0].length;
  };
  const value = (): void => {
    ws();
    const c = text[i];
    if (c === '{') {
      i++; ws();
      if (text[i] === '}') { i++; return; }
      for (;;) {
        ws();
        if (text[i] !== '"') fail();
        string(); ws();
        if (text[i] !== ':') fail();
        i++; value(); ws();
        if (text[i] === ',') { i++; continue; }
        if (text[i] === '}') { i++; return; }
        fail();
      }
    }
    if (c === '[') {
      i++; ws();
      if (text[i] === ']') { i++; return; }
      for (;;) {
        value(); ws();
        if (text[i] === ',') { i++; continue; }
        if (text[i] === ']') { i++; return; }
        fail();
      }
    }
    if (c === '"') return string();
    if (c === 't') return literal('true');
    if (c === 'f') return literal('false');
    if (c === 'n') return literal('null');
    if (c === '-' || (c !== undefined && c >= '0' && c <= '9')) return number();
    fail();
  };
  try {
    value(); ws();
    return i < text.length ? i : -1;
  } catch (at) {
    return typeof at === 'number' ? at : 0;
  }
}

/** `line L, column C` (1-based) of an offset. */
export function lineColumn(text: string, offset: number): string {
  const before = text.slice(0, offset);
  return `line ${before.split('\n').length}, column ${offset - before.lastIndexOf('\n')}`;
}
