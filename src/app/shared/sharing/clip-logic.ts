import { SLOW_MOTION_LABELS, type AnnotatedClip, type SlowMotionFactor } from '../../../contracts/annotated-clips';
import { slowMotionLength } from '../../../kinematics';

/** "60 frames → 4.0 s at 1/4 speed" for the make dialog. */
export function clipLengthText(sourceFrames: number, fps: number, factor: SlowMotionFactor): string {
  if (!(sourceFrames > 0) || !(fps > 0)) return '';
  const { seconds } = slowMotionLength(sourceFrames, fps, factor);
  return `${sourceFrames} frame${sourceFrames === 1 ? '' : 's'} → ${seconds.toFixed(1)} s at ${SLOW_MOTION_LABELS[factor].toLowerCase()}`;
}

/**
 * Where a frame step lands, seconds: one SOURCE frame on (`repeat` video frames), at the middle of
 * that frame's time so a browser shows exactly it; kept within the video.
 */
export function frameStepTime(currentS: number, fps: number, repeat: number, durationS: number, direction: 1 | -1): number {
  if (!(fps > 0) || !(durationS > 0)) return 0;
  const per = Math.max(1, repeat) / fps; // one source frame, seconds of video
  const count = Math.max(1, Math.round(durationS / per));
  const index = Math.min(count - 1, Math.max(0, Math.floor(currentS / per + 1e-6) + direction));
  return (index + 0.5) * per;
}

/** "Source frame 12 of 60" while stepping. */
export function frameOfText(currentS: number, fps: number, repeat: number, durationS: number): string {
  const per = Math.max(1, repeat) / fps;
  const count = Math.max(1, Math.round(durationS / per));
  const index = Math.min(count - 1, Math.max(0, Math.floor(currentS / per + 1e-6)));
  return `Frame ${index + 1} of ${count}`;
}

/** The clip's title: its caption, else what it shows. */
export function clipTitle(clip: Pick<AnnotatedClip, 'caption' | 'panels' | 'kind'>): string {
  const caption = clip.caption.trim();
  if (caption) return caption;
  const what = clip.panels.map((p) => p.label).join(' and ');
  return clip.kind === 'side_by_side' ? `Side by side: ${what}` : `Annotated clip of ${what}`;
}

/** "1/4 speed · 8 s" once ready. */
export function clipFactsText(clip: Pick<AnnotatedClip, 'factor' | 'durationS'>): string {
  const speed = SLOW_MOTION_LABELS[clip.factor] ?? '';
  return clip.durationS ? `${speed} · ${Math.round(clip.durationS)} s` : speed;
}
