/**
 * A minimal tag scanner for VTK XML files, working on bytes. It builds a small tree of the elements
 * (names, attributes, children) and records where each element's text lies, but never turns the file
 * into a string or a DOM: inline array data are left in place as byte ranges, and scanning stops at
 * `<AppendedData>`, whose raw bytes may hold anything.
 *
 * Supported XML: start/end/empty tags, attributes in single or double quotes with the five predefined
 * entities and numeric character references, comments, processing instructions and `<!DOCTYPE …>`.
 * CDATA sections are refused (VTK never writes them).
 */
import { quoteBytes } from './messageText.ts';

/** One element: name, attributes, children, and the byte range of its trailing text. */
export interface XmlElement {
  readonly name: string;
  readonly attrs: ReadonlyMap<string, string>;
  readonly children: XmlElement[];
  /**
   * Byte range `[textStart, textEnd)` of the element's first non-blank run of text between tags (for a
   * DataArray, its inline data, whether written before or after `<InformationKey>` children). Empty
   * (`textStart === textEnd`) when the element holds no text.
   */
  textStart: number;
  textEnd: number;
  /** Byte offset of the start tag, for messages. */
  readonly at: number;
}

/** The `<AppendedData>` section: `start` is the byte after the `_` marker; data offsets count from there. */
export interface AppendedSection {
  readonly encoding: 'raw' | 'base64';
  readonly start: number;
  /** First byte after the data (the `<` of `</AppendedData>`). */
  readonly end: number;
}

export interface XmlDocument {
  readonly root: XmlElement;
  readonly appended?: AppendedSection;
}

const LT = 60, GT = 62, SLASH = 47, QMARK = 63, BANG = 33, EQ = 61, UNDERSCORE = 95;
/** XML whitespace (space, line feed, carriage return, tab). */
export const isSpace = (c: number) => c === 32 || c === 10 || c === 13 || c === 9;
const utf8 = new TextDecoder('utf-8');
const TAIL_SEARCH = 4096;

/**
 * Limits of the scanner, far above what VTK writes, so a hostile file cannot exhaust memory or the stack:
 * elements nested deeper than `depth`, more than `elements` in all, a tag or attribute name longer than
 * `name` bytes, more than `attributes` on one element or an attribute value above `value` bytes.
 */
export const XML_LIMITS = { depth: 256, elements: 1_000_000, name: 256, attributes: 256, value: 1 << 20 } as const;

/** Position of the byte sequence `seq` in `bytes` at or after `from`, or −1. */
export function findBytes(bytes: Uint8Array, seq: Uint8Array, from: number, to = bytes.length): number {
  const first = seq[0]!, n = seq.length;
  let i = bytes.indexOf(first, from);
  while (i >= 0 && i + n <= to) {
    let k = 1;
    while (k < n && bytes[i + k] === seq[k]) k++;
    if (k === n) return i;
    i = bytes.indexOf(first, i + 1);
  }
  return -1;
}

/** Last position of `seq` in `bytes[from, to)`, or −1. */
function findBytesBackward(bytes: Uint8Array, seq: Uint8Array, from: number, to: number): number {
  const n = seq.length;
  for (let i = to - n; i >= from; i--) {
    let k = 0;
    while (k < n && bytes[i + k] === seq[k]) k++;
    if (k === n) return i;
  }
  return -1;
}

const ascii = (s: string) => Uint8Array.from(s, (c) => c.charCodeAt(0));
const PI_END = ascii('?>'), COMMENT_END = ascii('-->'), CDATA = ascii('<![CDATA[');
const APPENDED_CLOSE = ascii('</AppendedData>'), FILE_CLOSE = ascii('</VTKFile>');

function latin1(bytes: Uint8Array, start: number, end: number): string {
  let s = '';
  for (let i = start; i < end; i++) s += String.fromCharCode(bytes[i]!);
  return s;
}

const ENTITIES: Readonly<Record<string, string>> = { amp: '&', lt: '<', gt: '>', quot: '"', apos: "'" };

function decodeEntities(s: string): string {
  if (!s.includes('&')) return s;
  return s.replace(/&(#x[0-9a-fA-F]+|#[0-9]+|[a-z]+);/g, (m, e: string) => {
    if (e[0] === '#') {
      const code = e[1] === 'x' ? parseInt(e.slice(2), 16) : parseInt(e.slice(1), 10);
      return code > 0 && code <= 0x10ffff ? String.fromCodePoint(code) : m;
    }
    return ENTITIES[e] ?? m;
  });
}

/** Whether `bytes[start, end)` holds anything but whitespace (stops at the first such byte). */
function hasText(bytes: Uint8Array, start: number, end: number): boolean {
  for (let i = start; i < end; i++) if (!isSpace(bytes[i]!)) return true;
  return false;
}

/** Error for a file that ends before the structure does. */
function truncated(where: string, what: string): Error {
  return new Error(`${where}: file ends ${what}; expected the rest of the XML (is the file truncated?)`);
}

/** Thrown (not as an error) when a scan of the start of a file reaches the end of what it was given. */
const MORE = Symbol('more bytes needed');

/** Scan state: whether the bytes are the whole file, and whether inline data (text, or a non-appended DataArray) was seen. */
interface ScanState { readonly complete: boolean; inline: boolean }

/** The end of the bytes was reached: an error for a whole file, a request for more bytes for the start of one. */
function shortOf(s: ScanState, where: string, what: string): Error {
  if (!s.complete) throw MORE;
  return truncated(where, what);
}

interface StartTag { el: XmlElement; end: number; selfClosing: boolean }

/** Reads a start tag at `lt` (the `<`): name and attributes. */
function readStartTag(bytes: Uint8Array, lt: number, where: string, s: ScanState): StartTag {
  const n = bytes.length;
  let p = lt + 1;
  const nameEnd = Math.min(n, lt + 2 + XML_LIMITS.name);
  while (p < nameEnd && !isSpace(bytes[p]!) && bytes[p] !== GT && bytes[p] !== SLASH) p++;
  if (p - lt - 1 > XML_LIMITS.name) throw new Error(`${where}: tag name at byte ${lt} is longer than ${XML_LIMITS.name} bytes (starts ${quoteBytes(bytes, lt, 24)}); expected a VTK element name`);
  if (p >= n) throw shortOf(s, where, `inside a tag at byte ${lt}`);
  const name = latin1(bytes, lt + 1, p);
  if (name.length === 0) throw new Error(`${where}: empty tag name at byte ${lt}`);
  const attrs = new Map<string, string>();
  for (;;) {
    while (p < n && isSpace(bytes[p]!)) p++;
    if (p >= n) throw shortOf(s, where, `inside the <${name}> tag at byte ${lt}`);
    const c = bytes[p]!;
    if (c === GT) {
      const el: XmlElement = { name, attrs, children: [], textStart: p + 1, textEnd: p + 1, at: lt };
      return { el, end: p + 1, selfClosing: false };
    }
    if (c === SLASH) {
      if (bytes[p + 1] !== GT) {
        if (p + 1 >= n) throw shortOf(s, where, `inside the <${name}> tag at byte ${lt}`);
        throw new Error(`${where}: expected "/>" in the <${name}> tag at byte ${p}`);
      }
      const el: XmlElement = { name, attrs, children: [], textStart: p + 2, textEnd: p + 2, at: lt };
      return { el, end: p + 2, selfClosing: true };
    }
    const a0 = p;
    if (attrs.size >= XML_LIMITS.attributes) throw new Error(`${where}: <${name}> at byte ${lt} has more than ${XML_LIMITS.attributes} attributes`);
    const anameEnd = Math.min(n, a0 + XML_LIMITS.name + 1);
    while (p < anameEnd && !isSpace(bytes[p]!) && bytes[p] !== EQ && bytes[p] !== GT && bytes[p] !== SLASH) p++;
    if (p - a0 > XML_LIMITS.name) throw new Error(`${where}: an attribute name of <${name}> at byte ${a0} is longer than ${XML_LIMITS.name} bytes (starts ${quoteBytes(bytes, a0, 24)})`);
    const aname = latin1(bytes, a0, p);
    while (p < n && isSpace(bytes[p]!)) p++;
    if (p >= n) throw shortOf(s, where, `inside the <${name}> tag at byte ${lt}`);
    if (bytes[p] !== EQ) throw new Error(`${where}: attribute "${aname}" of <${name}> at byte ${a0} has no value (expected =)`);
    p++;
    while (p < n && isSpace(bytes[p]!)) p++;
    if (p >= n) throw shortOf(s, where, `inside the <${name}> tag at byte ${lt}`);
    const q = bytes[p]!;
    if (q !== 34 && q !== 39) throw new Error(`${where}: value of attribute "${aname}" of <${name}> at byte ${p} is not quoted`);
    const close = bytes.subarray(0, Math.min(n, p + 2 + XML_LIMITS.value)).indexOf(q, p + 1);
    if (close < 0 && p + 2 + XML_LIMITS.value <= n) throw new Error(`${where}: the value of attribute "${aname}" of <${name}> at byte ${p} is longer than ${XML_LIMITS.value} bytes`);
    if (close < 0) throw shortOf(s, where, `inside the value of attribute "${aname}" of <${name}> at byte ${p}`);
    attrs.set(aname, decodeEntities(utf8.decode(bytes.subarray(p + 1, close))));
    p = close + 1;
  }
}

/** Where the appended data start: the byte after the `_` marker that follows the `<AppendedData …>` tag ending at `end`. */
function appendedStart(bytes: Uint8Array, el: XmlElement, end: number, where: string, s: ScanState): { encoding: 'raw' | 'base64'; start: number } {
  const enc = el.attrs.get('encoding') ?? 'raw';
  if (enc !== 'raw' && enc !== 'base64') {
    throw new Error(`${where}: <AppendedData encoding="${enc}"> is not supported (expected "raw" or "base64")`);
  }
  let p = end;
  while (p < bytes.length && isSpace(bytes[p]!)) p++;
  if (p >= bytes.length) throw shortOf(s, where, 'right after <AppendedData>');
  if (bytes[p] !== UNDERSCORE) {
    throw new Error(`${where}: appended data must start with "_", found ${quoteBytes(bytes, p, 1)} at byte ${p}`);
  }
  return { encoding: enc, start: p + 1 };
}

/** Bytes at the end of a file searched for `</AppendedData>`. */
export const APPENDED_TAIL_BYTES = TAIL_SEARCH;

/**
 * The end of appended data starting at `start` (the `<` of `</AppendedData>`), found from the end of the
 * file, since raw bytes may contain anything: `tail` holds the file's bytes from `tailAt` to its end (at
 * least its last `APPENDED_TAIL_BYTES`, or everything after `start`).
 */
export function appendedEnd(tail: Uint8Array, tailAt: number, start: number, encoding: 'raw' | 'base64', where: string): number {
  const from = Math.max(start, tailAt + tail.length - TAIL_SEARCH) - tailAt;
  const at = findBytesBackward(tail, APPENDED_CLOSE, Math.max(0, from), tail.length);
  if (at < 0) {
    throw truncated(where, encoding === 'raw'
      ? 'inside the raw appended data (no </AppendedData> at the end)'
      : 'inside the base64 appended data (no </AppendedData> after it)');
  }
  if (findBytes(tail, FILE_CLOSE, at) < 0) throw truncated(where, 'before </VTKFile>');
  return tailAt + at;
}

/** Locates the appended data after the `<AppendedData …>` start tag ending at `end` (whole file in `bytes`). */
function appendedSection(bytes: Uint8Array, el: XmlElement, end: number, where: string, s: ScanState): AppendedSection {
  const { encoding, start } = appendedStart(bytes, el, end, where, s);
  return { encoding, start, end: appendedEnd(bytes, 0, start, encoding, where) };
}

/** Result of scanning up to the appended data (or to the end): the tree, and the `<AppendedData>` tag if reached. */
interface Scanned { root: XmlElement; appended?: { el: XmlElement; end: number } }

function scan(bytes: Uint8Array, where: string, s: ScanState): Scanned {
  const stack: XmlElement[] = [];
  let root: XmlElement | undefined;
  let pos = 0, elements = 0;
  for (;;) {
    const lt = bytes.indexOf(LT, pos);
    if (lt < 0) break;
    const top = stack[stack.length - 1];
    if (top && top.textStart === top.textEnd && lt > pos && hasText(bytes, pos, lt)) {
      top.textStart = pos;
      top.textEnd = lt;
      if (top.name === 'DataArray') s.inline = true;
    }
    const c = bytes[lt + 1];
    if (c === undefined) throw shortOf(s, where, `inside a tag at byte ${lt}`);
    if (c === QMARK) {
      const e = findBytes(bytes, PI_END, lt + 2);
      if (e < 0) throw shortOf(s, where, `inside a <?…?> instruction at byte ${lt}`);
      pos = e + 2;
      continue;
    }
    if (c === BANG) {
      if (bytes[lt + 2] === 45 && bytes[lt + 3] === 45) {
        const e = findBytes(bytes, COMMENT_END, lt + 4);
        if (e < 0) throw shortOf(s, where, `inside a comment at byte ${lt}`);
        pos = e + 3;
      } else if (findBytes(bytes, CDATA, lt, lt + CDATA.length) === lt) {
        throw new Error(`${where}: CDATA section at byte ${lt} is not supported in VTK XML files`);
      } else {
        const e = bytes.indexOf(GT, lt);
        if (e < 0) throw shortOf(s, where, `inside a <!…> declaration at byte ${lt}`);
        pos = e + 1;
      }
      continue;
    }
    if (c === SLASH) {
      const e = bytes.indexOf(GT, lt);
      if (e < 0) throw shortOf(s, where, `inside a closing tag at byte ${lt}`);
      if (e - lt > XML_LIMITS.name + 8) throw new Error(`${where}: closing tag at byte ${lt} is longer than ${XML_LIMITS.name} bytes (starts ${quoteBytes(bytes, lt, 24)})`);
      const name = latin1(bytes, lt + 2, e).trim();
      const open = stack.pop();
      if (!open) throw new Error(`${where}: closing tag </${name}> at byte ${lt} has no matching start tag`);
      if (open.name !== name) throw new Error(`${where}: closing tag </${name}> at byte ${lt} does not match <${open.name}> opened at byte ${open.at}`);
      pos = e + 1;
      continue;
    }
    const { el, end, selfClosing } = readStartTag(bytes, lt, where, s);
    if (++elements > XML_LIMITS.elements) throw new Error(`${where}: more than ${XML_LIMITS.elements} XML elements (at byte ${lt}); a VTK file has far fewer`);
    if (!selfClosing && stack.length >= XML_LIMITS.depth) throw new Error(`${where}: elements nested more than ${XML_LIMITS.depth} deep at byte ${lt} (<${el.name}>); a VTK file nests far less`);
    const parent = stack[stack.length - 1];
    if (parent) parent.children.push(el);
    else if (root) throw new Error(`${where}: a second top-level element <${el.name}> at byte ${lt}`);
    else root = el;
    pos = end;
    if (el.name === 'DataArray' && el.attrs.get('format') !== 'appended') s.inline = true;
    if (el.name === 'AppendedData') {
      if (!parent) throw new Error(`${where}: <AppendedData> at byte ${lt} is outside <VTKFile>`);
      return { root: root!, appended: { el, end } };
    }
    if (!selfClosing) stack.push(el);
  }
  if (!s.complete) {
    // A whole document with no appended data needs the whole file, as does one cut inside inline data.
    if (stack.length === 0 && root) s.inline = true;
    throw MORE;
  }
  if (stack.length > 0) throw truncated(where, `inside <${stack[stack.length - 1]!.name}> opened at byte ${stack[stack.length - 1]!.at}`);
  if (!root) throw new Error(`${where}: no XML element found (expected <VTKFile …>)`);
  return { root };
}

/**
 * Scans a VTK XML file's structure. `where` (the file name) prefixes every error. Throws on malformed or
 * truncated XML with the byte position.
 */
export function scanXml(bytes: Uint8Array, where: string): XmlDocument {
  const s: ScanState = { complete: true, inline: false };
  const r = scan(bytes, where, s);
  return r.appended ? { root: r.root, appended: appendedSection(bytes, r.appended.el, r.appended.end, where, s) } : { root: r.root };
}

/** Outcome of scanning the first bytes of a file. */
export type HeadScan =
  /** The structure up to appended data starting at `start`; their end is still to be found from the file's tail. */
  | { readonly kind: 'appended'; readonly root: XmlElement; readonly start: number; readonly encoding: 'raw' | 'base64' }
  /** The head ends before the appended data: read more of it (`grow`), or the file has inline data and is needed whole (`whole`). */
  | { readonly kind: 'grow' | 'whole' };

/**
 * Scans the first bytes of a VTK XML file (`head`, shorter than the file) as far as the marker of its
 * appended data. Structural errors met on the way are thrown as `scanXml` would; running out of bytes is
 * not an error but a request for more.
 */
export function scanXmlHead(head: Uint8Array, where: string): HeadScan {
  const s: ScanState = { complete: false, inline: false };
  try {
    const r = scan(head, where, s);
    if (!r.appended) return { kind: 'whole' };
    const { encoding, start } = appendedStart(head, r.appended.el, r.appended.end, where, s);
    if (s.inline) return { kind: 'whole' };
    return { kind: 'appended', root: r.root, start, encoding };
  } catch (e) {
    if (e !== MORE) throw e;
    return { kind: s.inline ? 'whole' : 'grow' };
  }
}

/** The first child element with the given name, or undefined. */
export function child(el: XmlElement, name: string): XmlElement | undefined {
  return el.children.find((c) => c.name === name);
}

/** All child elements with the given name. */
export function childrenNamed(el: XmlElement, name: string): XmlElement[] {
  return el.children.filter((c) => c.name === name);
}
