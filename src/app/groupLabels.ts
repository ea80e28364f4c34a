/**
 * The user's labels of surface groups, keyed by the group's name as the file gives it (its default label:
 * a name from the file's name table or block names, else `<array> <value>` / `part <id>`), so a label
 * follows the group into another file with the same names and never depends on cell order or ids. Every
 * place that shows a group (the Surfaces list, the force, wall and split tools, pins, the results table,
 * CSV and report exports) shows `labelOf(name)`; the probe set keeps the map as `groupLabels`. Pure: no DOM.
 */
import { relabelGroups } from '../study/groupLabelText.ts';
import { LIMITS } from '../study/probeSetCheck.ts';

export class GroupLabels {
  private readonly labels = new Map<string, string>();
  private readonly listeners: (() => void)[] = [];

  /** Called after any label changed (by the user, an undo or an opened probe set). */
  onChange(f: () => void): void { this.listeners.push(f); }

  /** The label shown for the group the file names `name`. */
  labelOf(name: string): string { return this.labels.get(name) ?? name; }

  /**
   * Gives the group named `name` the label `label` (trimmed, at most the probe set's text limit); an
   * empty label or the file's own name brings the default back. Returns true when something changed.
   */
  set(name: string, label: string): boolean {
    const l = label.trim().slice(0, LIMITS.textMax);
    const before = this.labels.get(name);
    if (l === '' || l === name) this.labels.delete(name); else this.labels.set(name, l);
    if (this.labels.get(name) === before) return false;
    for (const f of this.listeners) f();
    return true;
  }

  /** Replaces every label by those of a probe set's `groupLabels` (none: every group shows its file name). */
  setFrom(doc: Readonly<Record<string, string>> | undefined): void {
    const before = JSON.stringify(this.doc() ?? {});
    this.labels.clear();
    for (const [name, label] of Object.entries(doc ?? {})) if (label && label !== name) this.labels.set(name, label);
    if (JSON.stringify(this.doc() ?? {}) !== before) for (const f of this.listeners) f();
  }

  /** The labels as a probe set keeps them (names in sorted order, so equal maps write equal text), or undefined when none is set. */
  doc(): Record<string, string> | undefined {
    if (this.labels.size === 0) return undefined;
    const out: Record<string, string> = {};
    for (const k of [...this.labels.keys()].sort()) out[k] = this.labels.get(k)!;
    return out;
  }

  /**
   * A result's definition with every group written as the evaluators write one (its id, then its quoted
   * name: `3 "wall"`) shown under its label (`3 "hull"`); other quoted text (field names) is left alone.
   */
  relabel(text: string): string {
    if (this.labels.size === 0) return text;
    return relabelGroups(text, (n) => this.labels.get(n));
  }
}
