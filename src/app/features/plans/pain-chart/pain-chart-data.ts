import type { PainPoint } from '../../../../contracts/plans';

const MONTHS = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'];

/** "7 Dec" from `2026-12-07`. */
export function shortDate(date: string): string {
  const [, m, d] = date.split('-').map(Number) as [number, number, number];
  return `${d} ${MONTHS[m - 1] ?? ''}`;
}

/** Colours of the pain chart: the app's spruce green and a warm brown (never the limb colours). */
export const PAIN_COLOURS = { during: '#1e5a4c', morning: '#9a5b3f', limit: '#ba1a1a', settled: '#6f7974' } as const;

export interface PainSeries {
  labels: string[];
  during: number[];
  morning: (number | null)[];
  /** The plan's limit for pain during, one value per label (a flat line). */
  limit: number[];
  /** What "settled" means next morning, one value per label. */
  settled: number[];
}

/** Chart series from the sessions (oldest first): pain during, next-morning pain, the rule's lines. */
export function painSeries(points: readonly PainPoint[], maxDuring: number, settledMax: number): PainSeries {
  const sorted = [...points].sort((a, b) => (a.date < b.date ? -1 : a.date > b.date ? 1 : 0));
  return {
    labels: sorted.map((p) => shortDate(p.date)),
    during: sorted.map((p) => p.painDuring),
    morning: sorted.map((p) => p.morningPain),
    limit: sorted.map(() => maxDuring),
    settled: sorted.map(() => settledMax),
  };
}
