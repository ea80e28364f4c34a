/**
 * Keyboard shortcuts of the app: undo and redo of every probe, label and reference change, Delete for the
 * selected probe, quick keys for a new cut-plane or line probe and the view, and a keys overlay (`?`).
 * Keys typed into a field (the panel's inputs, a select) are left to the field.
 */
import { KeysOverlay, type KeyHelp } from '../ui/keysOverlay.ts';

/** What the shortcuts act on. */
export interface ShortcutActions {
  undo(): void;
  redo(): void;
  /** Removes the selected probe (no-op without one). */
  removeSelected(): void;
  newPlane(): void;
  newLine(): void;
  fit(): void;
}

/** The list the overlay shows (and the README repeats). */
export const SHORTCUTS: readonly KeyHelp[] = [
  { keys: 'Ctrl+Z', what: 'undo the last change of probes, labels or reference conditions' },
  { keys: 'Ctrl+Y or Ctrl+Shift+Z', what: 'redo' },
  { keys: 'Delete', what: 'remove the selected probe (click its pin or its heading in Results to select it)' },
  { keys: 'P', what: 'new cut-plane' },
  { keys: 'L', what: 'new line probe' },
  { keys: 'F', what: 'fit the shown surfaces in the view' },
  { keys: '?', what: 'show or hide this list' },
];

function typing(t: EventTarget | null): boolean {
  return t instanceof HTMLInputElement || t instanceof HTMLTextAreaElement || t instanceof HTMLSelectElement || (t instanceof HTMLElement && t.isContentEditable);
}

/** Listens on the page for the shortcuts; returns the overlay (opened by `?` or the top bar's Keys button). */
export function bindShortcuts(a: ShortcutActions): KeysOverlay {
  const overlay = new KeysOverlay(document.body, SHORTCUTS);
  document.addEventListener('keydown', (ev) => {
    if (typing(ev.target)) return;
    const k = ev.key, mod = ev.ctrlKey || ev.metaKey;
    let done = true;
    if (mod && !ev.shiftKey && (k === 'z' || k === 'Z')) a.undo();
    else if (mod && (k === 'y' || k === 'Y' || (ev.shiftKey && (k === 'z' || k === 'Z')))) a.redo();
    else if (mod || ev.altKey) done = false;
    else if (k === 'Delete' || k === 'Backspace') a.removeSelected();
    else if (k === 'p' || k === 'P') a.newPlane();
    else if (k === 'l' || k === 'L') a.newLine();
    else if (k === 'f' || k === 'F') a.fit();
    else if (k === '?') overlay.toggle();
    else done = false;
    if (done) ev.preventDefault();
  });
  return overlay;
}
