import type { ClipAnnotations } from '../../../contracts/annotations';
import type { Direction, Side } from '../../../contracts/assessment';
import { gaitCycleCurves } from '../../../kinematics/gait-cycle';
import type { CycleChartSeries } from '../../shared/gait-cycle-chart/gait-cycle-chart-data';

/** A visit's clip as the comparison loaded it: annotations, frame size and running direction. */
export interface CycleVisit {
  annotations: Pick<ClipAnnotations, 'landmarks' | 'events'>;
  frameSize: { width: number; height: number };
  direction: Direction;
}

/**
 * The gait-cycle curves of one side for the baseline (drawn dashed and lighter, as the baseline
 * skeleton) and the re-test: one series per visit that has the side's curves.
 */
export function compareCycleSeries(baseline: CycleVisit | null, retest: CycleVisit | null, side: Side): CycleChartSeries[] {
  const word = side === 'left' ? 'left' : 'right';
  const of = (v: CycleVisit | null) =>
    v && v.frameSize.width > 0 && v.frameSize.height > 0
      ? gaitCycleCurves(v.annotations.landmarks, v.annotations.events, { frameSize: v.frameSize, direction: v.direction })[side]
      : null;
  const out: CycleChartSeries[] = [];
  const b = of(baseline);
  if (b) out.push({ id: 'baseline', label: `Baseline · ${word}`, side, curves: b, secondary: true, markerLabel: 'TO baseline' });
  const r = of(retest);
  if (r) out.push({ id: 'retest', label: `Re-test · ${word}`, side, curves: r, markerLabel: 'TO re-test' });
  return out;
}
