import type { FrameLandmarks, GaitEventMark, NotFollowedPoint } from '../../../contracts/annotations';
import { eventsMissingMarkers, framesToCheck, missingOnFrame, nextToCheck } from './not-followed';

// Hand-made lists [calc]: every expected value is read off the rows below.
const notFollowed: NotFollowedPoint[] = [
  { frame: 12, side: 'right', landmark: 'ankle', reason: 'not_found' },
  { frame: 13, side: 'right', landmark: 'ankle', reason: 'broke_links' },
  { frame: 13, side: 'right', landmark: 'heel', reason: 'on_other_marker' },
  { frame: 20, side: 'right', landmark: 'ankle', reason: 'not_found' },
  { frame: 4, side: 'left', landmark: 'knee', reason: 'not_found' },
];

describe('frames to check after following', () => {
  it('lists the open frames once each, ascending, with a summary per marker', () => {
    const c = framesToCheck(notFollowed, []);
    expect(c.frames).toEqual([4, 12, 13, 20]);
    expect(c.markers.map((m) => m.text)).toEqual([
      'Left knee not followed on 1 frame — check it',
      'Right ankle not followed on 3 frames — check them',
      'Right heel not followed on 1 frame — check it',
    ]);
    expect(c.markers[1]!.frames).toEqual([12, 13, 20]);
  });

  it('drops a frame at once when the marker is placed or accepted there by hand; a followed or proposed point does not count', () => {
    const landmarks: FrameLandmarks[] = [
      { frame: 12, side: 'right', points: { ankle: { x: 0.5, y: 0.7 } } },
      { frame: 13, side: 'right', points: { ankle: { x: 0.5, y: 0.7, origin: 'accepted', confidence: 0.9 } } },
      { frame: 20, side: 'right', points: { ankle: { x: 0.5, y: 0.7, origin: 'followed', confidence: 0.9 } } },
      { frame: 4, side: 'left', points: { knee: { x: 0.5, y: 0.5, origin: 'proposed', confidence: 0.9 } } },
      // The other side's ankle placed on frame 20 does not check the right one.
      { frame: 20, side: 'left', points: { ankle: { x: 0.4, y: 0.7 } } },
    ];
    const c = framesToCheck(notFollowed, landmarks);
    expect(c.points.map((p) => `${p.frame} ${p.side} ${p.landmark}`)).toEqual(['4 left knee', '13 right heel', '20 right ankle']);
    expect(c.frames).toEqual([4, 13, 20]);
  });

  it('is empty for a copy without the list (an older server) or an empty one', () => {
    expect(framesToCheck(undefined, [])).toEqual({ points: [], frames: [], markers: [] });
    expect(nextToCheck([], 3)).toBeNull();
  });

  it('steps to the next frame to check, and back, wrapping round; none when the only one is shown', () => {
    const frames = [4, 12, 13, 20];
    expect(nextToCheck(frames, 0)).toBe(4);
    expect(nextToCheck(frames, 12)).toBe(13);
    expect(nextToCheck(frames, 20)).toBe(4);
    expect(nextToCheck(frames, 25)).toBe(4);
    expect(nextToCheck(frames, 12, -1)).toBe(4);
    expect(nextToCheck(frames, 4, -1)).toBe(20);
    expect(nextToCheck([7], 7)).toBeNull();
    expect(nextToCheck([7], 2)).toBe(7);
  });

  it('says what to place on the frame shown and why, in words', () => {
    const here = missingOnFrame(framesToCheck(notFollowed, []), 13);
    expect(here.map((m) => m.text)).toEqual([
      'Right ankle needs placing: what was found sat too far from the other markers of the same thigh, shank or foot to be this marker.',
      'Right heel needs placing: what was found was another marker.',
    ]);
    expect(missingOnFrame(framesToCheck(notFollowed, []), 5)).toEqual([]);
  });

  it('names the gait events of the same side on such frames, whose measures leave that step out', () => {
    const events: GaitEventMark[] = [
      { frame: 13, side: 'right', kind: 'toe_off' },
      { frame: 13, side: 'left', kind: 'initial_contact' },
      { frame: 4, side: 'left', kind: 'initial_contact', origin: 'proposed' },
      { frame: 30, side: 'right', kind: 'initial_contact' },
    ];
    expect(eventsMissingMarkers(framesToCheck(notFollowed, []), events)).toEqual([
      'Left initial contact on frame 4: no knee — measures that need it leave this step out until you place it.',
      'Right toe-off on frame 13: no ankle and heel — measures that need them leave this step out until you place them.',
    ]);
  });
});
