/** Undo/redo over study snapshots: steps in order, redo cleared by a new step, at least 100 steps kept. */
import { describe, expect, it } from 'vitest';
import { UNDO_LIMIT, UndoHistory } from '../../src/app/undoHistory.ts';

describe('UndoHistory', () => {
  it('undoes and redoes in order; a new step clears redo; equal states add no step', () => {
    const h = new UndoHistory();
    expect(h.record('a')).toBe(true);
    expect(h.canUndo).toBe(false);
    h.record('b');
    expect(h.record('b')).toBe(false);
    h.record('c');
    expect(h.undo()).toBe('b');
    expect(h.undo()).toBe('a');
    expect(h.undo()).toBeUndefined();
    expect(h.redo()).toBe('b');
    h.record('d');
    expect(h.canRedo).toBe(false);
    expect(h.undo()).toBe('b');
    expect(h.redo()).toBe('d');
  });

  it('keeps at least 100 steps, dropping the oldest beyond its limit', () => {
    expect(UNDO_LIMIT).toBeGreaterThanOrEqual(100);
    const h = new UndoHistory(UNDO_LIMIT);
    for (let i = 0; i <= UNDO_LIMIT + 50; i++) h.record(String(i));
    expect(h.depth).toBe(UNDO_LIMIT);
    let last = '';
    while (h.canUndo) last = h.undo()!;
    expect(last).toBe('50');
  });

  it('a reset changes the state without a step', () => {
    const h = new UndoHistory();
    h.record('a');
    h.reset('a2');
    expect(h.canUndo).toBe(false);
    h.record('b');
    expect(h.undo()).toBe('a2');
  });
});
