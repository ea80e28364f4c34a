/**
 * Undo and redo over snapshots of the study (the probe set as text: every probe, label and reference
 * value). The newest state is held as `current`; recording a different state pushes the previous one on
 * the undo stack and clears redo. At most `limit` steps are kept (the oldest dropped). Pure: no DOM.
 */

/** Steps kept at most (the brief asks for at least 100). */
export const UNDO_LIMIT = 200;

export class UndoHistory {
  private readonly undoStack: string[] = [];
  private readonly redoStack: string[] = [];
  private current: string | undefined;

  constructor(private readonly limit = UNDO_LIMIT) {}

  /** Records the state now; returns true when it differs from the last one (a step was added). */
  record(state: string): boolean {
    if (state === this.current) return false;
    if (this.current !== undefined) {
      this.undoStack.push(this.current);
      if (this.undoStack.length > this.limit) this.undoStack.shift();
    }
    this.redoStack.length = 0;
    this.current = state;
    return true;
  }

  /** Replaces the state now without a step (a new file re-evaluated the same probes, say). */
  reset(state: string): void { this.current = state; }

  get canUndo(): boolean { return this.undoStack.length > 0; }
  get canRedo(): boolean { return this.redoStack.length > 0; }
  /** Steps that can be undone. */
  get depth(): number { return this.undoStack.length; }

  /** The state to go back to, or undefined when there is none. */
  undo(): string | undefined {
    const s = this.undoStack.pop();
    if (s === undefined) return undefined;
    if (this.current !== undefined) this.redoStack.push(this.current);
    this.current = s;
    return s;
  }

  /** The state to go forward to, or undefined when there is none. */
  redo(): string | undefined {
    const s = this.redoStack.pop();
    if (s === undefined) return undefined;
    if (this.current !== undefined) this.undoStack.push(this.current);
    this.current = s;
    return s;
  }
}
