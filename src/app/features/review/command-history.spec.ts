import { canRedo, canUndo, createHistory, nextLabels, record, redo, undo } from './command-history';

const cmd = (label: string) => ({ label, changes: [label] });

describe('command history', () => {
  it('undoes and redoes in order', () => {
    let h = createHistory<string>();
    h = record(h, cmd('a'));
    h = record(h, cmd('b'));
    expect(nextLabels(h)).toEqual({ undo: 'b', redo: null });
    const u1 = undo(h)!;
    expect(u1.command.label).toBe('b');
    const u2 = undo(u1.history)!;
    expect(u2.command.label).toBe('a');
    expect(undo(u2.history)).toBeNull();
    expect(canUndo(u2.history)).toBe(false);
    expect(canRedo(u2.history)).toBe(true);
    const r1 = redo(u2.history)!;
    expect(r1.command.label).toBe('a');
    expect(nextLabels(r1.history)).toEqual({ undo: 'a', redo: 'b' });
  });

  it('clears the redo stack when something new is done', () => {
    let h = record(record(createHistory<string>(), cmd('a')), cmd('b'));
    h = undo(h)!.history;
    h = record(h, cmd('c'));
    expect(canRedo(h)).toBe(false);
    expect(h.past.map((c) => c.label)).toEqual(['a', 'c']);
  });

  it('ignores empty commands', () => {
    const h = createHistory<string>();
    expect(record(h, { label: 'nothing', changes: [] })).toBe(h);
  });

  it('keeps only the newest commands up to the limit', () => {
    let h = createHistory<string>(3);
    for (const l of ['a', 'b', 'c', 'd', 'e']) h = record(h, cmd(l));
    expect(h.past.map((c) => c.label)).toEqual(['c', 'd', 'e']);
  });

  it('does not mutate earlier histories', () => {
    const h1 = record(createHistory<string>(), cmd('a'));
    const h2 = undo(h1)!.history;
    expect(h1.past).toHaveLength(1);
    expect(h2.past).toHaveLength(0);
  });
});
