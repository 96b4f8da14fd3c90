/**
 * The reference band beside each measure in the panel: where the value sits, the band itself with
 * its unit, and the band's source — all shown together, not behind a click. Pure.
 */
import type { Measure, ReferenceBand } from '../../../contracts/measures';
import { findBand } from '../../../kinematics/bands';
import { bandRange } from '../../../kinematics/format';
import { EVIDENCE_LABELS, bandFlag } from './measure-view';

/** What the panel shows about a measure's reference band. */
export interface BandLine {
  /** Icon of the position (never colour alone); null when there is no value to place. */
  icon: string | null;
  /** "Within the reference band 13.8–21.8°", "Below the reference band ≥ 10°", "Reference band 0.2–0.4 s". */
  text: string;
  /** Whether the value lies outside the band. */
  outside: boolean;
  /** The band's population or condition, e.g. "Treadmill, preferred step rate: 17.8 ± 4.0°; …". */
  context: string;
  /** "Heiderscheit et al. 2011, … · Published figure". */
  source: string;
}

/**
 * The band line of a measure: its evaluated band when it has a value, else the band that would
 * apply (from `bands`, the clinic's then the defaults), else null.
 */
export function bandLine(m: Pick<Measure, 'key' | 'unit' | 'status' | 'band'>, bands: readonly ReferenceBand[]): BandLine | null {
  const evaluated = m.status === 'ok' ? m.band : undefined;
  const band = evaluated?.band ?? m.band?.band ?? findBand(bands, m.key, m.unit);
  if (!band) return null;
  const range = bandRange(band);
  const evidence = EVIDENCE_LABELS[band.evidence] ?? band.evidence;
  const source = band.source.startsWith(evidence) ? band.source : `${band.source} · ${evidence}`;
  if (!evaluated) return { icon: null, text: `Reference band ${range}`, outside: false, context: band.context, source };
  const flag = bandFlag(evaluated);
  return { icon: flag.icon, text: `${flag.text} ${range}`, outside: flag.outside, context: band.context, source };
}
