/**
 * The report folder of a history (`fieldtally history --out dir/`): `report.html` (self-contained: every
 * plot inline, the statistics and spectra tables, the time source, units and the caution; no script, no
 * external resource), `history.csv`, `history.json`, `statistics.csv`, `spectra.csv`, `probe-set.json`
 * and one `history-<n>.svg` / `spectrum-<n>.svg` per quantity. Pure: the command line writes it with the
 * report folder writer.
 */
import { spectrumSvg, historySvg } from '../study/historyPlot.ts';
import type { ReportFiles } from '../study/reportFolder.ts';
import { UNITS_STATEMENT, sig6, type TableContext } from '../study/resultTables.ts';
import { historyJson, spectraCsv, statisticsCsv, type ColumnSummary } from './historyStats.ts';
import { historyCsv, historyPreamble, type HistoryTable } from './historyTable.ts';

/** Names of the fixed files of a history report (`report.html` as in every report folder). */
export const HISTORY_FILES = {
  html: 'report.html', csv: 'history.csv', json: 'history.json', statistics: 'statistics.csv', spectra: 'spectra.csv', probeSet: 'probe-set.json',
} as const;

const esc = (s: string): string => s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');

/** The plots of one column (SVG text), or none when it has no statistics. */
function plotsOf(t: HistoryTable, s: ColumnSummary): { history: string; spectrum: string | null } {
  const m = s.summary;
  const history = historySvg({
    time: t.time, values: s.column.values, quantity: `${s.column.probe}.${s.column.key}`, unit: s.column.unit === '1' ? '' : s.column.unit, timeUnit: t.timeUnit,
    ...(m ? { window: { from: m.stats.from, to: m.stats.to }, mean: m.stats.mean, halfWidth95: m.stats.meanUncertainty.halfWidth95, transientEnd: m.transient.time } : {}),
  });
  const sp = m?.spectrum;
  const spectrum = sp ? spectrumSvg({
    frequencies: sp.frequencies, power: sp.power, quantity: `${s.column.probe}.${s.column.key}`, unit: s.column.unit === '1' ? '' : s.column.unit,
    frequencyUnit: t.timeUnit === 's' ? 'Hz' : '1/step', peak: { frequency: sp.frequency, amplitude: sp.amplitude, ...(m!.strouhal !== null ? { strouhal: m!.strouhal } : {}) },
  }) : null;
  return { history, spectrum };
}

/** Every file of the history report. */
export function historyReport(t: HistoryTable, summaries: readonly ColumnSummary[], ctx: TableContext & { title: string }, probeSetText: string): ReportFiles {
  const enc = new TextEncoder();
  const files: ReportFiles = {
    [HISTORY_FILES.csv]: enc.encode(historyCsv(t, ctx)),
    [HISTORY_FILES.json]: enc.encode(historyJson(t, summaries, ctx)),
    [HISTORY_FILES.statistics]: enc.encode(statisticsCsv(t, summaries, ctx)),
    [HISTORY_FILES.spectra]: enc.encode(spectraCsv(t, summaries, ctx)),
    [HISTORY_FILES.probeSet]: enc.encode(probeSetText),
  };
  const sections: string[] = [];
  const rows: string[] = [];
  summaries.forEach((s, i) => {
    const n = i + 1, m = s.summary, u = m?.stats.meanUncertainty;
    rows.push(`<tr><td>${esc(s.column.name)}</td><td>${m ? `${sig6(m.stats.mean)} ± ${sig6(u!.halfWidth95)}` : '—'}</td><td>${m ? sig6(m.stats.rmsFluctuation) : '—'}</td>`
      + `<td>${m ? `${sig6(m.stats.min)} … ${sig6(m.stats.max)}` : '—'}</td><td>${m ? `${sig6(m.stats.from)} … ${sig6(m.stats.to)} (${m.windowSource === 'user' ? 'given' : 'after the detected transient'})` : '—'}</td>`
      + `<td>${m?.spectrum ? sig6(m.spectrum.frequency) : '—'}</td><td>${m?.strouhal != null ? sig6(m.strouhal) : '—'}</td><td>${esc(s.error ?? u?.note ?? '')}</td></tr>`);
    let plots: { history: string; spectrum: string | null };
    try { plots = plotsOf(t, s); } catch (e) { sections.push(`<section><h3>${esc(s.column.name)}</h3><p>No plot: ${esc((e as Error).message)}</p></section>`); return; }
    files[`history-${n}.svg`] = enc.encode(plots.history);
    if (plots.spectrum) files[`spectrum-${n}.svg`] = enc.encode(plots.spectrum);
    sections.push(`<section><h3>${esc(s.column.name)}</h3>${plots.history}${plots.spectrum ?? ''}${s.error ? `<p>${esc(s.error)}</p>` : ''}</section>`);
  });
  const methods = [...new Set(summaries.flatMap((s) => (s.summary ? [s.summary.stats.meanUncertainty.method, s.summary.transient.method, ...(s.summary.spectrum ? [s.summary.spectrum.method] : [])] : [])))];
  const html = `<!doctype html><html lang="en"><head><meta charset="utf-8">
<meta http-equiv="Content-Security-Policy" content="default-src 'none'; style-src 'unsafe-inline'; img-src data:">
<title>${esc(ctx.title)}</title>
<style>body{font:14px/1.45 system-ui,sans-serif;margin:24px;color:#222;max-width:1100px}table{border-collapse:collapse;margin:12px 0}table{width:100%;table-layout:fixed}td,th{border:1px solid #ccc;padding:3px 8px;text-align:left;vertical-align:top;overflow-wrap:anywhere}th:first-child{width:24%}th:last-child{width:26%}
.caution{background:#fff4d6;border:1px solid #e0b84f;padding:8px 12px}section{margin:18px 0}svg{display:block;margin:6px 0}</style></head><body>
<h1>${esc(ctx.title)}</h1>
<p class="caution"><strong>Caution.</strong> ${esc(ctx.caution)}</p>
<ul>${historyPreamble(t, ctx).slice(0, 3).map((l) => `<li>${esc(l)}</li>`).join('')}</ul>
<h2>Statistics over the window</h2>
<table><thead><tr><th>quantity</th><th>mean ± 95 % half-width</th><th>rms fluctuation</th><th>min … max</th><th>window [${esc(t.timeUnit)}]</th><th>dominant frequency [${t.timeUnit === 's' ? 'Hz' : '1/step'}]</th><th>Strouhal number</th><th>note</th></tr></thead>
<tbody>${rows.join('\n')}</tbody></table>
<p>Methods: ${methods.map(esc).join('; ') || '—'}. Strouhal number St = f·L/U with the probe set's reference length and speed.</p>
${t.failures.length ? `<h2>Failed probes</h2><ul>${t.failures.map((f) => `<li>${esc(f)}</li>`).join('')}</ul>` : ''}
<h2>Histories and spectra</h2>
${sections.join('\n')}
<p>${esc(UNITS_STATEMENT)}</p>
<p>Files: ${Object.keys(files).map(esc).join(', ')}.</p>
</body></html>
`;
  files[HISTORY_FILES.html] = enc.encode(html);
  return files;
}
