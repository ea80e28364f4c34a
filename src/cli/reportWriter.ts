/**
 * Writes a report folder to disk (Node only). A folder that exists, is not empty and holds no report is
 * refused, so a typo in --out cannot scatter files into an unrelated folder; an earlier report in the
 * folder is replaced file by file.
 */
import { existsSync, mkdirSync, readdirSync, statSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { REPORT_FILES, type ReportFiles } from '../study/reportFolder.ts';

/** Writes `files` into `dir` (created when missing); returns the paths written. */
export function writeReportFolder(dir: string, files: ReportFiles): string[] {
  if (existsSync(dir)) {
    if (!statSync(dir).isDirectory()) throw new Error(`--out ${dir}: exists and is not a folder`);
    const names = readdirSync(dir);
    if (names.length > 0 && !names.includes(REPORT_FILES.html)) throw new Error(`--out ${dir}: the folder is not empty and holds no report; choose a new or empty folder`);
  } else mkdirSync(dir, { recursive: true });
  const out: string[] = [];
  for (const [name, bytes] of Object.entries(files)) {
    const p = join(dir, name);
    writeFileSync(p, bytes);
    out.push(p);
  }
  return out;
}
