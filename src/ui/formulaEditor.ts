/**
 * The formula editor's DOM inside its panel folder: the formulas defined (name = expression [unit],
 * each removable), and a form for a new one (name, expression, optional SI unit). An error is shown
 * under the form with the expression and a caret at the column the parser names.
 */
import { errorColumn } from './formulaMessage.ts';

/** A formula as the list shows it. */
export interface FormulaRow {
  name: string;
  expression: string;
  /** The unit shown: declared or found ('undeclared' when unknown). */
  unit: string;
  /** Why it could not be made on this file, or undefined. */
  problem?: string;
}

export interface FormulaDraft { name: string; expression: string; unit: string }

export class FormulaEditor {
  private readonly list: HTMLDivElement;
  private readonly error: HTMLDivElement;
  private readonly name: HTMLInputElement;
  private readonly expression: HTMLInputElement;
  private readonly unit: HTMLInputElement;

  constructor(host: HTMLElement, unitLabels: readonly string[], handlers: { add(d: FormulaDraft): void; remove(name: string): void }) {
    const root = document.createElement('div');
    root.className = 'formula-editor';
    this.list = document.createElement('div');
    this.list.className = 'formula-list';
    this.name = field('formula-name', 'name', 'e.g. dynamicPressure');
    this.expression = field('formula-expression', 'expression', 'e.g. 0.5 * ref.density * dot(velocity, velocity)');
    this.unit = field('formula-unit', 'unit (optional)', 'SI, e.g. Pa');
    const units = document.createElement('datalist');
    units.id = 'formula-unit-labels';
    for (const u of unitLabels) units.append(new Option(u));
    this.unit.setAttribute('list', units.id);
    const add = document.createElement('button');
    add.type = 'button';
    add.id = 'formula-add';
    add.textContent = 'define formula';
    const submit = () => handlers.add({ name: this.name.value.trim(), expression: this.expression.value, unit: this.unit.value.trim() });
    add.onclick = submit;
    for (const i of [this.name, this.expression, this.unit]) i.addEventListener('keydown', (e) => { if (e.key === 'Enter') { e.preventDefault(); submit(); } });
    this.error = document.createElement('div');
    this.error.id = 'formula-error';
    this.error.className = 'formula-error';
    this.error.hidden = true;
    const help = document.createElement('div');
    help.className = 'panel-note';
    help.textContent = 'Fields by name ([name with-dashes] in brackets), + − * / ^, v.x v.y v.z, mag dot cross vec sqrt abs exp log log10 sin cos tan min max, ref.density ref.viscosity ref.speed ref.pressure ref.area ref.length, pi.';
    root.append(this.list, labelled('name', this.name), labelled('expression', this.expression), labelled('unit', this.unit), units, add, this.error, help);
    this.list.addEventListener('click', (e) => {
      const b = (e.target as HTMLElement).closest<HTMLButtonElement>('button[data-remove-formula]');
      if (b) handlers.remove(b.dataset['removeFormula']!);
    });
    host.append(root);
  }

  /** Shows the formulas defined. */
  setRows(rows: readonly FormulaRow[]): void {
    this.list.replaceChildren(...rows.map((r) => {
      const row = document.createElement('div');
      row.className = 'formula-row';
      row.dataset['formula'] = r.name;
      const text = document.createElement('code');
      text.textContent = `${r.name} = ${r.expression}`;
      const unit = document.createElement('span');
      unit.className = 'formula-unit';
      unit.textContent = `[${r.unit}]`;
      const remove = document.createElement('button');
      remove.type = 'button';
      remove.dataset['removeFormula'] = r.name;
      remove.title = `remove ${r.name}`;
      remove.textContent = '×';
      row.append(text, unit, remove);
      if (r.problem) {
        const p = document.createElement('div');
        p.className = 'formula-problem';
        p.textContent = r.problem;
        row.append(p);
      }
      return row;
    }));
  }

  /** Shows an error under the form; with the expression, a caret marks the column the message names. */
  showError(message: string, expression?: string): void {
    this.error.hidden = false;
    const col = expression === undefined ? undefined : errorColumn(message);
    const parts: HTMLElement[] = [];
    if (col !== undefined) {
      const pre = document.createElement('pre');
      pre.className = 'formula-caret';
      pre.textContent = `${expression}\n${' '.repeat(Math.max(0, col - 1))}^`;
      parts.push(pre);
    }
    const text = document.createElement('div');
    text.className = 'formula-message';
    text.textContent = message;
    this.error.replaceChildren(...parts, text);
  }

  clearError(): void { this.error.hidden = true; this.error.replaceChildren(); }

  /** Empties the form after a formula was defined. */
  clearForm(): void { this.name.value = ''; this.expression.value = ''; this.unit.value = ''; }
}

function field(id: string, label: string, placeholder: string): HTMLInputElement {
  const i = document.createElement('input');
  i.id = id;
  i.type = 'text';
  i.spellcheck = false;
  i.placeholder = placeholder;
  i.setAttribute('aria-label', label);
  return i;
}

function labelled(text: string, input: HTMLInputElement): HTMLLabelElement {
  const l = document.createElement('label');
  l.className = 'formula-field';
  const s = document.createElement('span');
  s.textContent = text;
  l.append(s, input);
  return l;
}
