/**
 * The results table: every probe and all its numbers (rounding noise marked), its notes (explanations in a
 * neutral style, problems as warnings), a pin toggle and a remove button per probe, and "copy as text"
 * for the whole table.
 */
import { addCautionLine } from './cautionLine.ts';
import { withUnit } from './format.ts';
import type { ProbeResult } from './results.ts';
import { noiseMark } from './roundingNoise.ts';

export interface ResultsTableEvents {
  onTogglePin: (id: string, visible: boolean) => void;
  onRemove: (id: string) => void;
  onCopy: () => void;
  /** A probe's heading was clicked (it becomes the selected probe). */
  onSelect?: (id: string) => void;
  /** A probe's label was edited (double-click the label, Enter to keep, Escape to drop). */
  onRename?: (id: string, label: string) => void;
}

export class ResultsTable {
  private readonly body: HTMLDivElement;

  constructor(host: HTMLElement, private readonly events: ResultsTableEvents) {
    const head = document.createElement('div');
    head.className = 'pane-head';
    const title = document.createElement('span');
    title.textContent = 'Results';
    const copy = document.createElement('button');
    copy.type = 'button';
    copy.textContent = 'Copy as text';
    copy.className = 'copy-results';
    copy.onclick = () => events.onCopy();
    head.append(title, copy);
    this.body = document.createElement('div');
    this.body.className = 'results-body';
    host.append(head, this.body);
    addCautionLine(host);
  }

  private selected: string | undefined;

  /** Turns a label into a field: Enter (or leaving it) keeps a non-empty new label, Escape drops the edit. */
  private editLabel(name: HTMLElement, id: string, label: string): void {
    const input = document.createElement('input');
    input.className = 'probe-label-input';
    input.value = label;
    input.maxLength = 120;
    let done = false;
    const finish = (keep: boolean) => {
      if (done) return;
      done = true;
      const v = input.value.trim();
      input.replaceWith(name);
      if (keep && v && v !== label) this.events.onRename?.(id, v);
    };
    input.onkeydown = (ev) => { if (ev.key === 'Enter') finish(true); else if (ev.key === 'Escape') finish(false); ev.stopPropagation(); };
    input.onblur = () => finish(true);
    name.replaceWith(input);
    input.focus();
    input.select();
  }

  /** Marks the selected probe's heading. */
  setSelected(id: string | undefined): void {
    this.selected = id;
    for (const tr of this.body.querySelectorAll<HTMLElement>('tr.probe-head')) tr.classList.toggle('selected', tr.dataset['probe'] === id);
  }

  set(results: readonly ProbeResult[]): void {
    if (results.length === 0) {
      const p = document.createElement('p');
      p.className = 'empty';
      p.textContent = 'No probes yet. Place a cut-plane, a line probe or select surfaces for a force total.';
      this.body.replaceChildren(p);
      return;
    }
    const table = document.createElement('table');
    table.className = 'results';
    for (const r of results) {
      const tr = table.insertRow();
      tr.className = 'probe-head';
      tr.dataset['probe'] = r.id;
      if (r.id === this.selected) tr.classList.add('selected');
      tr.onclick = (ev) => { if (!(ev.target instanceof HTMLInputElement || ev.target instanceof HTMLButtonElement)) this.events.onSelect?.(r.id); };
      const th = document.createElement('th');
      th.colSpan = 2;
      const name = document.createElement('span');
      name.className = 'probe-label';
      name.textContent = r.label;
      name.title = 'double-click to rename';
      name.ondblclick = () => this.editLabel(name, r.id, r.label);
      const def = document.createElement('span');
      def.className = 'probe-def';
      def.textContent = r.definition;
      const pin = document.createElement('label');
      const box = document.createElement('input');
      box.type = 'checkbox';
      box.checked = r.pinVisible;
      box.onchange = () => this.events.onTogglePin(r.id, box.checked);
      pin.append(box, ' pin');
      const rm = document.createElement('button');
      rm.type = 'button';
      rm.textContent = 'Remove';
      rm.onclick = () => this.events.onRemove(r.id);
      th.append(name, def, pin, rm);
      tr.append(th);
      for (const n of r.notes ?? []) {
        const td = table.insertRow().insertCell();
        td.colSpan = 2;
        td.className = 'note';
        // explanations read as plain notes; only real problems take the warning colour
        td.dataset['level'] = n.level;
        td.textContent = n.text;
      }
      for (const q of r.quantities) {
        const row = table.insertRow();
        row.dataset['probe'] = r.id;
        row.dataset['quantity'] = q.key;
        row.insertCell().textContent = q.label;
        const v = row.insertCell();
        v.className = 'num';
        v.textContent = withUnit(q.value, q.unit);
        const mark = noiseMark(q.value, q.scale).trim();
        if (mark) {
          const m = document.createElement('span');
          m.className = 'noise-mark';
          m.textContent = mark;
          v.append(m);
        }
      }
    }
    this.body.replaceChildren(table);
  }
}
