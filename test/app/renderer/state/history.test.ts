import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { History } from '../../../../app/renderer/state/history.ts';

describe('undo/redo history', () => {
  it('undoes and redoes edits in order', () => {
    const h = new History('a');
    h.push('b', 'to b');
    h.push('c', 'to c');
    expect(h.undoLabel).toBe('to c');
    expect(h.undo()).toBe(true);
    expect(h.present).toBe('b');
    expect(h.redoLabel).toBe('to c');
    expect(h.undo()).toBe(true);
    expect(h.present).toBe('a');
    expect(h.undo()).toBe(false);
    expect(h.redo()).toBe(true);
    expect(h.redo()).toBe(true);
    expect(h.present).toBe('c');
    expect(h.redo()).toBe(false);
  });

  it('drops the redo branch on a new edit', () => {
    const h = new History(0);
    h.push(1, '');
    h.undo();
    h.push(2, '');
    expect(h.canRedo).toBe(false);
    expect(h.present).toBe(2);
  });

  it('keeps at most `limit` undo steps', () => {
    const h = new History(0, 3);
    for (let k = 1; k <= 10; k++) h.push(k, '');
    let n = 0;
    while (h.undo()) n++;
    expect(n).toBe(3);
    expect(h.present).toBe(7);
  });

  it('gives every snapshot its own revision, restored by undo (property)', () => {
    fc.assert(
      fc.property(fc.array(fc.constantFrom('push', 'undo', 'redo'), { maxLength: 60 }), (ops) => {
        const h = new History<number>(0);
        const seen = new Map<number, number>([[h.revision, 0]]);
        let v = 0;
        for (const op of ops) {
          if (op === 'push') h.push(++v, '');
          else if (op === 'undo') h.undo();
          else h.redo();
          const prev = seen.get(h.revision);
          if (prev !== undefined && prev !== h.present) return false;
          seen.set(h.revision, h.present);
        }
        return true;
      }),
    );
  });
});
