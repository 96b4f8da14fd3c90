import { KEY_HELP, KeyInput, focusOwnsKey, keyAction } from './key-map';

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

  it('lets a slider keep its arrows but not the other keys', () => {
    const slider = { tagName: 'INPUT', type: 'range' };
    expect(keyAction(key('ArrowRight', { target: slider }))).toBeNull();
    expect(keyAction(key('Home', { target: slider }))).toBeNull();
    expect(keyAction(key('i', { target: slider }))).toEqual({ type: 'mark', kind: 'initial_contact' });
  });

  it('lets buttons keep Space and Enter', () => {
    const button = { tagName: 'BUTTON' };
    expect(focusOwnsKey(key(' ', { target: button }))).toBe(true);
    expect(keyAction(key(' ', { target: button }))).toBeNull();
    expect(keyAction(key('ArrowLeft', { target: button }))).toEqual({ type: 'step', by: -1 });
    expect(keyAction(key(' ', { target: { tagName: 'DIV', role: 'tab' } }))).toBeNull();
  });

  it('lets tabs and radio groups keep their arrows', () => {
    expect(keyAction(key('ArrowRight', { target: { tagName: 'DIV', role: 'tab' } }))).toBeNull();
    expect(keyAction(key('ArrowLeft', { target: { tagName: 'BUTTON', role: 'radio' } }))).toBeNull();
    expect(keyAction(key('i', { target: { tagName: 'BUTTON', role: 'radio' } }))).toEqual({ type: 'mark', kind: 'initial_contact' });
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
    const singles = ['[', ']', ',', '.', 'S', 'I', 'M', 'O', 'C', 'L', 'P', 'B', 'F', 'A', 'K', '?'];
    const listed = KEY_HELP.flatMap((g) => g.rows.flatMap((r) => r.keys));
    for (const k of singles) {
      expect(listed).toContain(k);
      expect(keyAction(key(k.length === 1 ? k.toLowerCase() : k))).not.toBeNull();
    }
  });
});
