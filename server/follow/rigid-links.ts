import type { LandmarkName } from '../../src/contracts/annotations';

/**
 * Landmarks on one rigid segment seen from the side: trunk (hip–shoulder), thigh (hip–knee),
 * shank (knee–ankle) and foot (ankle, heel, toe). Their distances barely change while running in
 * a plane square to the camera, so a followed point that breaks them has jumped to something else.
 */
export const RIGID_LINKS: ReadonlyArray<readonly [LandmarkName, LandmarkName]> = [
  ['hip', 'shoulder'],
  ['hip', 'knee'],
  ['knee', 'ankle'],
  ['ankle', 'heel'],
  ['ankle', 'toe'],
  ['heel', 'toe'],
];
