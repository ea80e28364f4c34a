/**
 * The formula editor: a user formula (name, expression, optional SI unit) becomes a field of the open
 * file in every chooser — colour, cut-plane fields, line probes — and is saved with the probe set
 * (`formulas`, the core's format), restored on reload, removable and undoable like a probe. The
 * expression is checked here with the core's parser first (an error shows its column and what was
 * expected); what only the file can tell (a field that is missing, a unit that does not match) comes
 * back from the worker and is shown the same way, and the formula is not kept.
 */
import type GUI from 'lil-gui';
import { checkFormula, type FormulaDoc } from '../derive/formulaFields.ts';
import { dimsOf, FORMULA_UNIT_LABELS } from '../derive/formulaUnits.ts';
import { FormulaEditor, type FormulaDraft } from '../ui/formulaEditor.ts';
import type { DerivedTool } from './derivedTool.ts';
import type { Viewer } from './viewer.ts';

export class FormulaTool {
  private readonly editor: FormulaEditor;
  private readonly changeListeners: (() => void)[] = [];

  constructor(v: Viewer, private readonly derived: DerivedTool) {
    const folder: GUI = v.gui.addFolder('Formulas');
    const host = folder.domElement.querySelector<HTMLElement>('.lil-children') ?? folder.domElement;
    this.editor = new FormulaEditor(host, FORMULA_UNIT_LABELS, {
      add: (d) => void v.track(this.add(d)),
      remove: (name) => void v.track(this.remove(name)),
    });
    derived.onAttached(() => this.showRows());
  }

  /** Called when the user defined or removed a formula (the probe set takes an undo step). */
  onChange(f: () => void): void { this.changeListeners.push(f); }

  /** The formulas, as the probe set stores them. */
  docs(): FormulaDoc[] { return this.derived.formulas; }

  /** Takes a probe set's formulas (no undo step: the set's own). */
  setFrom(list: readonly FormulaDoc[]): Promise<void> {
    this.editor.clearError();
    return this.derived.setFormulas(list);
  }

  /** Defines a formula from the form; on any error shows it and keeps the formulas as they were. */
  async add(d: FormulaDraft): Promise<boolean> {
    const doc: FormulaDoc = { name: d.name, expression: d.expression, ...(d.unit ? { unit: d.unit } : {}) };
    const before = this.derived.formulas;
    try {
      if (before.some((f) => f.name === doc.name)) throw new Error(`formula "${doc.name}": a formula of that name exists; remove it first or choose another name`);
      checkFormula(doc);
      if (doc.unit !== undefined && dimsOf(doc.unit) === null) throw new Error(`formula "${doc.name}": unit "${doc.unit}" is not an SI unit label; expected one of ${FORMULA_UNIT_LABELS.join(', ')}`);
    } catch (e) {
      this.editor.showError((e as Error).message, doc.expression);
      return false;
    }
    await this.derived.setFormulas([...before, doc]);
    const failed = this.derived.failureOf(doc.name);
    if (failed) {
      await this.derived.setFormulas(before);
      this.editor.showError(failed, doc.expression);
      return false;
    }
    this.editor.clearError();
    this.editor.clearForm();
    for (const l of this.changeListeners) l();
    return true;
  }

  /** Removes a formula (formulas after it that use it then show why they fail). */
  async remove(name: string): Promise<void> {
    await this.derived.setFormulas(this.derived.formulas.filter((f) => f.name !== name));
    for (const l of this.changeListeners) l();
  }

  private showRows(): void {
    this.editor.setRows(this.derived.formulas.map((f) => {
      const problem = this.derived.failureOf(f.name);
      return { name: f.name, expression: f.expression, unit: f.unit ?? this.derived.unitOf(f.name) ?? 'undeclared', ...(problem ? { problem } : {}) };
    }));
  }
}
