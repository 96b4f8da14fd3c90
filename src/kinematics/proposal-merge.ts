/**
 * Proposed gait events merged into the events a clip already has. Pure.
 *
 * Nothing a person placed or accepted is changed: earlier proposals not yet accepted are replaced
 * by the new ones; a proposal next to a placed or accepted event of its side (within
 * {@link PROPOSAL_CLEARANCE_S}) is left out, as is one that would add a problem to that side's order
 * (contact → toe-off → contact …, as `validateEvents` checks it).
 */
import { GAIT_EVENT_LABELS, type GaitEventMark } from '../contracts/annotations';
import type { Side } from '../contracts/assessment';
import { sortEvents, validateEvents } from './events';

/** A proposal this close (seconds) to a kept event of its side is left out: the coach has marked it. */
export const PROPOSAL_CLEARANCE_S = 0.1;

/** What {@link mergeProposals} made. */
export interface ProposalMerge {
  /** The clip's events: kept ones and the added proposals (origin `proposed`), in frame order. */
  events: GaitEventMark[];
  /** How many proposals were added. */
  added: number;
  /** Proposals left out, in words. */
  skipped: string[];
}

const SIDE_WORD: Record<Side, string> = { left: 'Left', right: 'Right' };
const ORIGIN_WORD = { placed: 'placed', accepted: 'accepted', proposed: 'proposed' } as const;

/**
 * Merges `proposals` into `existing` (see the file header). `frameCount` bounds frames as in
 * `validateEvents`; `fps` turns the clearance into frames (at least 1).
 */
export function mergeProposals(
  existing: readonly GaitEventMark[],
  proposals: readonly GaitEventMark[],
  fps: number,
  frameCount: number,
): ProposalMerge {
  const kept = existing.filter((e) => e.origin !== 'proposed');
  const clearance = Math.max(1, Math.round(PROPOSAL_CLEARANCE_S * (Number.isFinite(fps) && fps > 0 ? fps : 30)));
  const out: GaitEventMark[] = [...kept];
  const skipped: string[] = [];
  let added = 0;
  for (const p of sortEvents(proposals)) {
    const what = `${SIDE_WORD[p.side]} ${GAIT_EVENT_LABELS[p.kind].toLowerCase()} at frame ${p.frame}`;
    const near = kept.find((e) => e.side === p.side && Math.abs(e.frame - p.frame) <= clearance);
    if (near) {
      skipped.push(
        `${what}: next to the ${GAIT_EVENT_LABELS[near.kind].toLowerCase()} ${ORIGIN_WORD[near.origin ?? 'placed']} at frame ${near.frame}.`,
      );
      continue;
    }
    const mark: GaitEventMark = { frame: p.frame, side: p.side, kind: p.kind, origin: 'proposed' };
    const side = out.filter((e) => e.side === p.side);
    if (validateEvents([...side, mark], frameCount).length > validateEvents(side, frameCount).length) {
      skipped.push(`${what}: it would break the order of the events marked around it.`);
      continue;
    }
    out.push(mark);
    added++;
  }
  return { events: sortEvents(out), added, skipped };
}
