/**
 * Error text fit for one line of a terminal or a banner: file bytes quoted escaped and cut, long paths
 * cut in the middle, line breaks and control characters escaped, and the bare messages of the runtime
 * (out of memory, stack overflow, file-system codes) turned into what happened and what to do.
 * Pure: used by the readers, the command line and the worker alike.
 */

/** Characters of file content quoted in a message, at most. */
export const QUOTE_CHARS = 40;
/** Characters of a path shown in a message, at most (the middle is cut). */
export const PATH_CHARS = 80;
/** Characters of a whole message, at most. */
export const MESSAGE_CHARS = 600;

/** One character as printable text: itself when printable, else an escape (`\n`, `\t`, `\x00`, `\u2028`). */
function printable(ch: string): string {
  const c = ch.codePointAt(0)!;
  if (c >= 0x20 && c < 0x7f) return ch;
  if (c === 10) return '\\n';
  if (c === 13) return '\\r';
  if (c === 9) return '\\t';
  if (c < 0x20 || (c >= 0x7f && c < 0xa0)) return `\\x${c.toString(16).padStart(2, '0')}`;
  // Other Unicode is shown as is unless it is a separator, a format character or a lone surrogate.
  if (/[\p{Zl}\p{Zp}\p{Cf}\p{Cs}\p{Co}\p{Cn}]/u.test(ch)) return `\\u${c.toString(16).padStart(4, '0')}`;
  return ch;
}

/** `s` with every non-printable character escaped (see `printable`). */
export function escapeText(s: string): string {
  let out = '';
  for (const ch of s) out += printable(ch);
  return out;
}

/** File text quoted for a message: escaped, cut to `max` characters with "…", in double quotes. */
export function quoteText(s: string, max = QUOTE_CHARS): string {
  const cut = [...s];
  const head = cut.length > max ? cut.slice(0, max).join('') : s;
  return `"${escapeText(head)}${cut.length > max ? '…' : ''}"`;
}

/** File bytes (latin-1) quoted for a message, like `quoteText`. */
export function quoteBytes(bytes: Uint8Array, start = 0, max = QUOTE_CHARS): string {
  const end = Math.min(bytes.length, start + max);
  let s = '';
  for (let i = start; i < end; i++) s += String.fromCharCode(bytes[i]!);
  return `"${escapeText(s)}${bytes.length > end ? '…' : ''}"`;
}

/** A path shortened to `max` characters by cutting its middle ("/very/long/…/folder/file.vtu"), escaped. */
export function cutPath(path: string, max = PATH_CHARS): string {
  const p = escapeText(path);
  if (p.length <= max) return p;
  const tail = Math.ceil((max - 1) * 0.6), head = max - 1 - tail;
  return `${p.slice(0, head)}…${p.slice(p.length - tail)}`;
}

/** What a file-system error code means, in words (or the code itself when unknown). */
export function fileErrorText(code: string | undefined): string {
  switch (code) {
    case 'ENOENT': return 'no such file or folder';
    case 'EISDIR': return 'is a folder, expected a file';
    case 'ENOTDIR': return 'a part of the path is not a folder';
    case 'EACCES': case 'EPERM': return 'permission denied';
    case 'ELOOP': return 'too many symbolic links in the path';
    case 'ENAMETOOLONG': return 'the path is too long';
    case 'EMFILE': case 'ENFILE': return 'too many open files';
    case 'ENOSPC': return 'no space left on the device';
    case 'EROFS': return 'read-only file system';
    case 'EEXIST': return 'already exists';
    case 'ENOTEMPTY': return 'the folder is not empty';
    case 'EXDEV': return 'on another device';
    case 'EIO': return 'input/output error';
    case 'EINVAL': return 'invalid argument for this file';
    case 'ENXIO': case 'ENODEV': return 'no such device';
    default: return code ? `system error ${code}` : 'system error';
  }
}

/**
 * The runtime's bare messages turned into words (or undefined when `e` is not one of them): out of
 * memory, stack overflow, strings or arrays too long, file-system errors.
 */
export function runtimeText(e: unknown): string | undefined {
  const code = (e as { code?: unknown } | null)?.code;
  const msg = e instanceof Error ? e.message : String(e);
  if (typeof code === 'string' && /^E[A-Z]+$/.test(code)) return fileErrorText(code);
  if (/Array buffer allocation failed|Invalid typed array length|Invalid array buffer length|Invalid array length|out of memory/i.test(msg)) {
    return 'not enough memory for what the input declares';
  }
  if (/Maximum call stack size exceeded|too much recursion/i.test(msg)) return 'the input is nested too deeply to process';
  if (/Invalid string length/i.test(msg)) return 'the output is too large to hold as one text; write it to a file in parts';
  return undefined;
}

/**
 * One printable line for an error about `name` (a file, or a verb): the message's first line escaped,
 * bare runtime messages replaced by words, prefixed by `name` unless it already names it, and cut to
 * `MESSAGE_CHARS`.
 */
export function oneLineMessage(e: unknown, name?: string): string {
  const raw = e instanceof Error ? e.message : String(e);
  const runtime = runtimeText(e);
  let text = runtime ?? raw;
  // Multi-line messages keep their first line; the rest goes to a debug trace, not the user's screen.
  const nl = text.search(/\r?\n/);
  if (nl >= 0) text = text.slice(0, nl);
  text = escapeText(text);
  if (name && !text.includes(escapeText(name))) text = `${cutPath(name)}: ${text}`;
  if (text.length > MESSAGE_CHARS) text = `${text.slice(0, MESSAGE_CHARS - 1)}…`;
  return text;
}

/**
 * `e` with its message made one printable line about `name` (see `oneLineMessage`), keeping an
 * AbortError's name so cancellation stays recognisable.
 */
export function asOneLineError(e: unknown, name?: string): Error {
  const out = new Error(oneLineMessage(e, name));
  if (e instanceof Error && e.name === 'AbortError') out.name = 'AbortError';
  return out;
}
