/**
 * Proposals merged into a clip's events: nothing placed or accepted changes. Frames are hand-made
 * (100 fps: the 0.1 s clearance is 10 frames).
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import type { GaitEventMark } from '../../../src/contracts/annotations';
import { mergeProposals } from '../../../src/kinematics/proposal-merge';
import { ev } from './helpers';

describe('mergeProposals', () => {
  it('adds proposals as proposed, replaces older proposals, keeps placed and accepted events', () => {
    const existing: GaitEventMark[] = [
      { ...ev(10, 'right', 'initial_contact'), origin: 'placed' },
      { ...ev(40, 'right', 'toe_off'), origin: 'accepted' },
      { ...ev(200, 'left', 'toe_off'), origin: 'proposed' },
    ];
    const proposals = [ev(11, 'right', 'initial_contact'), ev(94, 'right', 'initial_contact'), ev(124, 'right', 'toe_off')];
    const m = mergeProposals(existing, proposals, 100, 1000);
    expect(m.events).toEqual([
      { ...ev(10, 'right', 'initial_contact'), origin: 'placed' },
      { ...ev(40, 'right', 'toe_off'), origin: 'accepted' },
      { ...ev(94, 'right', 'initial_contact'), origin: 'proposed' },
      { ...ev(124, 'right', 'toe_off'), origin: 'proposed' },
    ]);
    expect(m.added).toBe(2);
    expect(m.skipped).toEqual(['Right initial contact at frame 11: next to the initial contact placed at frame 10.']);
  });

  it('leaves out a proposal that would break the order of the events around it', () => {
    // Placed: contact 10, toe-off 40, contact 94. A proposed contact at 60 would make two contacts in a row.
    const existing = [ev(10, 'left', 'initial_contact'), ev(40, 'left', 'toe_off'), ev(94, 'left', 'initial_contact')];
    const m = mergeProposals(existing, [ev(60, 'left', 'initial_contact')], 100, 1000);
    expect(m.added).toBe(0);
    expect(m.skipped).toEqual(['Left initial contact at frame 60: it would break the order of the events marked around it.']);
  });

  it('property: every placed or accepted event survives unchanged and nothing is doubled', () => {
    const mark = fc.record({
      frame: fc.integer({ min: 0, max: 300 }),
      side: fc.constantFrom('left' as const, 'right' as const),
      kind: fc.constantFrom('initial_contact' as const, 'toe_off' as const),
      origin: fc.constantFrom('placed' as const, 'accepted' as const, 'proposed' as const),
    });
    fc.assert(
      fc.property(fc.array(mark, { maxLength: 12 }), fc.array(mark, { maxLength: 12 }), (existing, proposals) => {
        const m = mergeProposals(existing, proposals, 100, 400);
        for (const e of existing.filter((x) => x.origin !== 'proposed')) expect(m.events).toContainEqual(e);
        expect(m.events.filter((e) => e.origin === 'proposed').length).toBe(m.added);
        expect(m.added + m.skipped.length).toBe(proposals.length);
      }),
    );
  });
});
