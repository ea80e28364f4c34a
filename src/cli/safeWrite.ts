/**
 * Writing only what we made (Node only): output folders refused on special file systems (/proc, /sys,
 * /dev…) or where they cannot be created, files written under a temporary name in the target folder and
 * renamed into place (a rename replaces a symbolic link itself, never the file it points to), and the
 * identity of two paths told by device and inode, not by name.
 */
import { accessSync, constants as fsConstants, closeSync, fsyncSync, lstatSync, mkdirSync, openSync, realpathSync, renameSync, statSync, statfsSync, unlinkSync, writeSync } from 'node:fs';
import { basename, dirname, join, resolve } from 'node:path';
import { cutPath, fileErrorText } from '../io/messageText.ts';

/** File-system types (statfs magic numbers) that hold no user files: proc, sysfs, cgroup, cgroup2, debugfs, securityfs, tracefs, configfs, pstore, efivarfs, bpf, devpts. */
const SPECIAL_FS = new Set([0x9fa0, 0x62656572, 0x27e0eb, 0x63677270, 0x64626720, 0x73636673, 0x74726163, 0x62656570, 0x6165676c, 0xde5e81e4, 0xcafe4a11, 0x1cd1]);
/** Folders whose contents are the system's, not the user's. */
const SPECIAL_ROOTS = ['/proc', '/sys', '/dev'];

/** The error code of a file-system error, in words. */
export const fsText = (e: unknown): string => fileErrorText((e as NodeJS.ErrnoException).code);

/** The deepest existing folder on the way to `path` (itself when it exists), resolved through links. */
function existingAncestor(path: string): string {
  let p = resolve(path);
  for (;;) {
    try {
      return realpathSync(p);
    } catch {
      const up = dirname(p);
      if (up === p) return p;
      p = up;
    }
  }
}

/**
 * Throws when `dir` (an output folder, existing or to be made) lies on a special file system or under a
 * system folder, where writing would spin or do harm; `option` names the option for the message.
 */
export function refuseSpecialFolder(dir: string, option: string): void {
  const real = existingAncestor(dir);
  const root = SPECIAL_ROOTS.find((r) => real === r || real.startsWith(r + '/'));
  let fsType: number | undefined;
  try { fsType = Number(statfsSync(real).type); } catch { fsType = undefined; }
  if (root || (fsType !== undefined && SPECIAL_FS.has(fsType))) {
    throw new Error(`${option} ${cutPath(dir)}: lies on a system file system (${root ?? `type 0x${fsType!.toString(16)}`}), not a place for output; choose a folder of your own`);
  }
}

/**
 * Throws unless `path` (a file or folder to be made, or replaced) could be created: its nearest existing
 * ancestor must be a folder we may write into.
 */
export function checkCreatable(path: string, option: string): void {
  const anc = existingAncestor(dirname(resolve(path)));
  let ok: string | undefined;
  try {
    if (!statSync(anc).isDirectory()) ok = `${cutPath(anc)} is not a folder`;
    else accessSync(anc, fsConstants.W_OK);
  } catch (e) {
    ok = fsText(e);
  }
  if (ok) throw new Error(`${option} ${cutPath(path)}: cannot be created there (${ok})`);
}

/** Creates `dir` and its parents, with a one-line error when it cannot be made. */
export function makeFolder(dir: string, option: string): void {
  try {
    mkdirSync(dir, { recursive: true });
  } catch (e) {
    throw new Error(`${option} ${cutPath(dir)}: cannot create the folder (${fsText(e)})`);
  }
}

/** Whether two paths name the same existing file (same device and inode), following links; false when either is missing. */
export function sameFile(a: string, b: string): boolean {
  try {
    const sa = statSync(a), sb = statSync(b);
    return sa.dev === sb.dev && sa.ino === sb.ino;
  } catch {
    return false;
  }
}

/** What is at `path` without following a link: 'none', 'file', 'link', 'folder' or 'other'. */
export function entryKind(path: string): 'none' | 'file' | 'link' | 'folder' | 'other' {
  try {
    const st = lstatSync(path);
    return st.isSymbolicLink() ? 'link' : st.isFile() ? 'file' : st.isDirectory() ? 'folder' : 'other';
  } catch {
    return 'none';
  }
}

/** Writes `bytes` to a new file `path` that must not exist yet (never through a link), flushed to disk. */
export function writeNewFile(path: string, bytes: Uint8Array): void {
  const fd = openSync(path, 'wx', 0o644);
  try {
    for (let done = 0; done < bytes.length;) done += writeSync(fd, bytes, done, bytes.length - done);
    fsyncSync(fd);
  } finally {
    closeSync(fd);
  }
}

/**
 * Writes `bytes` to `path` by way of a temporary file in the same folder renamed over it, so a reader
 * never sees half a file and an existing link at `path` is replaced, not followed. `option` names the
 * option for messages.
 */
export function replaceFile(path: string, bytes: Uint8Array, option: string): void {
  const tmp = join(dirname(path), `.${basename(path)}.${process.pid}.${Date.now().toString(36)}.tmp`);
  try {
    writeNewFile(tmp, bytes);
    renameSync(tmp, path);
  } catch (e) {
    try { unlinkSync(tmp); } catch { /* never made */ }
    throw new Error(`${option} ${cutPath(path)}: cannot write the file (${fsText(e)})`);
  }
}
