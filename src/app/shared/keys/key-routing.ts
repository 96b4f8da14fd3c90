/**
 * Who gets a key press on a keyboard-first page (the review workspace, the Re-test comparison):
 * the page or the focused control. Pure.
 *
 * The rule: while the focus is not in a text field, the page's frame keys (arrows, Home/End, its
 * step keys) always move frames — a speed toggle, a side tab or a button clicked a moment ago does
 * not swallow them. Text fields keep every key. Space and Enter stay with a button, toggle or tab
 * that was reached with the keyboard (focus ring showing), so keyboard users can still press it;
 * after a mouse click, Space belongs to the page again. Keys that are not frame keys go to the
 * focused control when it uses them (Up/Down in tabs, toggle groups and sliders; Space/Enter on
 * buttons) and to the page otherwise.
 */

/** What the routing needs to know about the focused element. */
export interface FocusTarget {
  tagName?: string;
  /** `type` of an input. */
  type?: string;
  isContentEditable?: boolean;
  role?: string | null;
  /** Whether the focus ring shows (reached with the keyboard, not by a click): `:focus-visible`. */
  focusVisible?: boolean;
}

/** Keys that move inside tabs, toggle groups, menus, listboxes and sliders. */
const NAVIGATION_KEYS = new Set(['ArrowLeft', 'ArrowRight', 'ArrowUp', 'ArrowDown', 'Home', 'End', 'PageUp', 'PageDown']);
/** Input types that take typing. */
const TEXT_INPUT_TYPES = new Set([
  'text',
  'search',
  'number',
  'email',
  'password',
  'tel',
  'url',
  'date',
  'time',
  'datetime-local',
  'month',
  'week',
  '',
]);
/** Roles of fields that take typing or type-ahead (a Material select is a combobox). */
const TEXT_ROLES = new Set(['textbox', 'searchbox', 'combobox', 'spinbutton']);
/** Roles of items inside a composite widget that moves with the arrows. */
const COMPOSITE_ITEM_ROLES = new Set(['tab', 'radio', 'menuitem', 'menuitemradio', 'menuitemcheckbox', 'option', 'treeitem', 'gridcell']);
/** Roles of things pressed with Space or Enter. */
const PRESSABLE_ROLES = new Set(['button', 'checkbox', 'switch', 'link', ...COMPOSITE_ITEM_ROLES]);

const tagOf = (t: FocusTarget) => (t.tagName ?? '').toUpperCase();
const roleOf = (t: FocusTarget) => (t.role ?? '').toLowerCase();

/** Whether the element takes typing: every key stays with it. */
export function isTextField(t: FocusTarget | null | undefined): boolean {
  if (!t) return false;
  if (t.isContentEditable) return true;
  const tag = tagOf(t);
  if (tag === 'TEXTAREA' || tag === 'SELECT') return true;
  if (tag === 'INPUT' && TEXT_INPUT_TYPES.has((t.type ?? 'text').toLowerCase())) return true;
  return TEXT_ROLES.has(roleOf(t));
}

/** Whether the element is a slider (moves with the arrows). */
function isSlider(t: FocusTarget): boolean {
  return (tagOf(t) === 'INPUT' && (t.type ?? '').toLowerCase() === 'range') || roleOf(t) === 'slider';
}

/** Whether Space or Enter presses the element (buttons, links, toggles, tabs, checkboxes…). */
export function isPressable(t: FocusTarget): boolean {
  const tag = tagOf(t);
  if (tag === 'BUTTON' || tag === 'A' || tag === 'SUMMARY') return true;
  if (tag === 'INPUT') return ['button', 'submit', 'reset', 'checkbox', 'radio', 'image'].includes((t.type ?? '').toLowerCase());
  return PRESSABLE_ROLES.has(roleOf(t));
}

/**
 * Whether the page (not the focused control) handles `key`. `frameKeys` are the page's frame keys
 * (see the file header); other keys go to the page unless the focused control uses them.
 */
export function pageTakesKey(key: string, target: FocusTarget | null | undefined, frameKeys: ReadonlySet<string>): boolean {
  if (!target) return true;
  if (isTextField(target)) return false;
  const press = key === ' ' || key === 'Enter';
  if (frameKeys.has(key)) return !(press && target.focusVisible && isPressable(target));
  if (isSlider(target)) return !NAVIGATION_KEYS.has(key);
  if (COMPOSITE_ITEM_ROLES.has(roleOf(target))) return !(NAVIGATION_KEYS.has(key) || press);
  if (isPressable(target)) return !press;
  return true;
}
