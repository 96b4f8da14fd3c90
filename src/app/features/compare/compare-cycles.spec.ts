import type { FrameLandmarks, GaitEventMark } from '../../../contracts/annotations';
import { compareCycleSeries, type CycleVisit } from './compare-cycles';

/** Right landmarks on frames 0–10 (hip and a knee straight below it), one right stride 0 → 4 → 10. */
function visit(events: GaitEventMark[]): CycleVisit {
  const landmarks: FrameLandmarks[] = Array.from({ length: 11 }, (_, frame) => ({
    frame,
    side: 'right',
    points: { hip: { x: 0.5, y: 0.4 }, knee: { x: 0.5, y: 0.6 } },
  }));
  return { annotations: { landmarks, events }, frameSize: { width: 1280, height: 720 }, direction: 'left_to_right' };
}
const stride: GaitEventMark[] = [
  { frame: 0, side: 'right', kind: 'initial_contact' },
  { frame: 4, side: 'right', kind: 'toe_off' },
  { frame: 10, side: 'right', kind: 'initial_contact' },
];

describe('compareCycleSeries', () => {
  it('baseline (secondary, drawn dashed) and re-test of the chosen side', () => {
    const series = compareCycleSeries(visit(stride), visit(stride), 'right');
    expect(series.map((s) => [s.id, s.label, s.secondary ?? false])).toEqual([
      ['baseline', 'Baseline · right', true],
      ['retest', 'Re-test · right', false],
    ]);
    // A thigh straight down reads 0° all through the cycle; toe-off at 4 of 10 frames = 40 %.
    expect(series[1]!.curves.curves[0]!.mean.every((v) => Math.abs(v) < 1e-9)).toBe(true);
    expect(series[1]!.curves.toeOff!.meanPct).toBeCloseTo(40, 9);
  });

  it('nothing for a side without strides or a visit not loaded', () => {
    expect(compareCycleSeries(visit(stride), null, 'left')).toEqual([]);
    expect(compareCycleSeries(null, visit([]), 'right')).toEqual([]);
  });
});
