/**
 * Gait events: validation in words, stances / flights / steps / strides, and the frame clock.
 * The timing layout is the REFERENCES.md worked example ([calc]) at 240 fps.
 */
import { describe, expect, it } from 'vitest';
import {
  buildGaitCycles,
  eventWarnings,
  makeFrameClock,
  MAX_EVENT_PROBLEMS,
  secondsBetween,
  validateEvents,
} from '../../../src/kinematics';
import { ev, timingExampleEvents } from './helpers';

describe('validateEvents', () => {
  it('accepts a clean sequence, one that starts mid-cycle, and midstance inside stance', () => {
    expect(validateEvents(timingExampleEvents(3), 1000)).toEqual([]);
    expect(validateEvents([ev(10, 'left', 'toe_off'), ev(40, 'left', 'initial_contact'), ev(60, 'left', 'midstance')], 100)).toEqual([]);
    expect(validateEvents([ev(5, 'right', 'midstance'), ev(30, 'right', 'toe_off')], 100)).toEqual([]);
    expect(validateEvents([], 0)).toEqual([]);
  });

  it('lists the same frame twice for one side', () => {
    expect(validateEvents([ev(12, 'right', 'initial_contact'), ev(12, 'right', 'toe_off')], 100)).toEqual([
      'Right side has two events on frame 12 (toe-off and initial contact); one side can have only one event per frame.',
    ]);
    expect(validateEvents([ev(12, 'left', 'initial_contact'), ev(12, 'left', 'initial_contact')], 100)).toEqual([
      'Left initial contact is marked twice on frame 12.',
    ]);
    // Different sides on one frame are fine.
    expect(validateEvents([ev(12, 'left', 'toe_off'), ev(12, 'right', 'initial_contact')], 100)).toEqual([]);
  });

  it('lists two initial contacts without a toe-off between, and two toe-offs without an initial contact between', () => {
    expect(validateEvents([ev(0, 'right', 'initial_contact'), ev(168, 'right', 'initial_contact')], 1000)).toEqual([
      'Right side: two initial contacts (frames 0 and 168) without a toe-off between.',
    ]);
    expect(validateEvents([ev(60, 'left', 'toe_off'), ev(228, 'left', 'toe_off')], 1000)).toEqual([
      'Left side: two toe-offs (frames 60 and 228) without an initial contact between.',
    ]);
  });

  it('lists midstance in swing and two midstances in one stance', () => {
    expect(validateEvents([ev(0, 'right', 'initial_contact'), ev(60, 'right', 'toe_off'), ev(100, 'right', 'midstance')], 1000)).toEqual([
      'Right midstance at frame 100 falls after toe-off (frame 60) and before the next initial contact: midstance belongs inside a stance.',
    ]);
    expect(
      validateEvents(
        [ev(0, 'right', 'initial_contact'), ev(20, 'right', 'midstance'), ev(30, 'right', 'midstance'), ev(60, 'right', 'toe_off')],
        1000,
      ),
    ).toEqual(['Right side: two midstances in one stance (frames 20 and 30).']);
  });

  it('lists frames outside the clip, fractional frames and unknown kinds — returns, never throws', () => {
    const bad = [
      ev(-1, 'left', 'toe_off'),
      ev(100, 'left', 'toe_off'),
      ev(2.5, 'right', 'initial_contact'),
      { frame: 3, side: 'up', kind: 'jump' } as never,
    ];
    const problems = validateEvents(bad, 100);
    expect(problems).toEqual([
      'Left toe-off at frame -1 is outside the clip (frames 0–99).',
      'Left toe-off at frame 100 is outside the clip (frames 0–99).',
      'Right initial contact at frame 2.5: the frame must be a whole number.',
      'Unknown gait event {"side":"up","kind":"jump"}: side must be left or right, kind initial_contact, midstance or toe_off.',
    ]);
    expect(validateEvents([ev(5000, 'left', 'toe_off')], Number.POSITIVE_INFINITY)).toEqual([]);
  });

  it(`caps the list at ${MAX_EVENT_PROBLEMS} messages plus a count`, () => {
    const many = Array.from({ length: 80 }, (_, i) => ev(1000 + i, 'left', 'toe_off'));
    const p = validateEvents(many, 10);
    expect(p).toHaveLength(MAX_EVENT_PROBLEMS + 1);
    expect(p.at(-1)).toBe('…and 30 more problems.');
  });
});

describe('buildGaitCycles — [calc] worked example, REFERENCES.md (stride 168, step 84, contact 60 frames)', () => {
  const c = buildGaitCycles(timingExampleEvents(2));
  it('finds stances IC→TO, flights TO→other IC, steps IC→other IC, strides IC→same IC', () => {
    expect(c.stances.map((s) => [s.side, s.icFrame, s.toFrame])).toEqual([
      ['right', 0, 60],
      ['left', 84, 144],
      ['right', 168, 228],
      ['left', 252, 312],
    ]);
    expect(c.flights.map((f) => [f.fromSide, f.toFrame, f.icFrame])).toEqual([
      ['right', 60, 84],
      ['left', 144, 168],
      ['right', 228, 252],
      ['left', 312, 336],
    ]);
    expect(c.steps.map((s) => [s.fromSide, s.side, s.icFrame, s.nextIcFrame])).toEqual([
      ['right', 'left', 0, 84],
      ['left', 'right', 84, 168],
      ['right', 'left', 168, 252],
      ['left', 'right', 252, 336],
    ]);
    expect(c.strides.map((s) => [s.side, s.icFrame, s.toFrame, s.nextIcFrame])).toEqual([
      ['right', 0, 60, 168],
      ['left', 84, 144, 252],
      ['right', 168, 228, 336],
    ]);
    expect(c.excluded).toEqual([]);
  });

  it('keeps a midstance inside its stance, and steps when only initial contacts are marked', () => {
    const m = buildGaitCycles([...timingExampleEvents(1), ev(30, 'right', 'midstance')]);
    expect(m.stances[0]!.midstanceFrame).toBe(30);
    const icOnly = buildGaitCycles(timingExampleEvents(2).filter((e) => e.kind === 'initial_contact'));
    expect(icOnly.steps).toHaveLength(4);
    expect(icOnly.strides).toHaveLength(0); // a stride needs its toe-off
  });

  it('leaves out a stride where a cycle of its side is unmarked (the other side lands twice inside)', () => {
    const events = timingExampleEvents(3).filter((e) => !(e.side === 'right' && (e.frame === 168 || e.frame === 228)));
    const g = buildGaitCycles(events);
    expect(g.strides.map((s) => [s.side, s.icFrame])).toEqual([
      ['left', 84],
      ['left', 252],
      ['right', 336],
    ]);
    expect(g.excluded[0]).toMatch(/^Right stride at frames 0–336 left out: the left side lands 2 times inside it/);
    // Steps across the gap are not clean either (left's own toe-off sits between), so none spans it.
    expect(g.steps.every((s) => s.nextIcFrame - s.icFrame === 84)).toBe(true);
  });

  it('leaves out a step or stride far longer than the median (a contact unmarked, only one side marked)', () => {
    const right = timingExampleEvents(5).filter((e) => e.side === 'right' && !(e.frame === 504 || e.frame === 564));
    const g = buildGaitCycles(right);
    expect(g.strides.map((s) => s.nextIcFrame - s.icFrame)).toEqual([168, 168, 168]);
    expect(g.excluded.join(' ')).toMatch(
      /Right stride at frames 336–672 left out: 336 frames is more than 1\.5 × the median stride \(168 frames\)/,
    );
  });

  it('warns about stance overlap (double support) and same-frame contacts of both sides', () => {
    const w = eventWarnings([
      ev(0, 'right', 'initial_contact'),
      ev(60, 'right', 'toe_off'),
      ev(40, 'left', 'initial_contact'),
      ev(100, 'left', 'toe_off'),
    ]);
    expect(w).toEqual([
      'Left and right stance overlap at frames 40–60 (both feet down). Running has no double support: check the sides of those events.',
    ]);
    expect(eventWarnings([ev(5, 'right', 'initial_contact'), ev(5, 'left', 'initial_contact')])[0]).toBe(
      'Left and right initial contact are both on frame 5.',
    );
    expect(eventWarnings(timingExampleEvents(2))).toEqual([]);
  });
});

describe('makeFrameClock', () => {
  it('[calc] 168 frames at 240 fps = 0.700 s, from fps', () => {
    const c = makeFrameClock(240);
    expect(c.source).toBe('fps');
    expect(secondsBetween(c, 0, 168)).toBeCloseTo(0.7, 12);
  });
  it('uses per-frame timestamps when they cover the frames and increase', () => {
    const ts = Array.from({ length: 200 }, (_, i) => i * 5); // 200 fps in the file
    const c = makeFrameClock(240, ts, 199);
    expect(c.source).toBe('timestamps');
    expect(secondsBetween(c, 0, 100)).toBeCloseTo(0.5, 12);
  });
  it('falls back to fps, saying why, when timestamps are short or not increasing', () => {
    expect(makeFrameClock(240, [0, 4, 8], 10).fallbackReason).toBe('timestamps cover frames 0–2 but events or landmarks reach frame 10');
    expect(makeFrameClock(240, [0, 4, 4, 12], 3).fallbackReason).toBe(
      "timestamp of frame 2 is not a finite number later than the previous frame's",
    );
    expect(makeFrameClock(240, [], 3).source).toBe('fps');
  });
});
