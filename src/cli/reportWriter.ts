/**
 * Writes a report folder to disk (Node only), touching nothing it did not make:
 *  - a folder is the tool's own only when it holds the manifest (`REPORT_MANIFEST`) an earlier run wrote,
 *    listing every file of that report; any other file in it (or a listed name that is now a link, a
 *    folder or anything but a plain file) makes the folder foreign, and it is refused;
 *  - inputs (the probe set, result files) inside the folder are never replaced: the folder is refused;
 *  - the new report is written into a fresh temporary folder beside the target and renamed into place, so
 *    a failure part-way leaves the previous report as it was; the previous report's files (stale pictures
 *    included) are then removed by name, links unlinked and never followed;
 *  - folders on system file systems (/proc, /sys, /dev) or that cannot be created are refused.
 */
import { mkdirSync, readFileSync, readdirSync, renameSync, rmdirSync, unlinkSync } from 'node:fs';
import { basename, dirname, join, relative, resolve } from 'node:path';
import { cutPath } from '../io/messageText.ts';
import { REPORT_FILES, type ReportFiles } from '../study/reportFolder.ts';
import { checkCreatable, entryKind, fsText, makeFolder, refuseSpecialFolder, sameFile, writeNewFile } from './safeWrite.ts';

/** The manifest's file name: a report folder is ours only when it holds this file, written by us. */
export const REPORT_MANIFEST = '.fieldtally-report.json';
const MANIFEST_FORMAT = 'fieldtally-report-manifest';

/** Options of `writeReportFolder`. */
export interface ReportWriteOptions {
  /** Input files (probe set, result files and their pieces) that must never be replaced or removed. */
  inputs?: readonly string[];
  /** Called after each file is written into the temporary folder (progress; a throw aborts the write). */
  onWritten?: (name: string) => void;
  /** The option that named the folder, for messages (default `--out`). */
  option?: string;
}

/** The files an earlier report listed in its manifest, or undefined when `dir` holds no valid manifest of ours. */
function readManifest(dir: string): string[] | undefined {
  const path = join(dir, REPORT_MANIFEST);
  if (entryKind(path) !== 'file') return undefined;
  try {
    const m = JSON.parse(readFileSync(path, 'utf8')) as { format?: unknown; files?: unknown };
    if (m.format !== MANIFEST_FORMAT || !Array.isArray(m.files)) return undefined;
    const files = m.files.filter((f): f is string => typeof f === 'string' && safeName(f));
    return files.length === m.files.length ? files : undefined;
  } catch {
    return undefined;
  }
}

/** A plain file name: no folder part, not `.`/`..`, not the manifest. */
function safeName(name: string): boolean {
  return name !== '' && name !== '.' && name !== '..' && !/[/\\\0]/.test(name) && name !== REPORT_MANIFEST;
}

/** Checks an existing folder is one of our reports with nothing foreign in it; returns the files to replace. */
function ownedFiles(dir: string, option: string): string[] {
  const names = readdirSync(dir);
  if (names.length === 0) return [];
  const listed = readManifest(dir);
  if (!listed) {
    const hint = names.includes(REPORT_FILES.html) ? ' (it holds a report.html, but no manifest written by fieldtally)' : '';
    throw new Error(`${option} ${cutPath(dir)}: the folder is not empty and is not a report folder of fieldtally${hint}; choose a new or empty folder`);
  }
  const foreign = names.find((n) => n !== REPORT_MANIFEST && !listed.includes(n));
  if (foreign !== undefined) throw new Error(`${option} ${cutPath(dir)}: holds "${cutPath(foreign, 40)}", which an earlier report did not write; move it or choose another folder`);
  const odd = listed.find((n) => names.includes(n) && entryKind(join(dir, n)) !== 'file' && entryKind(join(dir, n)) !== 'link');
  if (odd !== undefined) throw new Error(`${option} ${cutPath(dir)}: "${cutPath(odd, 40)}" is no longer a plain file; move it or choose another folder`);
  return listed.filter((n) => names.includes(n));
}

/** Removes the files of an old report folder by name (links are unlinked, not followed), then the folder. */
function removeOld(dir: string, files: readonly string[]): void {
  for (const n of [...files, REPORT_MANIFEST]) {
    try { unlinkSync(join(dir, n)); } catch { /* already gone */ }
  }
  try { rmdirSync(dir); } catch { /* something new appeared in it: leave it */ }
}

/**
 * Checks that `dir` may take a report (see the file comment) before anything is computed or written:
 * returns the resolved folder, what is there now and the files of an earlier report to replace.
 */
export function checkReportFolder(dir: string, opts: ReportWriteOptions = {}): { target: string; kind: ReturnType<typeof entryKind>; old: string[] } {
  const option = opts.option ?? '--out';
  const target = resolve(dir);
  refuseSpecialFolder(target, option);
  checkCreatable(target, option);
  const kind = entryKind(target);
  if (kind === 'link') throw new Error(`${option} ${cutPath(dir)}: is a symbolic link; give the folder it points to, or a new folder`);
  if (kind !== 'none' && kind !== 'folder') throw new Error(`${option} ${cutPath(dir)}: exists and is not a folder`);
  const old = kind === 'folder' ? ownedFiles(target, option) : [];
  for (const input of opts.inputs ?? []) {
    const inside = kind === 'folder' && old.some((n) => sameFile(join(target, n), input));
    const rel = relative(target, resolve(input));
    if (inside || (rel !== '' && !rel.startsWith('..') && !rel.startsWith('/'))) {
      throw new Error(`${option} ${cutPath(dir)}: holds an input of this report (${cutPath(basename(input), 40)}); writing the report there would replace it — choose another folder`);
    }
  }
  return { target, kind, old };
}

/**
 * Writes `files` as the report folder `dir` (see the file comment); returns the paths written. Throws a
 * one-line error, leaving any earlier report untouched, when the folder is not ours or a write fails.
 */
export function writeReportFolder(dir: string, files: ReportFiles, opts: ReportWriteOptions = {}): string[] {
  const option = opts.option ?? '--out';
  for (const name of Object.keys(files)) if (!safeName(name)) throw new Error(`report: file name "${cutPath(name, 40)}" is not a plain file name`);
  const { target, kind, old } = checkReportFolder(dir, opts);
  makeFolder(dirname(target), option);
  const tmp = join(dirname(target), `.${basename(target)}.${process.pid}.${Date.now().toString(36)}.partial`);
  try {
    mkdirSync(tmp);
  } catch (e) {
    throw new Error(`${option} ${cutPath(dir)}: cannot create a folder beside it (${fsText(e)})`);
  }
  const written: string[] = [];
  try {
    for (const [name, bytes] of Object.entries(files)) {
      writeNewFile(join(tmp, name), bytes);
      written.push(name);
      opts.onWritten?.(name);
    }
    writeNewFile(join(tmp, REPORT_MANIFEST), new TextEncoder().encode(JSON.stringify({ format: MANIFEST_FORMAT, version: 1, files: written }, null, 2) + '\n'));
    if (kind === 'folder') {
      // Swap: the old folder steps aside, the new one takes its name, the old one's files are removed by name.
      const aside = `${tmp}.old`;
      renameSync(target, aside);
      try {
        renameSync(tmp, target);
      } catch (e) {
        renameSync(aside, target);
        throw e;
      }
      removeOld(aside, old);
    } else {
      renameSync(tmp, target);
    }
  } catch (e) {
    for (const n of [...written, REPORT_MANIFEST]) {
      try { unlinkSync(join(tmp, n)); } catch { /* not written */ }
    }
    try { rmdirSync(tmp); } catch { /* already renamed or not empty */ }
    const reason = (e as NodeJS.ErrnoException).code ? fsText(e) : e instanceof Error ? e.message : String(e);
    throw new Error(`${option} ${cutPath(dir)}: cannot write the report (${reason}); any earlier report there is unchanged`);
  }
  return written.map((n) => join(dir, n));
}
