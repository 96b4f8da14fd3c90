/**
 * The gait events on one frame in words, e.g. "Right toe-off · step 3". Pure.
 *
 * "Step n" counts that side's marks of that event from the start of the clip (the 3rd right toe-off
 * is step 3), the same numbering the Re-test comparison uses when it steps both visits together.
 */
import { GAIT_EVENT_KINDS, GAIT_EVENT_LABELS, type GaitEventKind, type GaitEventMark } from '../contracts/annotations';
import type { Side } from '../contracts/assessment';

/** One event on a frame, named. */
export interface FrameEventName {
  side: Side;
  kind: GaitEventKind;
  /** 1-based count of this side's marks of this kind up to and including this one. */
  step: number;
  /** "Right toe-off · step 3". */
  text: string;
}

const SIDE_WORD: Record<Side, string> = { left: 'Left', right: 'Right' };

/** "Right toe-off · step 3". */
export function eventName(side: Side, kind: GaitEventKind, step: number): string {
  return `${SIDE_WORD[side]} ${GAIT_EVENT_LABELS[kind].toLowerCase()} · step ${step}`;
}

/** The events marked on `frame`, left side first, each with its step number and words. */
export function eventNamesAt(events: readonly GaitEventMark[], frame: number): FrameEventName[] {
  return events
    .filter((e) => e.frame === frame)
    .sort((x, y) => (x.side === y.side ? GAIT_EVENT_KINDS.indexOf(x.kind) - GAIT_EVENT_KINDS.indexOf(y.kind) : x.side === 'left' ? -1 : 1))
    .map((e) => {
      const step = events.filter((o) => o.side === e.side && o.kind === e.kind && o.frame <= frame).length;
      return { side: e.side, kind: e.kind, step, text: eventName(e.side, e.kind, step) };
    });
}

/** All events on the frame as one line ("Left midstance · step 2, Right toe-off · step 3"), or ''. */
export function eventLineAt(events: readonly GaitEventMark[], frame: number): string {
  return eventNamesAt(events, frame)
    .map((n) => n.text)
    .join(', ');
}
