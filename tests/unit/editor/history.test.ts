import { describe, expect, it } from 'vitest';
import { canRedo, canUndo, commit, redo, startHistory, undo } from '../../../src/domain/editor/history';

describe('undo and redo', () => {
  it('steps back and forward and drops the redo branch on a new edit', () => {
    let h = startHistory({ t: 1 });
    h = commit(h, { t: 2 }, { at: 0 });
    h = commit(h, { t: 3 }, { at: 5000 });
    expect(h.present).toEqual({ t: 3 });
    h = undo(h);
    expect(h.present).toEqual({ t: 2 });
    expect(canRedo(h)).toBe(true);
    h = redo(h);
    expect(h.present).toEqual({ t: 3 });
    h = undo(undo(h));
    expect(h.present).toEqual({ t: 1 });
    expect(canUndo(h)).toBe(false);
    h = commit(h, { t: 9 }, { at: 9000 });
    expect(canRedo(h)).toBe(false);
    expect(undo(h).present).toEqual({ t: 1 });
  });

  it('makes typing in one field one step', () => {
    let h = startHistory('');
    h = commit(h, '1', { key: 'x:E1', at: 0 });
    h = commit(h, '12', { key: 'x:E1', at: 300 });
    h = commit(h, '12.5', { key: 'x:E1', at: 600 });
    h = commit(h, 'other', { key: 'y:E1', at: 700 });
    expect(h.past).toEqual(['', '12.5']);
    // a pause longer than the window starts a new step
    h = commit(h, 'other2', { key: 'y:E1', at: 5000 });
    expect(h.past).toEqual(['', '12.5', 'other']);
  });
});
