import { DestroyRef, Injectable, computed, inject, signal } from '@angular/core';
import { firstValueFrom, type Subscription } from 'rxjs';
import { errorMessage } from '../../core/api-error';
import { ReviewApi } from '../../core/data/review-api';
import { ProcessingEvents } from '../../core/processing-events';
import { diffStates, stateOf } from './annotation-changes';
import { AnnotationSync } from './annotation-sync';
import { followBlockedReason, followRangeProblem, followStatusText, lowConfidenceFrames, type FollowRange } from './follow-view';
import { eventsMissingMarkers, framesToCheck, missingOnFrame, nextToCheck } from './not-followed';
import { ReviewStore } from './review-store';

/** How long a finished follow waits for the page's own unsaved edits to be saved before showing the result. */
const SETTLE_MS = 10_000;

/**
 * Marker following in the review: asks the server to follow the markers of the current frame
 * forward and backward over a frame range (the whole clip unless the coach narrows it), can cancel
 * a follow (nothing it followed is kept), shows the item's progress from the athlete's processing stream, and when
 * it is done shows the server's copy with the followed points (one undo step). Provided by the
 * review page.
 */
@Injectable()
export class MarkerFollowing {
  private readonly api = inject(ReviewApi);
  private readonly events = inject(ProcessingEvents);
  private readonly sync = inject(AnnotationSync);
  private readonly store = inject(ReviewStore);
  private readonly running$ = signal(false);
  private readonly status$ = signal<string | null>(null);
  private readonly progress$ = signal<{ done: number; total: number } | null>(null);
  private readonly problem$ = signal<string | null>(null);
  /** The range the coach chose; null ends mean the clip's first and last frame. */
  private readonly from$ = signal<number | null>(null);
  private readonly to$ = signal<number | null>(null);
  private readonly cancelling$ = signal(false);
  private watch: Subscription | null = null;

  /** Whether a follow is queued or running. */
  readonly running = this.running$.asReadonly();
  /** The follow's state in words, or null before the first. */
  readonly status = this.status$.asReadonly();
  /** Frames done of total while running. */
  readonly progress = this.progress$.asReadonly();
  /** Why following could not start or failed, or null. */
  readonly problem = this.problem$.asReadonly();
  /** Whether a cancel was asked for and the follow has not stopped yet. */
  readonly cancelling = this.cancelling$.asReadonly();
  /** The frames to follow over (the whole clip by default). */
  readonly range = computed<FollowRange>(() => {
    const last = Math.max(0, this.store.frameCount() - 1);
    return { from: this.from$() ?? 0, to: this.to$() ?? last };
  });
  /** Whether the range is the whole clip. */
  readonly wholeClip = computed(() => {
    const r = this.range();
    return r.from === 0 && r.to === this.store.frameCount() - 1;
  });
  /** Why the range does not fit the current frame or the clip, in words, or null. */
  readonly rangeProblem = computed(() => followRangeProblem(this.range(), this.store.frame(), this.store.frameCount()));
  /** Frames with a followed point below the confidence the coach should check. */
  readonly lowFrames = computed(() => lowConfidenceFrames(this.store.annotations().landmarks));
  /**
   * Frames following could not follow a marker on (the server's list), less those where the coach
   * has placed that marker since: the frames the coach must check.
   */
  readonly toCheck = computed(() => framesToCheck(this.sync.base()?.notFollowed, this.store.annotations().landmarks));
  /** The markers to place on the frame shown, with why each was not followed. */
  readonly missingHere = computed(() => missingOnFrame(this.toCheck(), this.store.frame()));
  /** Gait events on such frames: measures needing the missing marker leave that step out. */
  readonly eventsToCheck = computed(() => eventsMissingMarkers(this.toCheck(), this.store.events()));
  /** Why following cannot start from this frame (no markers placed here, edits still saving), or null. */
  readonly blocked = computed(() => {
    const frame = this.store.frame();
    const here = this.store.annotations().landmarks.find((l) => l.frame === frame && Object.keys(l.points).length > 0);
    return followBlockedReason({
      running: this.running$(),
      pointsHere: here ? Object.keys(here.points).length : 0,
      unsaved: this.sync.hasUnsaved(),
    });
  });
  /** Whether following can start now: a clip is open, this frame has landmarks, every edit is saved. */
  readonly canFollow = computed(() => !!this.store.clip() && !this.running$() && !this.blocked() && !this.rangeProblem());

  constructor() {
    inject(DestroyRef).onDestroy(() => this.watch?.unsubscribe());
  }

  /** Sets the first or last frame to follow (null: the clip's own first or last). */
  setRangeEnd(end: 'from' | 'to', frame: number | null): void {
    (end === 'from' ? this.from$ : this.to$).set(frame);
  }

  /** Follows over the whole clip again. */
  followWholeClip(): void {
    this.from$.set(null);
    this.to$.set(null);
  }

  /** Goes to the next (1) or previous (−1) frame to check; false when there is no other. */
  stepToCheck(dir: -1 | 1 = 1): boolean {
    const target = nextToCheck(this.toCheck().frames, this.store.frame(), dir);
    if (target === null) return false;
    this.store.step(target - this.store.frame());
    return true;
  }

  /** Follows the current frame's markers forward and backward over the range. */
  async follow(): Promise<void> {
    const clip = this.store.clip();
    if (!clip || !this.canFollow()) return;
    const clipId = clip.clip.id;
    this.problem$.set(null);
    this.running$.set(true);
    this.progress$.set(null);
    this.status$.set('Following markers: starting…');
    try {
      const started = await firstValueFrom(this.api.followMarkers(clipId, { startFrame: this.store.frame(), ...this.range() }));
      this.watch?.unsubscribe();
      this.watch = this.events.follow(clip.clip.athleteId).subscribe((m) => {
        if (m.type !== 'item' || m.event.kind !== started.kind || m.event.subject !== 'clip' || m.event.id !== clipId) return;
        this.status$.set(followStatusText(m.event));
        this.progress$.set(m.event.progress);
        if (m.event.state === 'ready') void this.showResult(clipId);
        else if (m.event.state === 'failed' || m.event.state === 'cancelled') this.finish(m.event.error);
      });
    } catch (err) {
      this.finish(errorMessage(err));
    }
  }

  /**
   * Stops the running follow. Nothing it followed is kept (the server saves followed points only
   * when a run ends); the stream then says it was cancelled.
   */
  async cancel(): Promise<void> {
    const clip = this.store.clip();
    if (!clip || !this.running$() || this.cancelling$()) return;
    this.cancelling$.set(true);
    this.status$.set('Cancelling…');
    try {
      await firstValueFrom(this.api.cancelFollow(clip.clip.id));
    } catch (err) {
      // It may have ended meanwhile: the stream says how.
      this.cancelling$.set(false);
      this.problem$.set(errorMessage(err));
    }
  }

  private finish(problem: string | null): void {
    this.watch?.unsubscribe();
    this.watch = null;
    this.cancelling$.set(false);
    this.running$.set(false);
    this.progress$.set(null);
    if (problem) {
      this.problem$.set(problem);
      this.status$.set(null);
    }
  }

  /** Shows the server's copy once the page's own edits are saved (the server merged both). */
  private async showResult(clipId: number): Promise<void> {
    this.finish(null);
    for (let waited = 0; this.sync.hasUnsaved() && waited < SETTLE_MS; waited += 200) await new Promise((r) => setTimeout(r, 200));
    try {
      const saved = await firstValueFrom(this.api.annotations(clipId));
      if (this.store.clip()?.clip.id !== clipId) return;
      const changes = diffStates(this.store.annotations(), stateOf(saved));
      this.sync.adopt(saved);
      this.store.edit('follow markers', changes);
      const low = this.lowFrames().length;
      const lost = this.toCheck().markers.map((m) => `${m.text}.`);
      this.status$.set(
        ['Markers followed.', ...lost, ...(low ? [`${low} frame${low === 1 ? '' : 's'} to check (low confidence).`] : [])].join(' '),
      );
    } catch (err) {
      this.problem$.set(errorMessage(err));
    }
  }
}
