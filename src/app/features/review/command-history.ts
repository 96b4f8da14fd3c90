/**
 * Undo and redo as a pair of stacks of labelled commands. The commands themselves are opaque here
 * (the review workspace stores key-level change lists); this file only keeps the order. Pure and
 * immutable: every operation returns a new history.
 */

export interface Command<C> {
  /** What the command did, for "Undo place Knee" style labels. */
  label: string;
  changes: readonly C[];
}

export interface History<C> {
  readonly past: readonly Command<C>[];
  readonly future: readonly Command<C>[];
  /** Most commands kept; the oldest fall off. */
  readonly limit: number;
}

export function createHistory<C>(limit = 200): History<C> {
  return { past: [], future: [], limit: Math.max(1, limit) };
}

/** Records a command that was just done; clears what could be redone. Empty commands are ignored. */
export function record<C>(history: History<C>, command: Command<C>): History<C> {
  if (!command.changes.length) return history;
  const past = [...history.past, command];
  return { past: past.length > history.limit ? past.slice(past.length - history.limit) : past, future: [], limit: history.limit };
}

/** Takes the last command off the past (the caller reverts it); null when there is nothing to undo. */
export function undo<C>(history: History<C>): { history: History<C>; command: Command<C> } | null {
  const command = history.past.at(-1);
  if (!command) return null;
  return { history: { past: history.past.slice(0, -1), future: [command, ...history.future], limit: history.limit }, command };
}

/** Takes the next command off the future (the caller re-applies it); null when there is nothing to redo. */
export function redo<C>(history: History<C>): { history: History<C>; command: Command<C> } | null {
  const command = history.future[0];
  if (!command) return null;
  return { history: { past: [...history.past, command], future: history.future.slice(1), limit: history.limit }, command };
}

export function canUndo(history: History<unknown>): boolean {
  return history.past.length > 0;
}

export function canRedo(history: History<unknown>): boolean {
  return history.future.length > 0;
}

/** The label of what Undo / Redo would do next, or null. */
export function nextLabels(history: History<unknown>): { undo: string | null; redo: string | null } {
  return { undo: history.past.at(-1)?.label ?? null, redo: history.future[0]?.label ?? null };
}
