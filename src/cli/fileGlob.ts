/**
 * Glob patterns for the command line's file lists (`fieldtally report 'runs/*.vtu'`), expanded here so
 * they work when the shell does not expand them (quoted, or on Windows). Supported: `*` and `?` within a
 * name, `[abc]` / `[a-z]` classes, `{a,b}` alternatives and `**` for any depth of folders. Node only.
 */
import { readdirSync, statSync } from 'node:fs';
import { join } from 'node:path';

/** True when `s` holds a glob character. */
export const isGlob = (s: string): boolean => /[*?[\]{}]/.test(s);

/** A regular expression for one path segment. */
export function segmentRegExp(seg: string): RegExp {
  let re = '', i = 0;
  while (i < seg.length) {
    const ch = seg[i]!;
    if (ch === '*') re += '[^/]*';
    else if (ch === '?') re += '[^/]';
    else if (ch === '[') {
      const end = seg.indexOf(']', i + 1);
      if (end < 0) { re += '\\['; i++; continue; }
      const body = seg.slice(i + 1, end).replace(/\\/g, '\\\\');
      re += `[${body.startsWith('!') ? '^' + body.slice(1) : body}]`;
      i = end;
    } else if (ch === '{') {
      const end = seg.indexOf('}', i + 1);
      if (end < 0) { re += '\\{'; i++; continue; }
      re += `(?:${seg.slice(i + 1, end).split(',').map((a) => a.replace(/[.+^$()|\\]/g, '\\$&').replace(/\*/g, '[^/]*').replace(/\?/g, '[^/]')).join('|')})`;
      i = end;
    } else re += ch.replace(/[.+^$()|\\]/g, '\\$&');
    i++;
  }
  return new RegExp(`^${re}$`);
}

function walk(dir: string, segs: readonly string[], out: string[]): void {
  if (segs.length === 0) return;
  const [seg, ...rest] = segs as [string, ...string[]];
  let names: string[];
  try { names = readdirSync(dir === '' ? '.' : dir); } catch { return; }
  const isDir = (p: string) => { try { return statSync(p).isDirectory(); } catch { return false; } };
  if (seg === '**') {
    walk(dir, rest, out);
    for (const n of names) if (!n.startsWith('.') && isDir(join(dir, n))) walk(join(dir, n), segs, out);
    return;
  }
  const re = isGlob(seg) ? segmentRegExp(seg) : null;
  for (const n of names) {
    if (re ? !re.test(n) || (n.startsWith('.') && !seg.startsWith('.')) : n !== seg) continue;
    const p = dir === '' ? n : join(dir, n);
    if (rest.length === 0) { if (!isDir(p)) out.push(p); } else if (isDir(p)) walk(p, rest, out);
  }
}

/** Files matching a pattern, sorted; relative patterns resolve from the current folder. */
export function expandGlob(pattern: string): string[] {
  const parts = pattern.replace(/\\/g, '/').split('/');
  let k = 0;
  while (k < parts.length - 1 && !isGlob(parts[k]!)) k++;
  const base = parts.slice(0, k).join('/') || (pattern.startsWith('/') ? '/' : '');
  const out: string[] = [];
  walk(base, parts.slice(k), out);
  return [...new Set(out)].sort();
}

/** Each argument as a file, or its matches when it is a pattern; a pattern that matches nothing is an error. */
export function expandInputs(args: readonly string[]): string[] {
  const out: string[] = [];
  for (const a of args) {
    if (!isGlob(a)) { out.push(a); continue; }
    const hits = expandGlob(a);
    if (hits.length === 0) throw new Error(`no file matches "${a}"`);
    out.push(...hits);
  }
  return out;
}
