import type { GaitEventMark } from '../contracts/annotations';

/** A Baseline frame and the Re-test frame shown beside it at the same moment of the step. */
export type ContactPair = readonly [baselineFrame: number, retestFrame: number];

/**
 * Pairs the Baseline's initial contacts with the Re-test's, in time order: each Baseline contact
 * goes with the next unused Re-test contact of the same side (so a left contact never lines up
 * with a right one, and a step missing in one visit skips rather than shifts the rest). Pure.
 */
export function pairInitialContacts(baseline: readonly GaitEventMark[], retest: readonly GaitEventMark[]): ContactPair[] {
  const contacts = (events: readonly GaitEventMark[]) =>
    events.filter((e) => e.kind === 'initial_contact').sort((a, b) => a.frame - b.frame || a.side.localeCompare(b.side));
  const later = contacts(retest);
  const pairs: ContactPair[] = [];
  let from = 0;
  for (const b of contacts(baseline)) {
    const j = later.findIndex((r, k) => k >= from && r.side === b.side);
    if (j < 0) break;
    const last = pairs[pairs.length - 1];
    // Both timelines only move forward: a pair that would not is skipped.
    if (!last || (b.frame > last[0] && later[j]!.frame > last[1])) pairs.push([b.frame, later[j]!.frame]);
    from = j + 1;
  }
  return pairs;
}

/**
 * The Re-test frame to show beside Baseline frame `b`, time-warped per step so that every paired
 * initial contact lines up exactly. Between two pairs (B₀,R₀) and (B₁,R₁) the Re-test runs
 * linearly: r = R₀ + (b − B₀)·(R₁ − R₀)/(B₁ − B₀). Before the first and after the last pair it runs
 * at real-time speed: r = R + (b − B)·`rateRatio` (Re-test fps ÷ Baseline fps). The result is
 * rounded to the nearest frame and kept within 0…`retestFrameCount` − 1. Pure.
 */
export function warpToRetest(pairs: readonly ContactPair[], rateRatio: number, retestFrameCount: number, b: number): number {
  if (pairs.length === 0) throw new RangeError('no initial contacts to line up');
  let r: number;
  const first = pairs[0]!;
  const last = pairs[pairs.length - 1]!;
  if (b <= first[0]) r = first[1] + (b - first[0]) * rateRatio;
  else if (b >= last[0]) r = last[1] + (b - last[0]) * rateRatio;
  else {
    let k = 0;
    while (pairs[k + 1]![0] < b) k++;
    const [b0, r0] = pairs[k]!;
    const [b1, r1] = pairs[k + 1]!;
    r = r0 + ((b - b0) * (r1 - r0)) / (b1 - b0);
  }
  return Math.min(Math.max(0, Math.round(r)), Math.max(0, retestFrameCount - 1));
}

/**
 * The frames of a side-by-side clip: for each Baseline frame `from`…`to`, that frame and the
 * Re-test frame {@link warpToRetest} puts beside it. Pure.
 */
export function sideBySideSteps(
  from: number,
  to: number,
  pairs: readonly ContactPair[],
  rateRatio: number,
  retestFrameCount: number,
): [number, number][] {
  const steps: [number, number][] = [];
  for (let b = from; b <= to; b++) steps.push([b, warpToRetest(pairs, rateRatio, retestFrameCount, b)]);
  return steps;
}
