/**
 * Gait-event rules on coordinate series. Pure: plain number arrays indexed by frame, `NaN` where a
 * landmark is missing; no Angular, no Node.
 *
 * - Coordinate method (Zeni et al. 2008, Gait Posture 27:710–714, REFERENCES.md [pub]): with x the
 *   running direction, initial contact at each maximum of (heel.x − hip.x) and toe-off at each
 *   minimum of (toe.x − hip.x). Validated in walking; in running it marks one window per cycle.
 * - Running refinements (Fellin et al. 2010, J Sci Med Sport 13:646–650, REFERENCES.md [pub]):
 *   foot strike at the heel's vertical minimum, toe-off at peak knee extension. Here the heel's
 *   minimum is the first one after the coordinate-method contact (the foot's foremost position),
 *   and peak knee extension the last knee-flexion minimum before the coordinate-method toe-off
 *   (the toe's rearmost position). A knee peak falls between frames; the toe-off frame is the last
 *   frame at or before it (see {@link kneeExtensionToeOff}).
 */

/** Whether `v` is a usable number (not NaN, not ±Infinity). */
const ok = (v: number | undefined): v is number => v !== undefined && Number.isFinite(v);

/**
 * Frames that are a maximum (or minimum) of `values` within ±`halfWindow` frames: strictly beyond
 * every earlier value in the window and at least equal to every later one (a flat top counts once,
 * at its first frame). Both neighbours must be known, so an edge of the series or of a gap is never
 * an extremum (the signal may go on beyond it). Ascending.
 */
export function windowExtrema(values: readonly number[], halfWindow: number, kind: 'max' | 'min'): number[] {
  const s = kind === 'max' ? 1 : -1;
  const w = Math.max(1, Math.floor(halfWindow));
  const out: number[] = [];
  for (let i = 1; i < values.length - 1; i++) {
    const v = values[i];
    if (!ok(v) || !ok(values[i - 1]) || !ok(values[i + 1])) continue;
    let best = true;
    for (let j = Math.max(0, i - w); best && j <= Math.min(values.length - 1, i + w); j++) {
      const u = values[j];
      if (j === i || !ok(u)) continue;
      if (j < i ? s * u >= s * v : s * u > s * v) best = false;
    }
    if (best) out.push(i);
  }
  return out;
}

/**
 * Coordinate-method initial contacts (Zeni et al. 2008 [pub]): maxima of heel.x − hip.x, with
 * `heelRel[i]` = heel.x − hip.x on frame i (x = running direction).
 */
export function coordinateContacts(heelRel: readonly number[], halfWindow: number): number[] {
  return windowExtrema(heelRel, halfWindow, 'max');
}

/** Coordinate-method toe-offs (Zeni et al. 2008 [pub]): minima of `toeRel[i]` = toe.x − hip.x. */
export function coordinateToeOffs(toeRel: readonly number[], halfWindow: number): number[] {
  return windowExtrema(toeRel, halfWindow, 'min');
}

/**
 * Foot strike at the heel's vertical minimum (Fellin et al. 2010 [pub]): walking forward from
 * `from` (the coordinate-method contact) while the heel still goes down, the first frame whose next
 * frame is not lower. `heelHeight` is y up. Null when the heel is unknown on the way, or still
 * going down at `before` (exclusive: the next toe-off) — then there is no strike to propose.
 */
export function heelStrikeFrame(heelHeight: readonly number[], from: number, before: number): number | null {
  const end = Math.min(before, heelHeight.length);
  if (from < 0 || from >= end || !ok(heelHeight[from])) return null;
  let i = from;
  while (i + 1 < end) {
    const next = heelHeight[i + 1];
    if (!ok(next)) return null;
    if (next >= heelHeight[i]!) return i;
    i++;
  }
  return null;
}

/**
 * Toe-off at peak knee extension (Fellin et al. 2010 [pub]). Walking back from `from` (the
 * coordinate-method toe-off, when the knee already flexes into swing) while the knee was straighter
 * the frame before, to the last minimum of knee flexion; not earlier than `after` (exclusive: the
 * stance's initial contact). The true peak lies between frames: a parabola through the minimum and
 * its two neighbours places it (vertex = m + (k[m−1] − k[m+1]) / (2·(k[m−1] − 2k[m] + k[m+1])),
 * kept within half a frame), and the toe-off is the last frame at or before that instant — the foot
 * has left by the time the knee is straightest (peak extension comes at or just after toe-off).
 * Null when the knee is unknown on the way, still straightening at `from`, or straightest at `after`.
 */
export function kneeExtensionToeOff(kneeFlexion: readonly number[], from: number, after: number): number | null {
  if (from <= after || from >= kneeFlexion.length || !ok(kneeFlexion[from])) return null;
  let m = from;
  while (m - 1 > after) {
    const prev = kneeFlexion[m - 1];
    if (!ok(prev)) return null;
    if (prev >= kneeFlexion[m]!) break;
    m--;
  }
  // Straightest at the window's start (no turn inside it), or still straightening at `from` (not yet in swing).
  if (m - 1 <= after || m === from) return null;
  const a = kneeFlexion[m - 1]!;
  const b = kneeFlexion[m]!;
  const c = kneeFlexion[m + 1];
  if (!ok(c)) return m;
  const curvature = a - 2 * b + c;
  const offset = curvature > 0 ? Math.max(-0.5, Math.min(0.5, (a - c) / (2 * curvature))) : 0;
  return Math.floor(m + offset + 1e-9);
}
