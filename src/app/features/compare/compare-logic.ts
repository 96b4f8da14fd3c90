import type { FrameLandmarks, FramePoint, GaitEventKind, GaitEventMark, LandmarkName } from '../../../contracts/annotations';
import type { Assessment } from '../../../contracts/api';
import type { Side } from '../../../contracts/assessment';
import type { ComparisonRow, ComparisonVerdict, MeasureKey, MeasureTrends } from '../../../contracts/measures';
import { VERDICT_LABELS, thresholdText, verdictText as verdictWords } from '../../../kinematics/comparison';
import { formatValue as formatMeasureValue } from '../../../kinematics/format';
import { MEASURES_CAUTION } from '../../shared/caution';

/** Words of each verdict, as the table shows them (the kinematics module's, shared with the PDF). */
export const VERDICT_TEXT: Record<ComparisonVerdict, string> = VERDICT_LABELS;

/** The verdict with its direction or step counts ("Beyond measurement error · better"). */
export const verdictText = verdictWords;

/** The caution line of the Re-test comparison and the Shared tab. */
export const CAUTION_LINE = MEASURES_CAUTION;

/** The default pair: latest Re-test against latest Baseline (assessments in any order). */
export function defaultPair(assessments: Assessment[]): { baseline: number | null; retest: number | null } {
  const newest = [...assessments].sort((a, b) => (a.date === b.date ? b.id - a.id : a.date < b.date ? 1 : -1));
  return {
    baseline: newest.find((a) => a.kind === 'baseline')?.id ?? null,
    retest: newest.find((a) => a.kind === 'retest')?.id ?? null,
  };
}

/** Frames of one side's events of one kind, in time order. */
export function eventFrames(events: GaitEventMark[], side: Side, kind: GaitEventKind): number[] {
  return events
    .filter((e) => e.side === side && e.kind === kind)
    .map((e) => e.frame)
    .sort((a, b) => a - b);
}

/** The frame of step `step` (0-based), clamped to the last marked one; null when none. */
export function frameOfStep(frames: number[], step: number): number | null {
  if (!frames.length) return null;
  return frames[Math.max(0, Math.min(step, frames.length - 1))]!;
}

/** The highest step both clips have (0-based); -1 when either has none. */
export function lastCommonStep(a: number[], b: number[]): number {
  return Math.min(a.length, b.length) - 1;
}

/**
 * Keys that step both visits together; outside text fields they always do, whatever control was
 * clicked last (see `shared/keys/key-routing.ts`).
 */
export const COMPARE_FRAME_KEYS: ReadonlySet<string> = new Set(['[', ']', 'ArrowLeft', 'ArrowRight', 'Home', 'End']);

/** Steps to move for a key: [ or ← previous, ] or → next, Home first, End last (±Infinity); 0 otherwise. */
export function stepKey(key: string): number {
  switch (key) {
    case '[':
    case 'ArrowLeft':
      return -1;
    case ']':
    case 'ArrowRight':
      return 1;
    case 'Home':
      return -Infinity;
    case 'End':
      return Infinity;
    default:
      return 0;
  }
}

/** Rows (both sides) of landmarks on one frame. */
export function landmarksAt(rows: FrameLandmarks[], frame: number): FrameLandmarks[] {
  return rows.filter((r) => r.frame === frame);
}

/**
 * Moves a skeleton (frame fractions) so its `side` hip lands on `target` (frame fractions); the
 * other side moves with it. Without that hip the rows come back unchanged.
 */
export function alignAtHip(rows: FrameLandmarks[], side: Side, target: FramePoint | null): FrameLandmarks[] {
  const hip = rows.find((r) => r.side === side)?.points.hip;
  if (!hip || !target) return rows;
  const dx = target.x - hip.x;
  const dy = target.y - hip.y;
  return rows.map((r) => ({
    ...r,
    points: Object.fromEntries(Object.entries(r.points).map(([name, p]) => [name, p ? { x: p.x + dx, y: p.y + dy } : p])) as Partial<
      Record<LandmarkName, FramePoint>
    >,
  }));
}

/**
 * A number with its unit, signed for changes: "+7.0°", "−2 steps/min", "—" when missing — the one
 * formatter of `src/kinematics/format.ts` (the same text as the overlay, the panel and the PDF).
 */
export function formatValue(value: number | null, unit: string, signed = false): string {
  return formatMeasureValue(value, unit, { signed });
}

/** The citation line shown on hover/expand: the threshold, and why a direction is better where one is. */
export function citationText(row: ComparisonRow): string {
  const better = row.betterDirection
    ? ` Better: ${row.betterDirection.better} (${row.betterDirection.source} [${row.betterDirection.evidence}]).`
    : '';
  if (!row.threshold) return `No published measurement-error figure for this measure.${better}`;
  return `${thresholdText(row.threshold)} — ${row.threshold.derivation} Source: ${row.threshold.source} [${row.threshold.evidence}].${better}`;
}

export const sideText = (side: Side | null): string => (side === null ? '' : side === 'left' ? 'Left' : 'Right');

/** A measure's name with its side, one bracket pair (shared with the visit summary PDF). */
export { sidedLabel } from '../../../kinematics/format';

/** One line per chosen key and side across the visits (null where a visit lacks it). */
export function trendSeries(
  trends: MeasureTrends,
  keys: MeasureKey[],
): { key: MeasureKey; side: Side | null; values: (number | null)[] }[] {
  const ids = new Map<string, { key: MeasureKey; side: Side | null }>();
  for (const p of trends.points)
    for (const v of p.values) if (keys.includes(v.key)) ids.set(`${v.key}|${v.side ?? ''}`, { key: v.key, side: v.side });
  return [...ids.values()].map(({ key, side }) => ({
    key,
    side,
    values: trends.points.map((p) => p.values.find((v) => v.key === key && v.side === side)?.mean ?? null),
  }));
}
