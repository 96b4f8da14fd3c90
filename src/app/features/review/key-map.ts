/**
 * The review workspace's keyboard map (our own), the help table built from it, and the dispatch
 * from a key event to an action. Pure: the page turns actions into edits and moves.
 */
import type { GaitEventKind } from '../../../contracts/annotations';

export type ReviewTool = 'landmark' | 'pan' | 'scale';

export type ReviewAction =
  | { type: 'step'; by: number }
  | { type: 'first' }
  | { type: 'last' }
  | { type: 'event-jump'; dir: -1 | 1 }
  | { type: 'play' }
  | { type: 'speed'; dir: -1 | 1 }
  | { type: 'zoom'; dir: -1 | 1 }
  | { type: 'fit' }
  | { type: 'angles' }
  | { type: 'landmark'; index: number }
  | { type: 'side' }
  | { type: 'mark'; kind: GaitEventKind }
  | { type: 'copy-previous' }
  | { type: 'delete' }
  | { type: 'undo' }
  | { type: 'redo' }
  | { type: 'escape' }
  | { type: 'tool'; tool: ReviewTool }
  | { type: 'save-still' }
  | { type: 'help' };

/** What a key handler needs to know about the event. */
export interface KeyInput {
  key: string;
  shiftKey: boolean;
  ctrlKey: boolean;
  metaKey: boolean;
  altKey: boolean;
  /** The focused element, when known. */
  target?: { tagName?: string; type?: string; isContentEditable?: boolean; role?: string | null } | null;
}

/** One row of the help table. */
export interface KeyHelpRow {
  keys: string[];
  does: string;
}

export interface KeyHelpGroup {
  title: string;
  rows: KeyHelpRow[];
}

/** The help dialog's table. Keep it in step with `keyAction` (a test checks a few rows). */
export const KEY_HELP: KeyHelpGroup[] = [
  {
    title: 'Frames',
    rows: [
      { keys: ['←', '→'], does: 'One frame back / forward' },
      { keys: ['Shift + ←', 'Shift + →'], does: 'Ten frames back / forward' },
      { keys: ['Home', 'End'], does: 'First / last frame' },
      { keys: ['[', ']'], does: 'Previous / next marked gait event' },
      { keys: ['Space'], does: 'Play / pause' },
      { keys: [',', '.'], does: 'Slower / faster playback' },
    ],
  },
  {
    title: 'Marking',
    rows: [
      { keys: ['1 … 6'], does: 'Choose landmark: Shoulder, Hip, Knee, Ankle, Heel, Toe' },
      { keys: ['S'], does: 'Switch side (left / right)' },
      { keys: ['I', 'M', 'O'], does: 'Mark or unmark Initial contact / Midstance / Toe-off on this frame' },
      { keys: ['C'], does: 'Copy the points of the nearest earlier marked frame' },
      { keys: ['Delete'], does: 'Remove the selected point' },
      { keys: ['Ctrl + Z'], does: 'Undo' },
      { keys: ['Ctrl + Shift + Z', 'Ctrl + Y'], does: 'Redo' },
      { keys: ['Esc'], does: 'Deselect, or stop drawing the scale bar' },
    ],
  },
  {
    title: 'Tools and view',
    rows: [
      { keys: ['L'], does: 'Landmark tool (click to place, drag to adjust)' },
      { keys: ['P'], does: 'Pan tool (drag to move the view)' },
      { keys: ['B'], does: 'Scale bar tool (drag along an object of known length)' },
      { keys: ['+', '−'], does: 'Zoom in / out' },
      { keys: ['F'], does: 'Fit the frame to the view' },
      { keys: ['A'], does: 'Show or hide angle labels' },
      { keys: ['K'], does: 'Keep this frame as a still to share (opens Save still)' },
      { keys: ['?'], does: 'This list' },
    ],
  },
];

const NAVIGATION_KEYS = new Set(['ArrowLeft', 'ArrowRight', 'ArrowUp', 'ArrowDown', 'Home', 'End', 'PageUp', 'PageDown']);
const TEXT_INPUT_TYPES = new Set(['text', 'search', 'number', 'email', 'password', 'tel', 'url', 'date', 'time', 'datetime-local', 'month', 'week', '']);

/**
 * Whether the focused element keeps this key for itself: text fields keep every key; sliders keep
 * arrows, Home and End (they move themselves, and the page follows); buttons, links and toggles
 * keep Space and Enter.
 */
export function focusOwnsKey(input: KeyInput): boolean {
  const t = input.target;
  if (!t) return false;
  if (t.isContentEditable) return true;
  const tag = (t.tagName ?? '').toUpperCase();
  if (tag === 'TEXTAREA' || tag === 'SELECT') return true;
  if (tag === 'INPUT') {
    const type = (t.type ?? 'text').toLowerCase();
    if (TEXT_INPUT_TYPES.has(type)) return true;
    if (type === 'range') return NAVIGATION_KEYS.has(input.key);
    return input.key === ' ' || input.key === 'Enter';
  }
  if (t.role === 'slider') return NAVIGATION_KEYS.has(input.key);
  // Tabs, radio groups and menus move between their items with the arrows.
  if (t.role === 'tab' || t.role === 'radio' || t.role === 'menuitem' || t.role === 'option') {
    return NAVIGATION_KEYS.has(input.key) || input.key === ' ' || input.key === 'Enter';
  }
  if (tag === 'BUTTON' || tag === 'A' || t.role === 'button' || t.role === 'checkbox' || t.role === 'switch') {
    return input.key === ' ' || input.key === 'Enter';
  }
  return false;
}

/** The action for a key press, or null when the key is not ours (or the focus keeps it). */
export function keyAction(input: KeyInput): ReviewAction | null {
  if (focusOwnsKey(input)) return null;
  const { key, shiftKey, altKey } = input;
  const ctrl = input.ctrlKey || input.metaKey;
  if (altKey) return null;

  if (ctrl) {
    const k = key.toLowerCase();
    if (k === 'z') return shiftKey ? { type: 'redo' } : { type: 'undo' };
    if (k === 'y' && !shiftKey) return { type: 'redo' };
    // Every other Ctrl/⌘ combination stays with the browser (copy, reload, find…).
    return null;
  }

  switch (key) {
    case 'ArrowLeft':
      return { type: 'step', by: shiftKey ? -10 : -1 };
    case 'ArrowRight':
      return { type: 'step', by: shiftKey ? 10 : 1 };
    case 'Home':
      return { type: 'first' };
    case 'End':
      return { type: 'last' };
    case '[':
      return { type: 'event-jump', dir: -1 };
    case ']':
      return { type: 'event-jump', dir: 1 };
    case ' ':
      return { type: 'play' };
    case ',':
      return { type: 'speed', dir: -1 };
    case '.':
      return { type: 'speed', dir: 1 };
    case '+':
    case '=':
      return { type: 'zoom', dir: 1 };
    case '-':
    case '_':
      return { type: 'zoom', dir: -1 };
    case '?':
      return { type: 'help' };
    case 'Delete':
    case 'Backspace':
      return { type: 'delete' };
    case 'Escape':
      return { type: 'escape' };
  }
  if (/^[1-6]$/.test(key) && !shiftKey) return { type: 'landmark', index: Number(key) - 1 };

  switch (key.toLowerCase()) {
    case 's':
      return { type: 'side' };
    case 'i':
      return { type: 'mark', kind: 'initial_contact' };
    case 'm':
      return { type: 'mark', kind: 'midstance' };
    case 'o':
      return { type: 'mark', kind: 'toe_off' };
    case 'c':
      return { type: 'copy-previous' };
    case 'f':
      return { type: 'fit' };
    case 'a':
      return { type: 'angles' };
    case 'l':
      return { type: 'tool', tool: 'landmark' };
    case 'p':
      return { type: 'tool', tool: 'pan' };
    case 'b':
      return { type: 'tool', tool: 'scale' };
    case 'k':
      return { type: 'save-still' };
  }
  return null;
}
