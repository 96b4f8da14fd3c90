/**
 * Words and numbers shown for a clip: its processing state as a label, a line of detail and a
 * progress bar setting, and its facts (frame rate, frames, duration, size). Pure functions.
 */
import type { Clip } from '../../contracts/api';
import { CAPTURE_FPS_LIMITS, type ClipStatus } from '../../contracts/assessment';

export type ClipTone = 'working' | 'ready' | 'failed';

export interface ClipStatusView {
  label: string;
  detail: string;
  tone: ClipTone;
  /** Progress bar to show: none when settled; `determinate` carries a 0–100 percent. */
  bar: { mode: 'query' | 'indeterminate' } | { mode: 'determinate'; percent: number } | null;
}

export const CLIP_STATUS_LABELS: Record<ClipStatus, string> = {
  queued: 'Queued',
  probing: 'Checking video',
  extracting: 'Extracting frames',
  ready: 'Ready',
  failed: 'Failed',
};

/** Whether the clip is still on its way to `ready` or `failed`. */
export function isProcessing(status: ClipStatus): boolean {
  return status === 'queued' || status === 'probing' || status === 'extracting';
}

/** Whether the review can open on the clip: ready, or being extracted with its first frames in. */
export function isReviewable(clip: Pick<Clip, 'status' | 'progress'>): boolean {
  return clip.status === 'ready' || (clip.status === 'extracting' && (clip.progress?.done ?? 0) > 0);
}

/** What the clip's status chip, detail line and progress bar say. */
export function clipStatusView(clip: Pick<Clip, 'status' | 'progress' | 'error' | 'frameCount'>): ClipStatusView {
  const label = CLIP_STATUS_LABELS[clip.status];
  switch (clip.status) {
    case 'queued':
      return { label, detail: 'Waiting its turn for processing', tone: 'working', bar: { mode: 'query' } };
    case 'probing':
      return { label, detail: 'Reading frame rate, size and rotation', tone: 'working', bar: { mode: 'indeterminate' } };
    case 'extracting': {
      const p = clip.progress;
      if (!p || !(p.total > 0)) {
        return { label, detail: 'Extracting frames…', tone: 'working', bar: { mode: 'indeterminate' } };
      }
      const done = Math.min(Math.max(p.done, 0), p.total);
      const percent = Math.floor((done / p.total) * 100);
      return {
        label,
        detail: `Frame ${done.toLocaleString('en')} of ${p.total.toLocaleString('en')} (${percent} %)`,
        tone: 'working',
        bar: { mode: 'determinate', percent },
      };
    }
    case 'ready':
      return {
        label,
        detail: clip.frameCount !== null ? `${clip.frameCount.toLocaleString('en')} frames ready` : 'Frames ready',
        tone: 'ready',
        bar: null,
      };
    case 'failed':
      return { label, detail: clip.error?.trim() || 'Processing failed.', tone: 'failed', bar: null };
  }
}

/** File size for people: "820 B", "14.2 MB", "1.31 GB" (decimal units, as phones show them). */
export function formatBytes(bytes: number): string {
  if (!Number.isFinite(bytes) || bytes < 0) return '—';
  if (bytes < 1000) return `${bytes} B`;
  const units = ['kB', 'MB', 'GB', 'TB'];
  let value = bytes;
  let unit = -1;
  while (value >= 1000 && unit < units.length - 1) {
    value /= 1000;
    unit += 1;
  }
  const digits = value >= 100 ? 0 : value >= 10 ? 1 : 2;
  return `${value.toFixed(digits)} ${units[unit]}`;
}

/** A frame rate without needless decimals: 30, 29.97, 239.76. */
export function formatFps(fps: number): string {
  return String(Math.round(fps * 100) / 100);
}

/** Duration in seconds as "8.4 s" or "1:02.5 min". */
export function formatDuration(seconds: number): string {
  if (!Number.isFinite(seconds) || seconds < 0) return '—';
  if (seconds < 60) return `${(Math.round(seconds * 10) / 10).toFixed(1)} s`;
  const tenths = Math.round(seconds * 10);
  const minutes = Math.floor(tenths / 600);
  const rest = (tenths - minutes * 600) / 10;
  return `${minutes}:${rest.toFixed(1).padStart(4, '0')} min`;
}

/** The clip's facts as label/value pairs, leaving out what has not been probed yet. */
export function clipFacts(clip: Clip): { label: string; value: string }[] {
  const facts: { label: string; value: string }[] = [];
  if (clip.fps !== null) {
    facts.push({ label: 'File frame rate', value: `${formatFps(clip.fps)} fps` });
  }
  if (clip.effectiveFps !== null && (clip.captureFps !== null || clip.fps === null)) {
    facts.push({ label: 'Timing uses', value: `${formatFps(clip.effectiveFps)} fps` });
  }
  if (clip.frameCount !== null) facts.push({ label: 'Frames', value: clip.frameCount.toLocaleString('en') });
  if (clip.durationS !== null) facts.push({ label: 'Duration', value: formatDuration(clip.durationS) });
  if (clip.width !== null && clip.height !== null) {
    facts.push({ label: 'Frame size', value: `${clip.width} × ${clip.height}` });
  }
  facts.push({ label: 'File size', value: formatBytes(clip.sizeBytes) });
  return facts;
}

/** Width/height attributes for an image of the clip at `height` pixels (16:9 until probed). */
export function imageBox(clip: Pick<Clip, 'width' | 'height'>, height: number): { width: number; height: number } {
  const ratio = clip.width && clip.height ? clip.width / clip.height : 16 / 9;
  return { width: Math.round(height * ratio), height };
}

/**
 * Reads the capture-rate text: empty = use the file's rate (null); otherwise a number within
 * CAPTURE_FPS_LIMITS. Returns an error message for anything else.
 */
export function readCaptureFps(text: string): { value: number | null } | { error: string } {
  const t = text.trim().replace(',', '.');
  if (t === '') return { value: null };
  const value = Number(t);
  if (!/^\d+(\.\d+)?$/.test(t) || !Number.isFinite(value)) return { error: 'Enter a number of frames per second, e.g. 240' };
  if (value < CAPTURE_FPS_LIMITS.min || value > CAPTURE_FPS_LIMITS.max) {
    return { error: `Enter ${CAPTURE_FPS_LIMITS.min} to ${CAPTURE_FPS_LIMITS.max} fps` };
  }
  return { value };
}
