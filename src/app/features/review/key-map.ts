/**
 * The review workspace's keyboard map (our own), the help table built from it, and the dispatch
 * from a key event to an action. Pure: the page turns actions into edits and moves.
 */
import type { GaitEventKind } from '../../../contracts/annotations';
import { FocusTarget, pageTakesKey } from '../../shared/keys/key-routing';

export type ReviewTool = 'landmark' | 'pan' | 'scale' | 'gauge';

export type ReviewAction =
  | { type: 'step'; by: number }
  | { type: 'first' }
  | { type: 'last' }
  | { type: 'event-jump'; dir: -1 | 1 }
  | { type: 'check-jump'; dir: -1 | 1 }
  | { type: 'play' }
  | { type: 'speed'; dir: -1 | 1 }
  | { type: 'zoom'; dir: -1 | 1 }
  | { type: 'fit' }
  | { type: 'angles' }
  | { type: 'landmark'; index: number }
  | { type: 'side' }
  | { type: 'mark'; kind: GaitEventKind }
  | { type: 'copy-previous' }
  | { type: 'follow' }
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
  target?: FocusTarget | null;
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
      { keys: ['↑', '↓'], does: 'Move between tabs or options of the focused control (← → keep stepping frames)' },
    ],
  },
  {
    title: 'Marking',
    rows: [
      { keys: ['1 … 6'], does: 'Choose landmark: Shoulder, Hip, Knee, Ankle, Heel, Toe' },
      { keys: ['S'], does: 'Switch side (left / right)' },
      { keys: ['I', 'M', 'O'], does: 'Mark or unmark Initial contact / Midstance / Toe-off on this frame' },
      { keys: ['C'], does: 'Copy the points of the nearest earlier marked frame' },
      { keys: ['T'], does: "Follow markers: follow this frame's landmarks over the chosen frames (the whole clip by default)" },
      { keys: ['N', 'Shift + N'], does: 'Next / previous frame to check: a marker following could not follow there' },
      { keys: ['Delete'], does: 'Remove the selected point or angle gauge' },
      { keys: ['Ctrl + Z'], does: 'Undo' },
      { keys: ['Ctrl + Shift + Z', 'Ctrl + Y'], does: 'Redo' },
      { keys: ['Esc'], does: 'Deselect, or stop drawing the scale bar or an angle gauge' },
    ],
  },
  {
    title: 'Tools and view',
    rows: [
      { keys: ['L'], does: 'Landmark tool (click to place, drag to adjust)' },
      { keys: ['P'], does: 'Pan tool (drag to move the view)' },
      { keys: ['B'], does: 'Scale bar tool (drag along an object of known length)' },
      { keys: ['G'], does: 'Angle gauge: three clicks measure any angle (end, vertex, end); drag a point to adjust' },
      { keys: ['+', '−'], does: 'Zoom in / out' },
      { keys: ['Ctrl + wheel', '⌘ + wheel', 'Pinch'], does: 'Zoom around the pointer (the wheel alone scrolls the page)' },
      { keys: ['F'], does: 'Fit the frame to the view' },
      { keys: ['A'], does: 'Show or hide angle labels' },
      { keys: ['K'], does: 'Keep this frame as a still to share (opens Save still)' },
      { keys: ['?'], does: 'This list' },
    ],
  },
];

/**
 * The frame keys of the Frames group: outside text fields they always move frames, whatever
 * control was clicked last (see `shared/keys/key-routing.ts`).
 */
export const FRAME_KEYS: ReadonlySet<string> = new Set(['ArrowLeft', 'ArrowRight', 'Home', 'End', '[', ']', ' ', ',', '.']);

/**
 * Whether the focused element keeps this key for itself: text fields keep every key; otherwise the
 * frame keys are the page's, and other keys stay with a control that uses them (Up/Down in tabs,
 * toggle groups and the slider; Space/Enter on a button reached with the keyboard).
 */
export function focusOwnsKey(input: KeyInput): boolean {
  return !pageTakesKey(input.key, input.target, FRAME_KEYS);
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
    case 't':
      return { type: 'follow' };
    case 'n':
      return { type: 'check-jump', dir: shiftKey ? -1 : 1 };
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
    case 'g':
      return { type: 'tool', tool: 'gauge' };
    case 'k':
      return { type: 'save-still' };
  }
  return null;
}
