import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { History } from '../../../renderer/state/history.ts';

describe('undo history', () => {
  it('merges a typing burst into one step until sealed', () => {
    const h = new History('a');
    h.record('ab', 'f1');
    h.record('abc', 'f1');
    h.seal();
    h.record('abcd', 'f1');
    expect(h.undo()).toBe('abc');
    expect(h.undo()).toBe('a');
    expect(h.undo()).toBeNull();
    expect(h.redo()).toBe('abc');
    expect(h.redo()).toBe('abcd');
    expect(h.redo()).toBeNull();
  });

  it('starts a new step when another key is edited', () => {
    const h = new History({ x: 1, y: 1 });
    h.record({ x: 2, y: 1 }, 'x');
    h.record({ x: 2, y: 2 }, 'y');
    expect(h.undo()).toEqual({ x: 2, y: 1 });
  });

  it('drops the redo branch on a new edit and respects its depth', () => {
    const h = new History(0, 3);
    for (let i = 1; i <= 5; i++) h.record(i);
    h.undo();
    h.record(42);
    expect(h.canRedo).toBe(false);
    const seen: number[] = [];
    while (h.canUndo) seen.push(h.undo()!);
    expect(seen).toEqual([4, 3, 2]);
    expect(() => new History(0, 0)).toThrow(/invalid history limit: 0/);
  });

  it('undo of every step returns to the start, redo of every step returns to the end (property)', () => {
    fc.assert(
      fc.property(fc.array(fc.tuple(fc.integer(), fc.option(fc.constantFrom('a', 'b')), fc.boolean()), { maxLength: 40 }), (ops) => {
        const h = new History(-1);
        for (const [value, key, seal] of ops) {
          h.record(value, key ?? undefined);
          if (seal) h.seal();
        }
        const end = h.present;
        while (h.undo() !== null);
        expect(h.present).toBe(-1);
        while (h.redo() !== null);
        expect(h.present).toBe(end);
      }),
    );
  });
});
