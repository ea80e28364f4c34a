/**
 * The report from the viewer: the same folder the command line writes (`src/study/reportFolder.ts`) —
 * report.html, results.json, results.csv, results-long.csv, probe-set.json and the picture — plus each line
 * probe's samples (CSV) and profile pictures (SVG), packed into
 * a .zip for download. The numbers come from the worker's evaluation of the probe set (the command line's
 * path); the picture is the view's own PNG export with the pins and legend drawn in; the inputs are listed
 * with sizes and SHA-256 checksums of the bytes that were opened.
 */
import { zipSync } from 'fflate';
import { version } from '../../package.json';
import type { LoadRequest } from '../../workers/api.ts';
import type { ProbeSet } from '../study/probeSet.ts';
import { writeProbeSet } from '../study/probeSetFile.ts';
import { reportFolder } from '../study/reportFolder.ts';
import type { InputFileInfo } from '../study/reportHtml.ts';
import { CONVENTIONS } from '../study/resultTables.ts';
import { sha256Hex } from '../study/sha256.ts';
import { CAUTION } from '../study/caution.ts';
import { download } from '../ui/download.ts';
import type { ExportTool } from './exportTool.ts';
import type { Viewer } from './viewer.ts';

async function bytesOf(data: Blob | Uint8Array): Promise<Uint8Array> {
  return data instanceof Uint8Array ? data : new Uint8Array(await data.arrayBuffer());
}

/** Sizes and checksums of the files a request opened. */
async function inputsOf(r: LoadRequest | undefined): Promise<InputFileInfo[]> {
  if (!r) return [];
  if (r.kind === 'url') {
    const b = new Uint8Array(await (await fetch(r.url)).arrayBuffer());
    return [{ name: r.name, bytes: b.length, sha256: await sha256Hex(b), role: 'result file (the bundled sample)' }];
  }
  const out: InputFileInfo[] = [];
  const main = await bytesOf(r.main.data);
  out.push({ name: r.main.path, bytes: main.length, sha256: await sha256Hex(main), role: 'result file' });
  for (const o of r.others) {
    const b = await bytesOf(o.data);
    out.push({ name: o.path, bytes: b.length, sha256: await sha256Hex(b), role: `chosen with ${r.main.path.split('/').pop()}` });
  }
  return out;
}

export class ReportTool {
  /** `extraFiles`: more files for the folder (the line probes' samples CSV and profile pictures). */
  constructor(private readonly v: Viewer, private readonly exporter: ExportTool, private readonly extraFiles: () => Record<string, Uint8Array> = () => ({})) {}

  /** Builds the report of `set` on the open file and downloads it as `<file>-report.zip`. */
  async download(set: ProbeSet): Promise<void> {
    const d = this.v.description;
    if (!d) throw new Error('open a result file first');
    const evaluation = await this.v.compute.evaluateProbeSet(set);
    const png = new Uint8Array(await (await this.exporter.picture()).arrayBuffer());
    const { width, height } = this.exporter.pictureSize;
    const probeSetText = writeProbeSet(set);
    const inputs = await inputsOf(this.v.openRequest);
    const setBytes = new TextEncoder().encode(probeSetText);
    inputs.push({ name: 'probe-set.json', bytes: setBytes.length, sha256: await sha256Hex(setBytes), role: 'probe set (as used, written by the viewer)' });
    const base = d.report.source.replace(/\.[^.]+$/, '').replace(/[^\w.-]+/g, '-');
    const files = reportFolder({
      title: set.title ? `${set.title} — fieldtally report` : `fieldtally report — ${d.report.source}`,
      tool: 'fieldtally', version, createdAt: new Date().toISOString(), caution: CAUTION,
      probeSet: set, probeSetText, inputs, files: [{ file: d.report.source, evaluation }],
      pictures: [{ file: 'view-1.png', png, width, height, caption: `${d.report.source}: the view as shown in fieldtally, with the pins and the legend` }],
      conventions: [...CONVENTIONS],
    });
    for (const [name, bytes] of Object.entries(this.extraFiles())) {
      if (name in files) throw new Error(`report: "${name}" clashes with another file of the report`);
      files[name] = bytes;
    }
    const folder = `${base}-report`;
    const zip = zipSync(Object.fromEntries(Object.entries(files).map(([name, bytes]) => [`${folder}/${name}`, bytes])), { level: 6 });
    download(`${folder}.zip`, new Blob([zip as Uint8Array<ArrayBuffer>], { type: 'application/zip' }));
    if (evaluation.failed) this.v.banner.notice(`Report saved; ${evaluation.failed} probe${evaluation.failed > 1 ? 's' : ''} failed on this file (listed in the report).`);
  }
}
