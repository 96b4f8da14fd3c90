/**
 * Spring-mass estimate of vertical oscillation from contact and flight time (Morin et al. 2005,
 * J Appl Biomech 21:167–180 [pub method; formula as recalled in REFERENCES.md, from memory]).
 * Pure. Not used by the clip measures (they measure the hip marker); offered for comparison when
 * the hip is not marked densely enough.
 */

/** Standard gravity, m/s². */
export const STANDARD_GRAVITY = 9.81;

/** Parts of the spring-mass estimate. */
export interface SpringMassEstimate {
  /** Peak vertical force, body weights: (π/2)(tf/tc + 1). */
  peakForceBw: number;
  /** Centre-of-mass drop in stance, m: Fmax·g·tc²/π² − g·tc²/8. */
  stanceDropM: number;
  /** Rise in flight, m: g·tf²/8. */
  flightRiseM: number;
  /** Stance drop + flight rise, m. */
  totalM: number;
}

/**
 * Spring-mass vertical oscillation from contact time `contactS` and flight time `flightS` (s).
 * REFERENCES.md [calc]: tc 0.25 s, tf 0.10 s → 2.199 BW, 5.997 cm, 1.226 cm, 7.224 cm.
 * Null when contact is not positive or flight is negative.
 */
export function springMassVerticalOscillation(contactS: number, flightS: number, g = STANDARD_GRAVITY): SpringMassEstimate | null {
  if (!(contactS > 0) || !(flightS >= 0)) return null;
  const peakForceBw = (Math.PI / 2) * (flightS / contactS + 1);
  const stanceDropM = (peakForceBw * g * contactS ** 2) / Math.PI ** 2 - (g * contactS ** 2) / 8;
  const flightRiseM = (g * flightS ** 2) / 8;
  return { peakForceBw, stanceDropM, flightRiseM, totalM: stanceDropM + flightRiseM };
}
