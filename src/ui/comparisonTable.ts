/**
 * The comparison pane: the same probe set on a baseline and the open file (the variant), one row per
 * quantity with both values (4 significant figures), the difference Δ (3) and the relative difference
 * Δ %. Short headings, wrapping quantity names and a small type keep it within its pane. A difference
 * that is rounding noise against the baseline value is marked "≈ 0" (its number kept). A quantity that
 * one side lacks shows its note instead of a difference.
 */
import type { Comparison } from '../study/compare.ts';
import { percent } from '../study/compare.ts';
import { unitLabel } from '../study/units.ts';
import { formatNumber } from './format.ts';
import { NOISE_FRACTION, isRoundingNoise } from './roundingNoise.ts';

export class ComparisonTable {
  private readonly body: HTMLDivElement;
  private readonly title: HTMLSpanElement;

  constructor(private readonly host: HTMLElement, onClear: () => void) {
    const head = document.createElement('div');
    head.className = 'pane-head';
    this.title = document.createElement('span');
    this.title.textContent = 'Comparison';
    const clear = document.createElement('button');
    clear.type = 'button';
    clear.textContent = 'Clear baseline';
    clear.className = 'clear-baseline';
    clear.onclick = onClear;
    head.append(this.title, clear);
    this.body = document.createElement('div');
    this.body.className = 'results-body';
    host.append(head, this.body);
    host.hidden = true;
  }

  /** Shows a comparison (null hides the pane); `waiting` text when there is a baseline but no variant yet. */
  set(c: Comparison | null, waiting?: string): void {
    this.host.hidden = !c && !waiting;
    this.host.parentElement?.classList.toggle('comparing', !this.host.hidden);
    if (!c) {
      this.title.textContent = 'Comparison';
      const p = document.createElement('p');
      p.className = 'empty';
      p.textContent = waiting ?? '';
      this.body.replaceChildren(p);
      return;
    }
    this.title.textContent = `Comparison: ${c.variant} vs baseline ${c.baseline}`;
    const table = document.createElement('table');
    table.className = 'results comparison';
    const h = table.createTHead().insertRow();
    for (const [t, title] of COLUMNS) {
      const th = document.createElement('th');
      th.textContent = t;
      th.title = title;
      h.append(th);
    }
    let probe = '';
    const tb = table.createTBody();
    for (const r of c.rows) {
      if (r.probe !== probe) {
        probe = r.probe;
        const pr = tb.insertRow();
        pr.className = 'probe-head';
        const th = document.createElement('th');
        th.colSpan = COLUMNS.length;
        th.textContent = r.probeLabel;
        pr.append(th);
      }
      const row = tb.insertRow();
      row.dataset['probe'] = r.probe;
      row.dataset['quantity'] = r.key;
      const name = row.insertCell();
      name.className = 'quantity';
      name.textContent = r.label;
      const u = unitLabel(r.unit);
      if (u) {
        const unit = document.createElement('span');
        unit.className = 'unit';
        unit.textContent = ` [${u}]`;
        name.append(unit);
      }
      // a difference that is rounding noise against the baseline value is marked, its number kept
      const scale = r.baseline !== null ? { value: r.baseline, label: 'the baseline' } : undefined;
      const noise = r.difference !== null && isRoundingNoise(r.difference, scale);
      for (const [v, column, sig] of [[r.baseline, 'baseline', 4], [r.variant, 'variant', 4], [r.difference, 'difference', 3]] as const) {
        const td = row.insertCell();
        td.className = 'num';
        td.dataset['column'] = column;
        if (v !== null) td.dataset['value'] = String(v);
        td.textContent = v === null ? '—' : formatNumber(v, sig);
        if (column === 'difference' && noise) markNoise(td);
      }
      const rel = row.insertCell();
      rel.className = 'num';
      rel.dataset['column'] = 'relative';
      rel.textContent = percent(r.relative);
      if (noise) markNoise(rel);
      if (r.note) { rel.title = r.note; rel.classList.add('noted'); }
    }
    const notes = c.failures.map((f) => { const p = document.createElement('p'); p.className = 'note'; p.textContent = `Failed: ${f}`; return p; });
    this.body.replaceChildren(table, ...notes);
  }
}

/** Column headings, short so the table fits its pane, with what each means as a tooltip. */
const COLUMNS: readonly [string, string][] = [
  ['quantity', 'probe quantity [unit]'],
  ['baseline', 'value on the baseline file'],
  ['variant', 'value on the open file'],
  ['Δ', 'difference: variant − baseline, in the quantity\'s unit'],
  ['Δ %', 'relative difference: (variant − baseline) / |baseline|'],
];

/** Marks a difference that is rounding noise: "≈ 0" after the number (kept), with the reason as a tooltip. */
function markNoise(td: HTMLTableCellElement): void {
  const mark = document.createElement('span');
  mark.className = 'noise-mark';
  mark.textContent = ' ≈ 0';
  td.append(mark);
  td.classList.add('noise');
  td.title = `rounding noise: at most ${formatNumber(NOISE_FRACTION, 1)} of the baseline value`;
}
