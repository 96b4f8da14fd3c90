/**
 * Pure helpers of sharing (stills and visit summaries): text counters, publish buttons, following
 * renders on the progress stream, swipe direction, the athlete's next assessment. No Angular here.
 */
import type { ProcessingEvent } from '../../../contracts/processing';
import type { RenderStatus, Still, VisitSummary } from '../../../contracts/sharing';

/** Horizontal drag beyond which a drag counts as a swipe, px. */
export const SWIPE_MIN_PX = 50;

/** A text field's counter against its limit. */
export interface TextCount {
  length: number;
  remaining: number;
  over: boolean;
  /** Close to the limit (last 10 %), for a warning colour before it is over. */
  near: boolean;
  /** e.g. "42 / 280". */
  label: string;
}

/** Counts characters as the server does (code points, after trimming the ends). */
export function textCount(text: string, max: number): TextCount {
  const length = [...text.trim()].length;
  const remaining = max - length;
  return { length, remaining, over: remaining < 0, near: remaining >= 0 && remaining < max * 0.1, label: `${length} / ${max}` };
}

/** Which list a progress event is about. */
export type SharedSubject = 'still' | 'summary';

/** How the Shared tab follows one event of the progress stream. */
export type SharedListStep =
  | { kind: 'progress'; subject: SharedSubject; id: number; progress: number }
  | { kind: 'fetch'; subject: SharedSubject; id: number }
  | { kind: 'drop'; subject: SharedSubject; id: number }
  | { kind: 'ignore' };

/**
 * A render's progress on a shown still or summary is set in place (0–1); any other change — ready,
 * failed, queued again, or one the tab does not show yet (saved from the review) — fetches it
 * again; a cancelled render means it is being deleted. Clips' events are not the tab's.
 */
export function sharedListStep(
  event: ProcessingEvent,
  shown: { stills: readonly { id: number; status: RenderStatus }[]; summaries: readonly { id: number; status: RenderStatus }[] },
): SharedListStep {
  if (event.subject !== 'still' && event.subject !== 'summary') return { kind: 'ignore' };
  const subject = event.subject;
  if (event.state === 'cancelled') return { kind: 'drop', subject, id: event.id };
  const item = (subject === 'still' ? shown.stills : shown.summaries).find((i) => i.id === event.id);
  if (item?.status === 'rendering' && event.state === 'running' && event.progress && event.progress.total > 0) {
    return { kind: 'progress', subject, id: event.id, progress: Math.min(1, event.progress.done / event.progress.total) };
  }
  return { kind: 'fetch', subject, id: event.id };
}

/** Progress 0–1 as a whole percentage, clamped (for a determinate progress bar). */
export function progressPercent(progress: number | null | undefined): number {
  if (typeof progress !== 'number' || !Number.isFinite(progress)) return 0;
  return Math.round(Math.min(1, Math.max(0, progress)) * 100);
}

/** What the publish button of a still or summary offers. */
export interface PublishButton {
  action: 'publish' | 'unpublish';
  label: 'Publish' | 'Unpublish';
  disabled: boolean;
  /** Why it is disabled, or what the state is, in words. */
  state: string;
}

export function publishButton(item: { status: RenderStatus; publishedAt: string | null }): PublishButton {
  if (item.publishedAt) return { action: 'unpublish', label: 'Unpublish', disabled: false, state: 'Published to the athlete' };
  const disabled = item.status !== 'ready';
  const state =
    item.status === 'rendering' ? 'Rendering — publish when it is ready' : item.status === 'failed' ? 'Rendering failed' : 'Not published';
  return { action: 'publish', label: 'Publish', disabled, state };
}

/**
 * Swipe step from a pointer drag: drag left → next (+1), drag right → previous (−1), 0 when the
 * drag is short or more vertical than horizontal (a scroll, not a swipe).
 */
export function swipeStep(dx: number, dy: number, min = SWIPE_MIN_PX): -1 | 0 | 1 {
  if (Math.abs(dx) <= min || Math.abs(dx) <= Math.abs(dy)) return 0;
  return dx < 0 ? 1 : -1;
}

/** Moves an index by `by` within `count` items, stopping at the ends (no wrap). */
export function stepIndex(index: number, by: number, count: number): number {
  if (count <= 0) return 0;
  return Math.min(count - 1, Math.max(0, index + by));
}

/** "2 of 5". */
export function positionText(index: number, count: number): string {
  return count ? `${index + 1} of ${count}` : '0 of 0';
}

/** The panels' headings of a still, e.g. "Baseline · 6 Oct 2026 | Re-test · 1 Dec 2026". */
export function panelText(still: Pick<Still, 'panels'>): string {
  return still.panels.map((p) => p.label).join(' | ');
}

/** Alternative text of a still's image: its caption, else what it shows. */
export function stillAlt(still: Pick<Still, 'caption' | 'panels' | 'kind'>): string {
  const caption = still.caption.trim();
  if (caption) return caption;
  const what = panelText(still);
  return still.kind === 'pair' ? `Side-by-side still: ${what}` : `Still of ${what || 'a frame'}`;
}

/** What publishing sends, for the confirmation. */
export function publishConfirmText(
  kind: 'still' | 'summary',
  athleteName: string,
  hasAccount = true,
): { title: string; message: string; confirmLabel: string } {
  const who = athleteName.trim() || 'The athlete';
  const what = kind === 'still' ? 'this still' : 'this visit summary';
  const title = kind === 'still' ? 'Publish this still?' : 'Publish this visit summary?';
  if (!hasAccount) {
    return {
      title,
      message: `${who} has no Trailframe account yet: ${what} waits in their portal, and no e-mail goes out now. They see it once they accept an invitation (Invite to Trailframe).`,
      confirmLabel: 'Publish',
    };
  }
  return {
    title,
    message: `${who} will see ${what} in their portal and will get an e-mail notice that something new was shared (the e-mail carries no captions or measures).`,
    confirmLabel: 'Publish and notify',
  };
}

/** The first assessment dated today or later (soonest first), or null. `today` is `YYYY-MM-DD`. */
export function nextAssessment<T extends { date: string }>(assessments: readonly T[], today: string): T | null {
  let best: T | null = null;
  for (const a of assessments) if (a.date >= today && (!best || a.date < best.date)) best = a;
  return best;
}

/** Today's date `YYYY-MM-DD` in local time. */
export function todayIso(now = new Date()): string {
  const p = (n: number) => String(n).padStart(2, '0');
  return `${now.getFullYear()}-${p(now.getMonth() + 1)}-${p(now.getDate())}`;
}

/** Assessments a summary of `chosen` may compare against: the others dated before it (newest first). */
export function baselineChoices<T extends { id: number; date: string }>(assessments: readonly T[], chosenId: number | null): T[] {
  const chosen = assessments.find((a) => a.id === chosenId);
  if (!chosen) return [];
  return assessments
    .filter((a) => a.id !== chosen.id && a.date <= chosen.date)
    .sort((a, b) => (a.date < b.date ? 1 : a.date > b.date ? -1 : b.id - a.id));
}

/** Stills a summary of the chosen visits can carry: ready stills of either assessment. */
export function stillChoices(stills: readonly Still[], assessmentIds: readonly (number | null)[]): Still[] {
  const ids = new Set(assessmentIds.filter((i): i is number => i !== null));
  return stills.filter((s) => s.status === 'ready' && (ids.has(s.assessmentId) || s.panels.some((p) => ids.has(p.assessmentId))));
}

/** One line about a summary's state for its row. */
export function summaryStateText(s: Pick<VisitSummary, 'status' | 'publishedAt' | 'pageCount' | 'error'>): string {
  if (s.status === 'rendering') return 'Rendering…';
  if (s.status === 'failed') return `Rendering failed${s.error ? `: ${s.error}` : ''}`;
  const pages = s.pageCount ? `${s.pageCount} page${s.pageCount === 1 ? '' : 's'}` : 'Ready';
  return `${pages} · ${s.publishedAt ? 'published' : 'not published'}`;
}

/** The attachment address of a summary's PDF. */
export function downloadUrl(pdfUrl: string): string {
  return `${pdfUrl}${pdfUrl.includes('?') ? '&' : '?'}download=1`;
}

/** The baseline a summary of a Re-test compares with by default: the latest earlier Baseline; none for a Baseline. */
export function defaultBaseline<T extends { id: number; date: string; kind: string }>(
  assessments: readonly T[],
  chosenId: number | null,
): number | null {
  const chosen = assessments.find((a) => a.id === chosenId);
  if (!chosen || chosen.kind !== 'retest') return null;
  return baselineChoices(assessments, chosenId).find((a) => a.kind === 'baseline')?.id ?? null;
}

/** The caution on the athlete's shared items (DESIGN.md, "Safety and privacy"). */
export const SHARED_CAUTION =
  'Your coach\u2019s notes and figures support, and do not replace, the judgement of your licensed clinician. Stop an exercise that causes sharp or worsening pain and contact your clinician. Follow local regulations.';

/**
 * The address to show a still's image at. The server's URL already carries the render version;
 * this adds the state the picture depends on (caption, angles, rendering or ready), so an image
 * element that asked while a new version was still rendering asks again once it is ready.
 */
export function stillSrc(url: string, still: Pick<Still, 'caption' | 'showAngles' | 'status'>): string {
  let h = 5381;
  for (const ch of `${still.caption}|${still.showAngles}|${still.status}`) h = ((h * 33) ^ ch.codePointAt(0)!) >>> 0;
  return `${url}${url.includes('?') ? '&' : '?'}s=${h.toString(36)}`;
}
