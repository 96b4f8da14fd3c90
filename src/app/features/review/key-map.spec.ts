import { FRAME_KEYS, KEY_HELP, KeyInput, focusOwnsKey, keyAction } from './key-map';

function key(k: string, mods: Partial<KeyInput> = {}): KeyInput {
  return { key: k, shiftKey: false, ctrlKey: false, metaKey: false, altKey: false, target: { tagName: 'BODY' }, ...mods };
}

describe('keyAction', () => {
  it('steps frames by one and by ten', () => {
    expect(keyAction(key('ArrowLeft'))).toEqual({ type: 'step', by: -1 });
    expect(keyAction(key('ArrowRight'))).toEqual({ type: 'step', by: 1 });
    expect(keyAction(key('ArrowLeft', { shiftKey: true }))).toEqual({ type: 'step', by: -10 });
    expect(keyAction(key('ArrowRight', { shiftKey: true }))).toEqual({ type: 'step', by: 10 });
  });

  it('jumps to the ends and between events, and plays', () => {
    expect(keyAction(key('Home'))).toEqual({ type: 'first' });
    expect(keyAction(key('End'))).toEqual({ type: 'last' });
    expect(keyAction(key('['))).toEqual({ type: 'event-jump', dir: -1 });
    expect(keyAction(key(']'))).toEqual({ type: 'event-jump', dir: 1 });
    expect(keyAction(key(' '))).toEqual({ type: 'play' });
    expect(keyAction(key(','))).toEqual({ type: 'speed', dir: -1 });
    expect(keyAction(key('.'))).toEqual({ type: 'speed', dir: 1 });
  });

  it('steps to the next frame to check with N and back with Shift + N (no other key of the map uses N)', () => {
    expect(keyAction(key('n'))).toEqual({ type: 'check-jump', dir: 1 });
    expect(keyAction(key('N', { shiftKey: true }))).toEqual({ type: 'check-jump', dir: -1 });
    expect(keyAction(key('n', { ctrlKey: true }))).toBeNull();
    const taken = KEY_HELP.flatMap((g) => g.rows.flatMap((r) => r.keys)).filter((k) => /^(shift \+ )?n$/i.test(k));
    expect(taken).toEqual(['N', 'Shift + N']);
  });

  it('chooses landmarks 1–6 and marks events with I, M, O in either case', () => {
    expect(keyAction(key('1'))).toEqual({ type: 'landmark', index: 0 });
    expect(keyAction(key('6'))).toEqual({ type: 'landmark', index: 5 });
    expect(keyAction(key('7'))).toBeNull();
    expect(keyAction(key('i'))).toEqual({ type: 'mark', kind: 'initial_contact' });
    expect(keyAction(key('M', { shiftKey: true }))).toEqual({ type: 'mark', kind: 'midstance' });
    expect(keyAction(key('o'))).toEqual({ type: 'mark', kind: 'toe_off' });
    expect(keyAction(key('s'))).toEqual({ type: 'side' });
  });

  it('undoes and redoes with Ctrl or ⌘, and leaves other shortcuts to the browser', () => {
    expect(keyAction(key('z', { ctrlKey: true }))).toEqual({ type: 'undo' });
    expect(keyAction(key('Z', { ctrlKey: true, shiftKey: true }))).toEqual({ type: 'redo' });
    expect(keyAction(key('y', { ctrlKey: true }))).toEqual({ type: 'redo' });
    expect(keyAction(key('z', { metaKey: true }))).toEqual({ type: 'undo' });
    expect(keyAction(key('c', { ctrlKey: true }))).toBeNull();
    expect(keyAction(key('r', { ctrlKey: true }))).toBeNull();
    expect(keyAction(key('ArrowLeft', { altKey: true }))).toBeNull();
  });

  it('has tool, view, copy, delete and help keys', () => {
    expect(keyAction(key('c'))).toEqual({ type: 'copy-previous' });
    expect(keyAction(key('t'))).toEqual({ type: 'follow' });
    expect(keyAction(key('Delete'))).toEqual({ type: 'delete' });
    expect(keyAction(key('Backspace'))).toEqual({ type: 'delete' });
    expect(keyAction(key('f'))).toEqual({ type: 'fit' });
    expect(keyAction(key('+'))).toEqual({ type: 'zoom', dir: 1 });
    expect(keyAction(key('-'))).toEqual({ type: 'zoom', dir: -1 });
    expect(keyAction(key('b'))).toEqual({ type: 'tool', tool: 'scale' });
    expect(keyAction(key('p'))).toEqual({ type: 'tool', tool: 'pan' });
    expect(keyAction(key('l'))).toEqual({ type: 'tool', tool: 'landmark' });
    expect(keyAction(key('?', { shiftKey: true }))).toEqual({ type: 'help' });
    expect(keyAction(key('Escape'))).toEqual({ type: 'escape' });
    expect(keyAction(key('q'))).toBeNull();
  });
});

describe('focus that keeps keys', () => {
  it('ignores every key while typing in a text field', () => {
    const input = { tagName: 'INPUT', type: 'text' };
    expect(keyAction(key('ArrowLeft', { target: input }))).toBeNull();
    expect(keyAction(key('i', { target: input }))).toBeNull();
    expect(keyAction(key('z', { ctrlKey: true, target: { tagName: 'TEXTAREA' } }))).toBeNull();
    expect(keyAction(key('m', { target: { tagName: 'DIV', isContentEditable: true } }))).toBeNull();
    expect(keyAction(key('1', { target: { tagName: 'INPUT', type: 'number' } }))).toBeNull();
  });

  it('the frame slider gives the frame keys to the page (they step frames either way), Up/Down it keeps', () => {
    const slider = { tagName: 'INPUT', type: 'range' };
    expect(keyAction(key('ArrowRight', { target: slider }))).toEqual({ type: 'step', by: 1 });
    expect(keyAction(key('Home', { target: slider }))).toEqual({ type: 'first' });
    expect(focusOwnsKey(key('ArrowUp', { target: slider }))).toBe(true);
    expect(keyAction(key('i', { target: slider }))).toEqual({ type: 'mark', kind: 'initial_contact' });
  });

  it('lets a button reached with the keyboard keep Space and Enter; after a click Space plays', () => {
    const tabbedTo = { tagName: 'BUTTON', focusVisible: true };
    expect(focusOwnsKey(key(' ', { target: tabbedTo }))).toBe(true);
    expect(keyAction(key(' ', { target: tabbedTo }))).toBeNull();
    expect(keyAction(key(' ', { target: { tagName: 'BUTTON', focusVisible: false } }))).toEqual({ type: 'play' });
    expect(keyAction(key('Enter', { target: { tagName: 'BUTTON' } }))).toBeNull();
    expect(keyAction(key('ArrowLeft', { target: tabbedTo }))).toEqual({ type: 'step', by: -1 });
    expect(keyAction(key(' ', { target: { tagName: 'DIV', role: 'tab', focusVisible: true } }))).toBeNull();
  });

  it('steps frames with every frame key on a side tab or speed toggle (they do not swallow them)', () => {
    for (const target of [
      { tagName: 'DIV', role: 'tab' },
      { tagName: 'BUTTON', role: 'radio' },
      { tagName: 'DIV', role: 'tab', focusVisible: true },
    ]) {
      expect(keyAction(key('ArrowRight', { target }))).toEqual({ type: 'step', by: 1 });
      expect(keyAction(key('ArrowLeft', { target, shiftKey: true }))).toEqual({ type: 'step', by: -10 });
      expect(keyAction(key('End', { target }))).toEqual({ type: 'last' });
      expect(keyAction(key(']', { target }))).toEqual({ type: 'event-jump', dir: 1 });
      expect(keyAction(key(',', { target }))).toEqual({ type: 'speed', dir: -1 });
    }
    for (const k of FRAME_KEYS) expect(keyAction(key(k, { target: { tagName: 'BUTTON', role: 'radio' } })), k).not.toBeNull();
    expect(focusOwnsKey(key('ArrowDown', { target: { tagName: 'DIV', role: 'tab' } }))).toBe(true);
    expect(keyAction(key('i', { target: { tagName: 'BUTTON', role: 'radio' } }))).toEqual({ type: 'mark', kind: 'initial_contact' });
  });

  it('G chooses the Angle gauge', () => {
    expect(keyAction(key('g'))).toEqual({ type: 'tool', tool: 'gauge' });
    expect(keyAction(key('G', { shiftKey: true }))).toEqual({ type: 'tool', tool: 'gauge' });
  });

  it('K keeps the frame as a still, but not with Ctrl (the browser keeps that)', () => {
    expect(keyAction(key('k'))).toEqual({ type: 'save-still' });
    expect(keyAction(key('K', { shiftKey: true }))).toEqual({ type: 'save-still' });
    expect(keyAction(key('k', { ctrlKey: true }))).toBeNull();
  });
});

describe('KEY_HELP', () => {
  it('lists every group with rows, and each documented single key does something', () => {
    expect(KEY_HELP.map((g) => g.title)).toEqual(['Frames', 'Marking', 'Tools and view']);
    const singles = ['[', ']', ',', '.', 'S', 'I', 'M', 'O', 'C', 'N', 'L', 'P', 'B', 'G', 'F', 'A', 'K', '?'];
    const listed = KEY_HELP.flatMap((g) => g.rows.flatMap((r) => r.keys));
    for (const k of singles) {
      expect(listed).toContain(k);
      expect(keyAction(key(k.length === 1 ? k.toLowerCase() : k))).not.toBeNull();
    }
  });
});
