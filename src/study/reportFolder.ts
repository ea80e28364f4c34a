/**
 * The report folder's files, by name: `report.html` (self-contained, see `reportHtml.ts`),
 * `results.json` (every number at full precision), `results.csv` (one row per result file),
 * `results-long.csv` (one row per file, probe and quantity), `probe-set.json` and the pictures.
 * Pure: the command line writes these to a folder, the app packs them into a .zip.
 */
import { relabelEvaluation } from './groupLabelText.ts';
import { reportHtml, type ReportInput } from './reportHtml.ts';
import { failureLines, resultsCsvByFile, resultsCsvLong, resultsJson, type TableContext } from './resultTables.ts';

/** The files of a report folder: name → bytes. */
export type ReportFiles = Record<string, Uint8Array>;

/** Names of the fixed files of a report folder. */
export const REPORT_FILES = {
  html: 'report.html', json: 'results.json', csv: 'results.csv', csvLong: 'results-long.csv', probeSet: 'probe-set.json',
} as const;

/** Builds every file of the report; surface groups are named by the probe set's `groupLabels` where it has them. */
export function reportFolder(input: ReportInput): ReportFiles {
  const labels = input.probeSet.groupLabels;
  const r: ReportInput = labels ? { ...input, files: input.files.map((f) => ({ ...f, evaluation: relabelEvaluation(f.evaluation, labels) })) } : input;
  const enc = new TextEncoder();
  const ctx: TableContext = { tool: r.tool, version: r.version, createdAt: r.createdAt, caution: r.caution, ...(r.probeSet.title ? { probeSet: r.probeSet.title } : {}) };
  const files: ReportFiles = {
    [REPORT_FILES.html]: enc.encode(reportHtml(r)),
    [REPORT_FILES.json]: enc.encode(resultsJson(r.files, ctx, {
      inputs: r.inputs, conventions: r.conventions, failures: failureLines(r.files), pictures: r.pictures.map((p) => p.file),
    })),
    [REPORT_FILES.csv]: enc.encode(resultsCsvByFile(r.files, ctx)),
    [REPORT_FILES.csvLong]: enc.encode(resultsCsvLong(r.files, ctx)),
    [REPORT_FILES.probeSet]: enc.encode(r.probeSetText),
  };
  for (const p of r.pictures) {
    if (p.file in files) throw new Error(`report: picture name "${p.file}" clashes with another file of the report`);
    files[p.file] = p.png;
  }
  return files;
}
