/**
 * The report page: one self-contained HTML file — inline CSS, pictures as data URIs, no script, and a
 * content-security policy that forbids loading anything — so it opens offline from a folder, an archive
 * or an e-mail. It holds the pictures with their pins, a summary with one row per file, every probe's
 * numbers (6 significant figures on screen; full precision in `data-value` and in results.json), the
 * probe set, the input files with sizes and SHA-256 checksums, the time, the tool version, the units and
 * sign conventions, and the safety caution.
 */
import { base64Encode } from '../io/base64Encode.ts';
import type { ProbeSet } from './probeSet.ts';
import { UNITS_STATEMENT, headline, sig6, type FileEvaluation } from './resultTables.ts';
import { unitLabel } from './units.ts';

/** An input of the report: a result file (or a piece of a set) or the probe-set file. */
export interface InputFileInfo {
  name: string;
  /** Size in bytes. */
  bytes: number;
  sha256: string;
  /** What it is, e.g. `result file`, `piece of case.pvtu`, `probe set`. */
  role: string;
}

/** A picture of the view: PNG bytes, size, caption and an optional SVG overlay (pins, legend) in picture pixels. */
export interface ReportPicture {
  file: string;
  png: Uint8Array;
  width: number;
  height: number;
  caption: string;
  overlay?: string;
}

export interface ReportInput {
  title: string;
  tool: string;
  version: string;
  /** ISO 8601 time the report was made. */
  createdAt: string;
  caution: string;
  probeSet: ProbeSet;
  /** The probe set as saved (probe-set.json). */
  probeSetText: string;
  inputs: InputFileInfo[];
  files: FileEvaluation[];
  pictures: ReportPicture[];
  /** Sign conventions and other statements to print under the results. */
  conventions: string[];
}

export const esc = (s: string): string => s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');

/** The page's policy: nothing may be fetched; images only from data URIs; inline styles only. */
export const REPORT_CSP = "default-src 'none'; img-src data:; style-src 'unsafe-inline'; base-uri 'none'; form-action 'none'";

const CSS = `
:root { color: #111827; font: 14px/1.45 system-ui, -apple-system, "Segoe UI", Roboto, "Helvetica Neue", Arial, sans-serif; }
body { margin: 0 auto; max-width: 1180px; padding: 24px 28px 48px; background: #fff; }
h1 { font-size: 22px; margin: 0 0 4px; } h2 { font-size: 17px; margin: 28px 0 8px; border-bottom: 1px solid #d1d5db; padding-bottom: 4px; }
h3 { font-size: 14px; margin: 18px 0 6px; }
.meta { color: #4b5563; margin: 0 0 12px; }
.caution { background: #fffbeb; border: 1px solid #fcd34d; color: #92400e; padding: 8px 12px; border-radius: 4px; }
figure { margin: 12px 0 20px; } figcaption { color: #4b5563; font-size: 12.5px; margin-top: 4px; }
.picture { position: relative; display: inline-block; max-width: 100%; border: 1px solid #d1d5db; line-height: 0; }
.picture img { display: block; max-width: 100%; height: auto; }
.picture svg { position: absolute; inset: 0; width: 100%; height: 100%; }
table { border-collapse: collapse; margin: 6px 0 10px; font-variant-numeric: tabular-nums; }
th, td { padding: 3px 8px; border-bottom: 1px solid #e5e7eb; text-align: left; vertical-align: top; }
th { background: #f3f4f6; font-weight: 600; } td.num { text-align: right; white-space: nowrap; }
td.unit { color: #4b5563; white-space: nowrap; } .key { color: #6b7280; font-size: 12px; }
.failed { color: #b91c1c; font-weight: 600; } .note { color: #92400e; font-size: 12.5px; }
.def { color: #4b5563; font-size: 12.5px; margin: 0 0 4px; }
pre { background: #f9fafb; border: 1px solid #e5e7eb; padding: 10px; overflow: auto; font-size: 12px; line-height: 1.35; }
code, .hash { font-family: ui-monospace, "DejaVu Sans Mono", Menlo, Consolas, monospace; font-size: 12px; }
.wide { overflow-x: auto; }
@media print { body { max-width: none; } .picture { border: none; } }
`;

function dataUri(png: Uint8Array): string {
  return `data:image/png;base64,${new TextDecoder().decode(base64Encode(png))}`;
}

const fileName = (f: string): string => f.split(/[\\/]/).pop()!;

function numberCell(file: string, probe: string, key: string, v: number | undefined): string {
  return v === undefined ? '<td class="num">—</td>'
    : `<td class="num" data-file="${esc(file)}" data-probe="${esc(probe)}" data-quantity="${esc(key)}" data-value="${v}">${esc(sig6(v))}</td>`;
}

function summaryTable(files: readonly FileEvaluation[]): string {
  const first = files[0]?.evaluation.probes ?? [];
  // a probe's column comes from the first file where it gave numbers
  const cols = first.flatMap((p0) => {
    const p = files.map((f) => f.evaluation.probes.find((x) => x.id === p0.id)).find((x) => x && x.quantities.length) ?? p0;
    return headline(p, 1).map((q) => ({ id: p.id, label: p.label, key: q.key, sym: q.label, unit: q.unit }));
  });
  const head = `<tr><th>file</th><th>status</th>${cols.map((c) => `<th>${esc(c.label)}<br><span class="key">${esc(c.sym)}${unitLabel(c.unit) ? ` [${esc(c.unit)}]` : ''}</span></th>`).join('')}</tr>`;
  const rows = files.map((f) => {
    const failed = f.evaluation.failed;
    const status = failed ? `<span class="failed">${failed} probe${failed > 1 ? 's' : ''} failed</span>` : 'all probes ok';
    const cells = cols.map((c) => numberCell(f.file, c.id, c.key, f.evaluation.probes.find((p) => p.id === c.id)?.quantities.find((q) => q.key === c.key)?.value));
    return `<tr data-row-file="${esc(f.file)}"><td>${esc(fileName(f.file))}</td><td>${status}</td>${cells.join('')}</tr>`;
  });
  return `<div class="wide"><table class="summary">${head}${rows.join('')}</table></div>`;
}

function probeSections(files: readonly FileEvaluation[]): string {
  const out: string[] = [];
  const first = files[0]?.evaluation.probes ?? [];
  for (const p0 of first) {
    const outs = files.map((f) => f.evaluation.probes.find((p) => p.id === p0.id)!);
    const keys: { key: string; label: string; unit: string }[] = [];
    for (const o of outs) for (const q of o.quantities) if (!keys.some((k) => k.key === q.key)) keys.push(q);
    out.push(`<section class="probe" data-probe="${esc(p0.id)}"><h3>${esc(p0.label)} <span class="key">${esc(p0.id)} · ${esc(p0.kind)}</span></h3>`,
      `<p class="def">${esc(p0.definition)}</p>`);
    outs.forEach((o, i) => {
      const where = files.length > 1 ? ` on ${esc(fileName(files[i]!.file))}` : '';
      if (!o.ok) out.push(`<p class="failed" data-failed="${esc(o.id)}">FAILED${where}: ${esc(o.error ?? '')}</p>`);
      for (const n of o.notes) out.push(`<p class="note">Note${where}: ${esc(n)}</p>`);
    });
    if (keys.length) {
      const head = `<tr><th>quantity</th>${files.length > 1 ? files.map((f) => `<th>${esc(fileName(f.file))}</th>`).join('') : '<th>value</th>'}<th>unit</th></tr>`;
      const rows = keys.map((k) => `<tr><td>${esc(k.label)} <span class="key">${esc(k.key)}</span></td>${
        outs.map((o, i) => numberCell(files[i]!.file, o.id, k.key, o.quantities.find((q) => q.key === k.key)?.value)).join('')}<td class="unit">${esc(unitLabel(k.unit) || 'dimensionless')}</td></tr>`);
      out.push(`<div class="wide"><table class="values">${head}${rows.join('')}</table></div>`);
    }
    out.push('</section>');
  }
  return out.join('\n');
}

/** The report page as HTML text. */
export function reportHtml(r: ReportInput): string {
  const failed = r.files.reduce((n, f) => n + f.evaluation.failed, 0);
  const pics = r.pictures.map((p) => `<figure><div class="picture"><img src="${dataUri(p.png)}" width="${p.width}" height="${p.height}" alt="${esc(p.caption)}">${p.overlay ?? ''}</div><figcaption>${esc(p.caption)} (also saved as <code>${esc(p.file)}</code>)</figcaption></figure>`);
  const inputs = r.inputs.map((i) => `<tr><td>${esc(i.name)}</td><td>${esc(i.role)}</td><td class="num">${i.bytes.toLocaleString('en')}</td><td class="hash" data-sha256="${esc(i.name)}">${esc(i.sha256)}</td></tr>`);
  const probes = r.probeSet.probes.map((p) => `<tr><td><code>${esc(p.id)}</code></td><td>${esc(p.kind)}</td><td>${esc(p.label ?? p.id)}</td></tr>`);
  return `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta http-equiv="Content-Security-Policy" content="${REPORT_CSP}">
<meta name="viewport" content="width=device-width, initial-scale=1">
<meta name="generator" content="${esc(r.tool)} ${esc(r.version)}">
<title>${esc(r.title)}</title>
<style>${CSS}</style>
</head>
<body>
<h1>${esc(r.title)}</h1>
<p class="meta">Made by ${esc(r.tool)} ${esc(r.version)} on <time datetime="${esc(r.createdAt)}">${esc(r.createdAt)}</time> from ${r.files.length} result file${r.files.length === 1 ? '' : 's'} and the probe set${r.probeSet.title ? ` “${esc(r.probeSet.title)}”` : ''} (${r.probeSet.probes.length} probe${r.probeSet.probes.length === 1 ? '' : 's'}).${failed ? ` <span class="failed">${failed} probe evaluation${failed > 1 ? 's' : ''} failed — see below.</span>` : ''}</p>
<p class="caution" id="caution"><strong>Caution:</strong> ${esc(r.caution)}</p>
${pics.length ? `<h2>View</h2>\n${pics.join('\n')}` : ''}
<h2>Summary</h2>
<p class="meta">One row per result file; the first number of each probe. Every number of every probe follows below, and at full precision in <code>results.json</code> and <code>results.csv</code>.</p>
${summaryTable(r.files)}
<h2>Results</h2>
${probeSections(r.files)}
<h2>Units and conventions</h2>
<ul>${[UNITS_STATEMENT, ...r.conventions].map((c) => `<li>${esc(c)}</li>`).join('')}</ul>
<h2>Probe set</h2>
<table><tr><th>id</th><th>kind</th><th>label</th></tr>${probes.join('')}</table>
<pre id="probe-set">${esc(r.probeSetText)}</pre>
<h2>Inputs</h2>
<table class="inputs"><tr><th>file</th><th>role</th><th>bytes</th><th>SHA-256</th></tr>${inputs.join('')}</table>
<p class="caution"><strong>Caution:</strong> ${esc(r.caution)}</p>
<p class="meta">${esc(r.tool)} ${esc(r.version)} · ${esc(r.createdAt)}</p>
</body>
</html>
`;
}
