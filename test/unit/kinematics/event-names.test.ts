/**
 * Gait events on a frame in words: "Right toe-off · step 3" counts that side's toe-offs from the
 * clip's start. Events follow the REFERENCES.md timing example at 240 fps ([calc]: stride 168
 * frames, step 84, contact 60), so the n-th right toe-off is at frame 60 + 168 · (n − 1).
 */
import { describe, expect, it } from 'vitest';
import { eventLineAt, eventName, eventNamesAt } from '../../../src/kinematics';
import { ev, timingExampleEvents } from './helpers';

describe('eventNamesAt', () => {
  const events = timingExampleEvents(4);

  it('names the third right toe-off "Right toe-off · step 3" (frame 60 + 2 × 168 = 396)', () => {
    expect(eventNamesAt(events, 396)).toEqual([{ side: 'right', kind: 'toe_off', step: 3, text: 'Right toe-off · step 3' }]);
  });

  it('names the first left initial contact at frame 84 and nothing between events', () => {
    expect(eventLineAt(events, 84)).toBe('Left initial contact · step 1');
    expect(eventNamesAt(events, 85)).toEqual([]);
    expect(eventLineAt(events, 85)).toBe('');
  });

  it('lists the left side first when both sides have an event on the frame', () => {
    const both = [ev(10, 'right', 'initial_contact'), ev(4, 'left', 'midstance'), ev(10, 'left', 'toe_off'), ev(2, 'left', 'toe_off')];
    expect(eventLineAt(both, 10)).toBe('Left toe-off · step 2, Right initial contact · step 1');
  });

  it('writes the event word in lower case after the side', () => {
    expect(eventName('left', 'midstance', 7)).toBe('Left midstance · step 7');
  });
});
