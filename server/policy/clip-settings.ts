import type { SessionUser } from '../../src/contracts/api';
import { ConflictError } from '../errors';

/**
 * Who may change a clip's settings (near side, running direction, capture frame rate): clinic
 * staff always; the athlete only while the clip has no landmarks and no gait events, because on a
 * marked clip a new side, direction or capture rate changes every measure the coach has read.
 *
 * The athlete's refusal is 409 (`clip_marked`), not 403: the athlete may change the settings of
 * their own clips in general; it is the clip's present state (marked) that stands in the way, and
 * the same request succeeds again once the marks are gone. 403 in this API means "your role never
 * may".
 */
export function assertMayChangeClipSettings(user: SessionUser, marked: boolean): void {
  if (user.role === 'owner' || user.role === 'coach') return;
  if (marked) {
    throw new ConflictError(
      'Your clinician has already marked this clip, so its settings (near side, running direction, capture frame rate) are locked. Ask your clinician to change them.',
      'clip_marked',
    );
  }
}
