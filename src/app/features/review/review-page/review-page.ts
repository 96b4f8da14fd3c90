import { DatePipe, formatDate } from '@angular/common';
import { ChangeDetectionStrategy, Component, LOCALE_ID, computed, effect, inject, input, signal, viewChild } from '@angular/core';
import { rxResource, takeUntilDestroyed, toObservable } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatButtonToggleModule } from '@angular/material/button-toggle';
import { MatDialog } from '@angular/material/dialog';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSliderModule } from '@angular/material/slider';
import { MatSnackBar } from '@angular/material/snack-bar';
import { MatTabsModule } from '@angular/material/tabs';
import { MatTooltipModule } from '@angular/material/tooltip';
import { Title } from '@angular/platform-browser';
import { Router, RouterLink } from '@angular/router';
import { EMPTY, catchError, filter, forkJoin, map, of, switchMap, throwError } from 'rxjs';
import type { ClipAnnotations } from '../../../../contracts/annotations';
import { LANDMARKS } from '../../../../contracts/annotations';
import type { AssessmentDetail, Clip } from '../../../../contracts/api';
import { ASSESSMENT_KIND_LABELS } from '../../../../contracts/assessment';
import { eventLineAt } from '../../../../kinematics/event-names';
import { errorMessage, errorStatus } from '../../../core/api-error';
import { LeaveGuarded, LeaveWarning, warnBeforeUnload } from '../../../core/leave-guard';
import { ProcessingEvents, type ProcessingMessage } from '../../../core/processing-events';
import { listenToPageKeys } from '../../../shared/keys/page-keys';
import type { FocusTarget } from '../../../shared/keys/key-routing';
import { EmptyState } from '../../../shared/states/empty-state';
import { ErrorNote } from '../../../shared/states/error-note';
import { ErrorState } from '../../../shared/states/error-state';
import { AssessmentsApi } from '../../../core/data/assessments-api';
import { clipStatusView, isReviewable } from '../../../shared/clip-status';
import { AthletesApi } from '../../../core/data/athletes-api';
import { fullName } from '../../../core/data/roster';
import { ReferenceBandsApi } from '../../../core/data/reference-bands-api';
import { AngleChart } from '../angle-chart/angle-chart';
import { AnnotationSync } from '../annotation-sync';
import { SAVE_STATE_ICONS, SAVE_STATE_LABELS } from '../autosave';
import { EventsPanel } from '../events-panel/events-panel';
import { FrameCache } from '../frame-cache';
import { FrameViewer } from '../frame-viewer/frame-viewer';
import { GaugeTool } from '../gauge-tool';
import { KeyHelpDialog } from '../key-help-dialog/key-help-dialog';
import { FRAME_KEYS, ReviewAction, ReviewTool, keyAction } from '../key-map';
import { DEFAULT_REFERENCE_BANDS } from '../kinematics-adapter';
import { LandmarksPanel } from '../landmarks-panel/landmarks-panel';
import { MeasuresPanel } from '../measures-panel/measures-panel';
import { CyclePanel } from '../cycle-panel/cycle-panel';
import { PLAYBACK_RATES, PLAYBACK_RATE_LABELS, PlaybackRate, formatMs } from '../playback';
import { ClipManifest, ReviewApi } from '../../../core/data/review-api';
import { EventProposals } from '../event-proposals';
import { MarkerFollowing } from '../marker-following';
import { ReviewStore } from '../review-store';
import { ScalePanel } from '../scale-panel/scale-panel';
import { openSaveStill } from '../../../shared/sharing/save-still-dialog/save-still-dialog';
import { openAnnotatedClipDialog } from '../../../shared/sharing/annotated-clip-dialog/annotated-clip-dialog';
import { ANNOTATED_CLIP_MAX_SOURCE_FRAMES } from '../../../../contracts/annotated-clips';
import { defaultClipRange } from '../../../../kinematics';

/** What the page loads before the workspace opens. */
type Loaded =
  | { kind: 'not-ready'; clip: Clip }
  | { kind: 'ready'; clip: Clip; assessment: AssessmentDetail; manifest: ClipManifest; annotations: ClipAnnotations };

/** Tabs of the side panel, in order. */
const PANEL_TABS = ['landmarks', 'events', 'scale', 'measures'] as const;

/** What leaving with unsaved marks asks. */
export const UNSAVED_MARKS_WARNING: LeaveWarning = {
  title: 'Leave before your marks are saved?',
  message: 'Some landmarks, events or the scale bar are not saved yet. If you leave this page now, those edits are lost.',
  confirmLabel: 'Leave and discard',
};

const TOOLS: { id: ReviewTool; label: string; icon: string; key: string }[] = [
  { id: 'landmark', label: 'Landmark', icon: 'my_location', key: 'L' },
  { id: 'pan', label: 'Pan', icon: 'pan_tool', key: 'P' },
  { id: 'scale', label: 'Scale bar', icon: 'straighten', key: 'B' },
  { id: 'gauge', label: 'Angle gauge', icon: 'square_foot', key: 'G' },
];

/**
 * `/athletes/:athleteId/assessments/:assessmentId/clips/:clipId/review` (staff): the review
 * workspace. Frame viewer with toolbar and scrubber on the left, the joint-angle chart below it,
 * and a side panel with Landmarks · Events · Scale · Measures. Keyboard first (see `key-map.ts`);
 * edits autosave.
 */
@Component({
  selector: 'app-review-page',
  imports: [
    DatePipe,
    ErrorNote,
    RouterLink,
    MatButtonModule,
    MatButtonToggleModule,
    MatIconModule,
    MatProgressBarModule,
    MatSliderModule,
    MatTabsModule,
    MatTooltipModule,
    EmptyState,
    ErrorState,
    FrameViewer,
    AngleChart,
    LandmarksPanel,
    EventsPanel,
    ScalePanel,
    MeasuresPanel,
    CyclePanel,
  ],
  providers: [ReviewStore, AnnotationSync, GaugeTool, EventProposals, MarkerFollowing],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './review-page.html',
  styleUrl: './review-page.scss',
  host: {
    class: 'review-page',
    '(window:beforeunload)': 'onBeforeUnload($event)',
  },
})
export class ReviewPage implements LeaveGuarded {
  protected readonly store = inject(ReviewStore);
  protected readonly gauges = inject(GaugeTool);
  protected readonly following = inject(MarkerFollowing);
  private readonly api = inject(ReviewApi);
  private readonly sync = inject(AnnotationSync);
  private readonly assessmentsApi = inject(AssessmentsApi);
  private readonly athletesApi = inject(AthletesApi);
  private readonly bandsApi = inject(ReferenceBandsApi);
  private readonly progress = inject(ProcessingEvents);
  private readonly dialog = inject(MatDialog);
  private readonly snackBar = inject(MatSnackBar);
  private readonly router = inject(Router);
  private readonly locale = inject(LOCALE_ID);

  /** Route parameters. */
  readonly athleteId = input.required<string>();
  readonly assessmentId = input.required<string>();
  readonly clipId = input.required<string>();

  private readonly viewer = viewChild(FrameViewer);

  protected readonly loaded = rxResource<Loaded, { clipId: number; assessmentId: number; athleteId: number }>({
    params: () => ({ clipId: Number(this.clipId()), assessmentId: Number(this.assessmentId()), athleteId: Number(this.athleteId()) }),
    stream: ({ params }) => {
      if (!Number.isInteger(params.clipId) || params.clipId <= 0) return throwError(() => new Error('Not a valid clip address.'));
      return this.assessmentsApi.getClip(params.clipId).pipe(
        switchMap((clip) => {
          if (clip.assessmentId !== params.assessmentId || clip.athleteId !== params.athleteId) {
            return throwError(() => new NotHereError());
          }
          // Opens as soon as the first frames exist; the rest arrive on the progress stream.
          if (!isReviewable(clip)) return of<Loaded>({ kind: 'not-ready', clip });
          return forkJoin({
            assessment: this.assessmentsApi.get(clip.assessmentId),
            manifest: this.api.manifest(clip.id),
            annotations: this.api.annotations(clip.id),
          }).pipe(map((r): Loaded => ({ kind: 'ready', clip, ...r })));
        }),
      );
    },
  });
  /** The clinic's bands; the defaults while they cannot be loaded (the Measures tab says so, with Try again). */
  protected readonly bands = rxResource({ stream: () => this.bandsApi.list() });
  /** The athlete, for the name in the breadcrumb (the header says when it cannot be loaded, with Try again). */
  protected readonly athlete = rxResource({
    params: () => Number(this.athleteId()),
    stream: ({ params }) => this.athletesApi.get(params),
  });

  protected readonly ready = computed(() => {
    const v = this.loaded.hasValue() ? this.loaded.value() : null;
    return v?.kind === 'ready' ? v : null;
  });
  protected readonly notReady = computed(() => {
    const v = this.loaded.hasValue() ? this.loaded.value() : null;
    return v?.kind === 'not-ready' ? { clip: v.clip, status: clipStatusView(v.clip) } : null;
  });
  protected readonly notFound = computed(() => {
    const err = this.loaded.error();
    return errorStatus(err) === 404 || err instanceof NotHereError || err?.cause instanceof NotHereError;
  });
  /** Why the clinic's bands are missing (the defaults are shown meanwhile), or null. */
  protected readonly bandsError = computed(() => this.bands.error() ?? null);
  /** Why the athlete's name is missing, or null. */
  protected readonly athleteError = computed(() => this.athlete.error() ?? null);
  protected readonly athleteName = computed(() => {
    const a = this.athlete.hasValue() ? this.athlete.value() : null;
    return a ? fullName(a) : 'Athlete';
  });
  protected readonly assessmentLink = computed(() => ['/athletes', this.athleteId(), 'assessments', this.assessmentId()]);
  protected readonly profileLink = computed(() =>
    this.router.createUrlTree(['/athletes', this.athleteId()], { queryParams: { tab: 'assessments' } }),
  );

  protected readonly tabIndex = signal(0);
  protected readonly tools = TOOLS;
  protected readonly rates = PLAYBACK_RATES;
  protected readonly rateLabels = PLAYBACK_RATE_LABELS;
  protected readonly saveLabels = SAVE_STATE_LABELS;
  protected readonly saveIcons = SAVE_STATE_ICONS;
  protected readonly formatMs = formatMs;
  protected readonly errorMessage = errorMessage;
  protected readonly kindLabels = ASSESSMENT_KIND_LABELS;
  /** Last action in words, for screen readers. */
  protected readonly announcement = signal('');

  protected readonly zoomPercent = computed(() => this.viewer()?.zoomPercent() ?? 100);
  /** Frames extracted so far, as a share of the clip (the ready part of the scrubber while filling). */
  protected readonly readyPercent = computed(() =>
    this.store.frameCount() ? (this.store.available() / this.store.frameCount()) * 100 : 0,
  );
  protected readonly lastFrame = computed(() => Math.max(0, this.store.frameCount() - 1));
  /** Event ticks along the scrubber, as percentages. */
  protected readonly eventTicks = computed(() => {
    const last = this.lastFrame() || 1;
    return this.store.events().map((e) => ({
      id: `${e.frame}-${e.side}-${e.kind}`,
      left: (e.frame / last) * 100,
      side: e.side,
      proposed: e.origin === 'proposed',
    }));
  });

  /** Frames with low-confidence followed points, as percentages along the scrubber. */
  protected readonly checkTicks = computed(() => {
    const last = this.lastFrame() || 1;
    return this.following.lowFrames().map((frame) => ({ frame, left: (frame / last) * 100 }));
  });

  /** Frames where following could not follow a marker, as percentages along the scrubber. */
  protected readonly lostTicks = computed(() => {
    const last = this.lastFrame() || 1;
    return this.following.toCheck().frames.map((frame) => ({ frame, left: (frame / last) * 100 }));
  });

  private openedClip: number | null = null;

  constructor() {
    // Before any control: a clicked tab or toggle must not swallow the frame keys.
    listenToPageKeys((e, target) => this.onKeydown(e, target));
    // Open the workspace once everything has loaded.
    effect(() => {
      const r = this.ready();
      if (!r || this.openedClip === r.clip.id) return;
      this.openedClip = r.clip.id;
      const clipId = r.clip.id;
      const cache = new FrameCache({
        frameCount: r.manifest.frameCount,
        width: r.manifest.width,
        height: r.manifest.height,
        fetch: (n) => this.api.frame(clipId, n),
        decode: (blob) => createImageBitmap(blob),
      });
      this.store.open({ clip: r.clip, assessment: r.assessment, manifest: r.manifest }, r.annotations, cache);
    });
    effect(() => {
      const bands = this.bands.hasValue() ? this.bands.value() : null;
      this.store.bands.set(bands ?? DEFAULT_REFERENCE_BANDS);
    });
    // A scale line has been drawn: show the scale panel to enter its length.
    effect(() => {
      if (this.store.scaleDraftComplete() && this.store.tool() === 'scale') this.tabIndex.set(PANEL_TABS.indexOf('scale'));
    });
    // Frames arriving, extraction done or failed: the one progress stream of the athlete.
    toObservable(computed(() => Number(this.athleteId())))
      .pipe(
        switchMap((id) => {
          if (!Number.isInteger(id) || id <= 0) return EMPTY;
          let connections = 0;
          return this.progress.follow(id).pipe(
            // Only a reconnection can have missed something.
            filter((m) => m.type !== 'connected' || connections++ > 0),
            catchError(() => EMPTY),
          );
        }),
        takeUntilDestroyed(),
      )
      .subscribe((message) => this.onProgress(message));
    const title = inject(Title);
    effect(() => {
      const r = this.ready();
      if (r) title.setTitle(`Review ${r.clip.originalName} · ${this.athleteName()} · Trailframe`);
    });
  }

  /** Follows this clip's extraction: opens on its first frames, fills in, then takes the complete manifest. */
  private onProgress(message: ProcessingMessage): void {
    const clipId = Number(this.clipId());
    if (message.type === 'connected') {
      // Reconnected: finished while the connection was down? The clip says.
      if (this.ready() && this.store.filling()) this.finishWhenReady(clipId);
      return;
    }
    const e = message.event;
    if (e.subject !== 'clip' || e.id !== clipId) return;
    if (!this.ready()) {
      const opens = (e.state === 'running' && (e.progress?.done ?? 0) > 0) || e.state === 'ready' || e.state === 'failed';
      if (this.notReady() && opens && !this.loaded.isLoading()) this.loaded.reload();
      return;
    }
    if (!this.store.filling()) return;
    if (e.state === 'running' && e.progress) this.store.framesArrived(e.progress.done);
    else if (e.state === 'ready') this.finishWhenReady(clipId);
    else if (e.state === 'failed' || e.state === 'queued') this.retryLoad(); // shows why, or waits for the next attempt
  }

  /** Takes the complete manifest once the clip is ready. */
  private finishWhenReady(clipId: number): void {
    this.assessmentsApi
      .getClip(clipId)
      .pipe(
        switchMap((clip) => (clip.status === 'ready' ? this.api.manifest(clipId).pipe(map((manifest) => ({ clip, manifest }))) : EMPTY)),
      )
      .subscribe({
        next: ({ clip, manifest }) => this.store.extractionDone(clip, manifest),
        error: () => undefined, // the next event or reconnection tries again
      });
  }

  leaveWarning(): LeaveWarning | null {
    // An ended session sends the coach to sign in; the unsaved marks wait in this tab meanwhile.
    if (this.sync.sessionEnded()) return null;
    return this.store.hasUnsaved() ? UNSAVED_MARKS_WARNING : null;
  }

  protected onBeforeUnload(event: BeforeUnloadEvent): void {
    warnBeforeUnload(event, this.leaveWarning());
  }

  /** Every key press, heard before the focused control (see `listenToPageKeys`). */
  protected onKeydown(e: KeyboardEvent, target: FocusTarget | null): void {
    if (e.defaultPrevented || !this.ready() || this.dialog.openDialogs.length) return;
    const el = e.target instanceof HTMLElement ? e.target : null;
    if (el?.closest('.cdk-overlay-container')) return;
    const action = keyAction({ key: e.key, shiftKey: e.shiftKey, ctrlKey: e.ctrlKey, metaKey: e.metaKey, altKey: e.altKey, target });
    if (!action) return;
    e.preventDefault();
    // Frame keys are the page's alone: a focused tab, toggle or slider must not also act on them.
    if (FRAME_KEYS.has(e.key)) e.stopPropagation();
    this.run(action);
  }

  /** Carries out a key or toolbar action. */
  protected run(action: ReviewAction): void {
    const store = this.store;
    switch (action.type) {
      case 'step':
        store.step(action.by);
        break;
      case 'first':
        store.first();
        break;
      case 'last':
        store.last();
        break;
      case 'event-jump':
        if (!store.jumpToEvent(action.dir))
          this.say(action.dir < 0 ? 'No marked event before this frame' : 'No marked event after this frame', true);
        break;
      case 'check-jump':
        if (this.following.stepToCheck(action.dir)) {
          const here = this.following.missingHere().map((m) => m.text);
          this.say(`Frame ${store.frame()} to check. ${here.join(' ')}`);
        } else
          this.say(
            this.following.toCheck().frames.length ? 'No other frame to check' : 'No frame to check: every marker was followed',
            true,
          );
        break;
      case 'play':
        store.togglePlay();
        break;
      case 'speed':
        store.stepRate(action.dir);
        this.say(`Playback ${PLAYBACK_RATE_LABELS[store.rate()]} of real time`);
        break;
      case 'zoom':
        this.viewer()?.zoomBy(action.dir);
        break;
      case 'fit':
        this.viewer()?.fit();
        break;
      case 'angles':
        store.toggleAngles();
        this.say(store.showAngles() ? 'Angle labels shown' : 'Angle labels hidden');
        break;
      case 'landmark':
        store.chooseLandmark(LANDMARKS[action.index]);
        this.tabIndex.set(PANEL_TABS.indexOf('landmarks'));
        break;
      case 'side':
        store.toggleSide();
        this.say(`${store.side() === 'left' ? 'Left' : 'Right'} side`);
        break;
      case 'mark':
        store.toggleEvent(action.kind);
        this.say(store.historyLabels().undo ?? '');
        break;
      case 'copy-previous': {
        const from = store.copyPrevious();
        this.say(from === null ? 'No earlier marked frame to copy from' : `Copied the points of frame ${from}`, true);
        break;
      }
      case 'follow':
        if (this.following.canFollow()) {
          void this.following.follow();
          this.say('Following markers from this frame');
        } else
          this.say(
            this.following.running()
              ? 'Markers are being followed already'
              : 'Place landmarks on this frame first, and wait until they are saved',
            true,
          );
        break;
      case 'delete':
        if (this.gauges.removeSelected()) this.say('Angle gauge removed');
        else if (!store.removeSelected()) this.say('Select a point first (click it)', true);
        break;
      case 'undo': {
        const label = store.undo();
        this.say(label ? `Undone: ${label}` : 'Nothing to undo');
        break;
      }
      case 'redo': {
        const label = store.redo();
        this.say(label ? `Redone: ${label}` : 'Nothing to redo');
        break;
      }
      case 'escape':
        if (store.scaleDraft()) store.scaleDraft.set(null);
        else if (!this.gauges.cancel()) store.select(null);
        break;
      case 'tool':
        this.setTool(action.tool);
        break;
      case 'save-still':
        this.saveStill();
        break;
      case 'help':
        this.openHelp();
        break;
    }
  }

  /** "Save still": the current frame with its overlay, drawn on the server from the saved marks. */
  protected saveStill(): void {
    const r = this.ready();
    if (!r || this.dialog.openDialogs.length) return;
    const store = this.store;
    if (store.playing()) store.pause();
    const unsaved = store.hasUnsaved();
    if (unsaved) store.saveNow();
    const frame = store.frame();
    const when = formatDate(r.assessment.date, 'mediumDate', this.locale);
    // The frame's gait events in the same words as on the frame ("Right toe-off · step 3").
    const events = eventLineAt(store.events(), frame);
    void openSaveStill({ dialog: this.dialog, snackBar: this.snackBar, router: this.router }, Number(this.athleteId()), {
      clipId: r.clip.id,
      frameIndex: frame,
      what: `Frame ${frame} (${formatMs(store.timeMs())}) of the ${ASSESSMENT_KIND_LABELS[r.assessment.kind]} · ${when}, ${r.clip.originalName}`,
      showAngles: store.showAngles(),
      unsavedMarks: unsaved,
      caption: events ? `${events}.` : '',
    });
  }

  /** "Make clip": an annotated slow-motion clip of two strides around the current frame (the range can be changed). */
  protected makeClip(): void {
    const r = this.ready();
    if (!r || this.dialog.openDialogs.length) return;
    const store = this.store;
    if (store.playing()) store.pause();
    if (store.hasUnsaved()) store.saveNow();
    const contacts = { left: [] as number[], right: [] as number[] };
    for (const e of store.events()) if (e.kind === 'initial_contact') contacts[e.side].push(e.frame);
    const range = defaultClipRange(store.frame(), contacts, store.frameCount(), store.fps(), ANNOTATED_CLIP_MAX_SOURCE_FRAMES);
    const when = formatDate(r.assessment.date, 'mediumDate', this.locale);
    void openAnnotatedClipDialog({ dialog: this.dialog, snackBar: this.snackBar, router: this.router }, Number(this.athleteId()), {
      mode: 'single',
      clipId: r.clip.id,
      frameCount: store.frameCount(),
      fps: store.fps(),
      from: range.from,
      to: range.to,
      what: `${ASSESSMENT_KIND_LABELS[r.assessment.kind]} · ${when}, ${r.clip.originalName}`,
      showAngles: store.showAngles(),
    });
  }

  protected setTool(tool: ReviewTool): void {
    this.store.setTool(tool);
    if (tool === 'scale') this.tabIndex.set(PANEL_TABS.indexOf('scale'));
    // The Landmarks tab lists this frame's gauges too.
    if (tool === 'landmark' || tool === 'gauge') this.tabIndex.set(PANEL_TABS.indexOf('landmarks'));
    if (tool === 'gauge') this.say('Angle gauge: click the first arm’s end, then the vertex, then the other end');
  }

  protected setRate(rate: PlaybackRate): void {
    this.store.setRate(rate);
  }

  protected onScrub(value: number): void {
    if (this.store.playing()) this.store.pause();
    this.store.goTo(value);
  }

  protected openHelp(): void {
    this.dialog.open(KeyHelpDialog, { width: '720px', maxWidth: '95vw' });
  }

  protected retryLoad(): void {
    this.openedClip = null;
    this.loaded.reload();
  }

  /** Tells screen readers (and, for `visible`, everyone) what just happened. */
  private say(message: string, visible = false): void {
    this.announcement.set(message);
    if (visible && message) this.snackBar.open(message, undefined, { duration: 2000 });
  }
}

/** The clip exists but belongs to another assessment or athlete than the address says. */
class NotHereError extends Error {
  constructor() {
    super('This clip is not part of this assessment.');
  }
}
