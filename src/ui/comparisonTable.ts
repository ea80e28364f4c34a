/**
 * The comparison pane: the same probe set on a baseline and the open file (the variant), one row per
 * quantity with both values, the absolute difference and the relative difference. A quantity that one
 * side lacks shows its note instead of a difference.
 */
import type { Comparison } from '../study/compare.ts';
import { percent } from '../study/compare.ts';
import { unitLabel } from '../study/units.ts';
import { formatNumber } from './format.ts';

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
    for (const t of ['quantity', 'baseline', 'variant', 'difference', 'relative']) {
      const th = document.createElement('th');
      th.textContent = t;
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
        th.colSpan = 5;
        th.textContent = r.probeLabel;
        pr.append(th);
      }
      const row = tb.insertRow();
      row.dataset['probe'] = r.probe;
      row.dataset['quantity'] = r.key;
      const u = unitLabel(r.unit);
      row.insertCell().textContent = `${r.label}${u ? ` [${u}]` : ''}`;
      for (const [v, name] of [[r.baseline, 'baseline'], [r.variant, 'variant'], [r.difference, 'difference']] as const) {
        const td = row.insertCell();
        td.className = 'num';
        td.dataset['column'] = name;
        if (v !== null) td.dataset['value'] = String(v);
        td.textContent = v === null ? '—' : formatNumber(v);
      }
      const rel = row.insertCell();
      rel.className = 'num';
      rel.dataset['column'] = 'relative';
      rel.textContent = percent(r.relative);
      if (r.note) { rel.title = r.note; rel.classList.add('noted'); }
    }
    const notes = c.failures.map((f) => { const p = document.createElement('p'); p.className = 'note'; p.textContent = `Failed: ${f}`; return p; });
    this.body.replaceChildren(table, ...notes);
  }
}
