import { DatePipe, LowerCasePipe, formatDate } from '@angular/common';
import {
  ChangeDetectionStrategy,
  Component,
  DestroyRef,
  ElementRef,
  LOCALE_ID,
  computed,
  effect,
  inject,
  input,
  linkedSignal,
  signal,
  viewChild,
} from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { FormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatButtonToggleModule } from '@angular/material/button-toggle';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import { MatTooltipModule } from '@angular/material/tooltip';
import { MatDialog } from '@angular/material/dialog';
import { MatSnackBar } from '@angular/material/snack-bar';
import { Router, RouterLink } from '@angular/router';
import { CategoryScale, Chart, Legend, LineController, LineElement, LinearScale, PointElement, Tooltip } from 'chart.js';
import { BaseChartDirective } from 'ng2-charts';
import { catchError, forkJoin, from, map, of, switchMap } from 'rxjs';
import { GAIT_EVENT_KINDS, GAIT_EVENT_LABELS, type ClipAnnotations, type GaitEventKind } from '../../../../contracts/annotations';
import type { Assessment } from '../../../../contracts/api';
import { ASSESSMENT_KIND_LABELS, SIDES, type Side } from '../../../../contracts/assessment';
import type { ComparisonClip, ComparisonRow, MeasureKey } from '../../../../contracts/measures';
import { errorMessage } from '../../../core/api-error';
import { pageTakesKey, type FocusTarget } from '../../../shared/keys/key-routing';
import { listenToPageKeys } from '../../../shared/keys/page-keys';
import { EmptyState } from '../../../shared/states/empty-state';
import { ErrorState } from '../../../shared/states/error-state';
import { AssessmentsApi } from '../../../core/data/assessments-api';
import { AthletesApi } from '../../../core/data/athletes-api';
import { fullName } from '../../../core/data/roster';
import { ClipManifest, ReviewApi } from '../../../core/data/review-api';
import { GHOST_COLOURS, OVERLAY_COLOURS } from '../../../../kinematics';
import { openSaveStill } from '../../../shared/sharing/save-still-dialog/save-still-dialog';
import { openAnnotatedClipDialog } from '../../../shared/sharing/annotated-clip-dialog/annotated-clip-dialog';
import { CompareApi } from '../compare-api';
import { drawCompareFrame } from '../compare-canvas';
import {
  CAUTION_LINE,
  COMPARE_FRAME_KEYS,
  alignAtHip,
  citationText,
  defaultPair,
  eventFrames,
  formatValue,
  frameOfStep,
  landmarksAt,
  lastCommonStep,
  sidedLabel,
  sideText,
  stepKey,
  verdictText,
} from '../compare-logic';
import { TREND_SIDE_STYLE, trendChart, unitTitle } from '../trend-chart';
import { compareCycleSeries, type CycleVisit } from '../compare-cycles';
import { GaitCycleChart } from '../../../shared/gait-cycle-chart/gait-cycle-chart';

// Only the chart.js parts this line chart uses.
Chart.register(LineController, LineElement, PointElement, LinearScale, CategoryScale, Tooltip, Legend);

interface LoadedClip {
  clip: ComparisonClip;
  manifest: ClipManifest;
  annotations: ClipAnnotations;
}

interface ShownFrame {
  loaded: LoadedClip;
  frame: number;
  bitmap: ImageBitmap;
}

/**
 * `/athletes/:athleteId/compare` (staff): two visits side by side at the same gait event, or both
 * skeletons on one frame aligned at the hip; every measure with its change and whether the change
 * is beyond the published measurement error; trends across all visits.
 */
@Component({
  selector: 'app-compare-page',
  imports: [
    DatePipe,
    LowerCasePipe,
    FormsModule,
    RouterLink,
    BaseChartDirective,
    MatButtonModule,
    MatButtonToggleModule,
    MatFormFieldModule,
    MatIconModule,
    MatProgressBarModule,
    MatSelectModule,
    MatTooltipModule,
    EmptyState,
    ErrorState,
    GaitCycleChart,
  ],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './compare-page.html',
  styleUrl: './compare-page.scss',
})
export class ComparePage {
  private readonly api = inject(CompareApi);
  private readonly assessmentsApi = inject(AssessmentsApi);
  private readonly athletesApi = inject(AthletesApi);
  private readonly reviewApi = inject(ReviewApi);
  private readonly dialog = inject(MatDialog);
  private readonly snackBar = inject(MatSnackBar);
  private readonly router = inject(Router);
  private readonly locale = inject(LOCALE_ID);

  readonly athleteId = input.required<string>();
  protected readonly id = computed(() => Number(this.athleteId()));

  protected readonly kindLabels = ASSESSMENT_KIND_LABELS;
  protected readonly eventKinds = GAIT_EVENT_KINDS;
  protected readonly eventLabels = GAIT_EVENT_LABELS;
  protected readonly sides = SIDES;
  protected readonly sideText = sideText;
  protected readonly verdictText = verdictText;
  protected readonly overlayColours = OVERLAY_COLOURS;
  protected readonly ghostColours = GHOST_COLOURS;
  protected readonly trendSideStyle = TREND_SIDE_STYLE;
  protected readonly citationText = citationText;
  protected readonly formatValue = formatValue;
  protected readonly errorMessage = errorMessage;
  protected readonly caution = CAUTION_LINE;

  /** The athlete's name for the breadcrumb; the page works without it. */
  private readonly athlete = rxResource({
    params: () => this.id(),
    stream: ({ params }) => this.athletesApi.get(params).pipe(catchError(() => of(null))),
  });
  protected readonly athleteName = computed(() => {
    const a = this.athlete.hasValue() ? this.athlete.value() : null;
    return a ? fullName(a) : 'Athlete';
  });

  protected readonly assessments = rxResource({
    params: () => this.id(),
    stream: ({ params }) => this.assessmentsApi.list(params),
  });
  private readonly list = computed<Assessment[]>(() => (this.assessments.hasValue() ? this.assessments.value() : []));
  protected readonly baselineId = linkedSignal(() => defaultPair(this.list()).baseline);
  protected readonly retestId = linkedSignal(() => defaultPair(this.list()).retest);

  protected readonly comparison = rxResource({
    params: () =>
      this.assessments.hasValue() && this.list().length >= 2 && this.baselineId() !== null && this.retestId() !== null
        ? { athlete: this.id(), baseline: this.baselineId()!, retest: this.retestId()! }
        : undefined,
    stream: ({ params }) => this.api.comparison(params.athlete, params.baseline, params.retest),
  });
  protected readonly rows = computed<ComparisonRow[]>(() => (this.comparison.hasValue() ? this.comparison.value().rows : []));

  // ── Viewer ──
  protected readonly side = signal<Side>('right');
  /** Opens at toe-off, where the headline measure (hip extension at toe-off) is read. */
  protected readonly eventKind = signal<GaitEventKind>('toe_off');
  protected readonly step = signal(0);
  protected readonly mode = signal<'side_by_side' | 'overlay'>('side_by_side');

  private pickClip(clips: ComparisonClip[] | undefined): ComparisonClip | null {
    if (!clips?.length) return null;
    return clips.find((c) => c.nearSide === this.side()) ?? clips[0]!;
  }
  // A refused pair (e.g. the same visit twice) leaves the resource in error, where value() throws.
  private readonly baselineClip = computed(() =>
    this.pickClip(this.comparison.hasValue() ? this.comparison.value().baselineClips : undefined),
  );
  private readonly retestClip = computed(() => this.pickClip(this.comparison.hasValue() ? this.comparison.value().retestClips : undefined));

  private loadClip(clip: ComparisonClip) {
    return forkJoin({ manifest: this.reviewApi.manifest(clip.id), annotations: this.reviewApi.annotations(clip.id) }).pipe(
      map((r): LoadedClip => ({ clip, ...r })),
    );
  }
  protected readonly baselineLoaded = rxResource({
    params: () => this.baselineClip() ?? undefined,
    stream: ({ params }) => this.loadClip(params),
  });
  protected readonly retestLoaded = rxResource({
    params: () => this.retestClip() ?? undefined,
    stream: ({ params }) => this.loadClip(params),
  });

  // Read only when loaded: a clip whose manifest or marks failed (e.g. deleted meanwhile) leaves its resource in error.
  private readonly baselineData = computed(() => (this.baselineLoaded.hasValue() ? this.baselineLoaded.value() : undefined));
  private readonly retestData = computed(() => (this.retestLoaded.hasValue() ? this.retestLoaded.value() : undefined));

  private framesOf(loaded: LoadedClip | undefined): number[] {
    return loaded ? eventFrames(loaded.annotations.events, this.side(), this.eventKind()) : [];
  }
  protected readonly baselineFrames = computed(() => this.framesOf(this.baselineData()));
  protected readonly retestFrames = computed(() => this.framesOf(this.retestData()));
  protected readonly lastStep = computed(() => lastCommonStep(this.baselineFrames(), this.retestFrames()));

  private loadFrame(loaded: LoadedClip | undefined, frames: number[]) {
    const frame = frameOfStep(frames, this.step());
    return loaded && frame !== null ? { loaded, frame } : undefined;
  }
  private readonly frameStream = ({ params }: { params: { loaded: LoadedClip; frame: number } }) =>
    this.reviewApi.frame(params.loaded.clip.id, params.frame).pipe(
      switchMap((blob) => from(createImageBitmap(blob))),
      map((bitmap): ShownFrame => ({ ...params, bitmap })),
    );
  protected readonly baselineFrame = rxResource({
    params: () => this.loadFrame(this.baselineData(), this.baselineFrames()),
    stream: this.frameStream,
  });
  protected readonly retestFrame = rxResource({
    params: () => this.loadFrame(this.retestData(), this.retestFrames()),
    stream: this.frameStream,
  });
  /** The frames on show, or undefined while loading or failed. */
  protected readonly baselineShown = computed(() => (this.baselineFrame.hasValue() ? this.baselineFrame.value() : undefined));
  protected readonly retestShown = computed(() => (this.retestFrame.hasValue() ? this.retestFrame.value() : undefined));
  /** Why the clips' frames or marks did not load (the first failure), or null. */
  protected readonly framesProblem = computed(() => {
    const err = this.baselineLoaded.error() ?? this.retestLoaded.error() ?? this.baselineFrame.error() ?? this.retestFrame.error();
    return err ? errorMessage(err) : null;
  });

  private readonly baselineCanvas = viewChild<ElementRef<HTMLCanvasElement>>('baselineCanvas');
  private readonly retestCanvas = viewChild<ElementRef<HTMLCanvasElement>>('retestCanvas');
  private readonly overlayCanvas = viewChild<ElementRef<HTMLCanvasElement>>('overlayCanvas');

  // ── Gait-cycle curves of the chosen side, baseline and re-test together ──
  private cycleVisit(loaded: LoadedClip | undefined): CycleVisit | null {
    return loaded
      ? {
          annotations: loaded.annotations,
          frameSize: { width: loaded.manifest.width, height: loaded.manifest.height },
          direction: loaded.clip.direction,
        }
      : null;
  }
  protected readonly cycleSeries = computed(() =>
    compareCycleSeries(this.cycleVisit(this.baselineData()), this.cycleVisit(this.retestData()), this.side()),
  );

  // ── Trends ──
  protected readonly trendKeys = signal<MeasureKey[]>(['hip_extension_toe_off']);
  protected readonly measureChoices = computed(() => {
    const seen = new Map<MeasureKey, string>();
    for (const r of this.rows()) if (!seen.has(r.key)) seen.set(r.key, r.label);
    return [...seen].map(([key, label]) => ({ key, label }));
  });
  protected readonly trends = rxResource({
    params: () => (this.trendKeys().length && this.list().length ? { athlete: this.id(), keys: this.trendKeys() } : undefined),
    stream: ({ params }) => this.api.trends(params.athlete, params.keys),
  });
  /** Lines per measure and side (colour and dash by side, marker by measure), one axis per unit. */
  protected readonly trendChart = computed(() => {
    const t = this.trends.hasValue() ? this.trends.value() : undefined;
    return t
      ? trendChart(
          t,
          this.trendKeys(),
          t.points.map((p) => this.visitLabel(p.date, p.kind)),
        )
      : null;
  });
  protected readonly unitTitle = unitTitle;

  /** CSS width of the frames, so labels are redrawn at their view size when the layout changes. */
  private readonly viewWidth = signal(0);

  constructor() {
    // Before any control: a clicked toggle or button must not swallow the step keys.
    listenToPageKeys((e, target) => this.onKey(e, target));
    const resize = new ResizeObserver((entries) => this.viewWidth.set(Math.round(entries[0]?.contentRect.width ?? 0)));
    inject(DestroyRef).onDestroy(() => resize.disconnect());
    let watched: Element | null = null;
    effect(() => {
      const mode = this.mode();
      const base = this.baselineShown();
      const re = this.retestShown();
      this.viewWidth();
      const bc = this.baselineCanvas()?.nativeElement;
      const rc = this.retestCanvas()?.nativeElement;
      const oc = this.overlayCanvas()?.nativeElement;
      const watch = (mode === 'side_by_side' ? rc : oc) ?? null;
      if (watch !== watched) {
        if (watched) resize.unobserve(watched);
        if (watch) resize.observe(watch);
        watched = watch;
      }
      if (mode === 'side_by_side') {
        if (bc) drawCompareFrame(bc, this.asFrame(base), null);
        if (rc) drawCompareFrame(rc, this.asFrame(re), null);
      } else if (oc) {
        const shown = this.asFrame(re);
        const target = shown?.landmarks.find((r) => r.side === this.side())?.points.hip ?? null;
        const ghost = base ? alignAtHip(landmarksAt(base.loaded.annotations.landmarks, base.frame), this.side(), target) : null;
        drawCompareFrame(oc, shown, ghost);
      }
    });
  }

  private asFrame(shown: ShownFrame | undefined) {
    if (!shown) return null;
    const { loaded, frame, bitmap } = shown;
    return {
      bitmap,
      frameSize: { width: loaded.manifest.width, height: loaded.manifest.height },
      landmarks: landmarksAt(loaded.annotations.landmarks, frame),
      nearSide: loaded.clip.nearSide,
      direction: loaded.clip.direction,
    };
  }

  /** Try again after the frames or marks failed: loads what failed once more. */
  protected reloadFrames(): void {
    for (const r of [this.baselineLoaded, this.retestLoaded, this.baselineFrame, this.retestFrame]) if (r.error()) r.reload();
  }

  protected move(delta: number): void {
    const last = this.lastStep();
    if (last < 0) return;
    this.step.set(Math.max(0, Math.min(last, this.step() + delta)));
  }

  /** "Save still of the pair": the Re-test's frame with the Baseline's beside it (baseline first). */
  protected saveStill(): void {
    const base = this.baselineShown();
    const re = this.retestShown();
    const cmp = this.comparison.hasValue() ? this.comparison.value() : undefined;
    if (!base || !re || !cmp) return;
    void openSaveStill({ dialog: this.dialog, snackBar: this.snackBar, router: this.router }, this.id(), {
      clipId: re.loaded.clip.id,
      frameIndex: re.frame,
      pairWith: { clipId: base.loaded.clip.id, frameIndex: base.frame },
      what: `Side by side: Baseline ${cmp.baseline.date} frame ${base.frame} and Re-test ${cmp.retest.date} frame ${re.frame} (${GAIT_EVENT_LABELS[this.eventKind()].toLowerCase()}, ${sideText(this.side()).toLowerCase()} side, step ${this.step() + 1})`,
      showAngles: true,
    });
  }

  /** "Side-by-side clip": both visits' clips in slow motion, lined up at each step's initial contact. */
  protected makeSideBySide(): void {
    const base = this.baselineShown();
    const re = this.retestShown();
    const cmp = this.comparison.hasValue() ? this.comparison.value() : undefined;
    if (!base || !re || !cmp) return;
    void openAnnotatedClipDialog({ dialog: this.dialog, snackBar: this.snackBar, router: this.router }, this.id(), {
      mode: 'side_by_side',
      athleteId: this.id(),
      baselineClipId: base.loaded.clip.id,
      retestClipId: re.loaded.clip.id,
      what: `Side by side: Baseline ${cmp.baseline.date} and Re-test ${cmp.retest.date}, lined up at each initial contact`,
      showAngles: true,
    });
  }

  /** Every key press, heard before the focused control: the step keys move both visits. */
  protected onKey(event: KeyboardEvent, target: FocusTarget | null): void {
    if (event.defaultPrevented || this.dialog.openDialogs.length || event.ctrlKey || event.metaKey || event.altKey) return;
    if (event.target instanceof HTMLElement && event.target.closest('.cdk-overlay-container')) return;
    const delta = stepKey(event.key);
    if (!delta || !pageTakesKey(event.key, target, COMPARE_FRAME_KEYS)) return;
    event.preventDefault();
    event.stopPropagation();
    this.move(delta);
  }

  protected setSide(side: Side): void {
    this.side.set(side);
    this.step.set(0);
  }

  protected setEventKind(kind: GaitEventKind): void {
    this.eventKind.set(kind);
    this.step.set(0);
  }

  protected assessmentLabel(a: Assessment): string {
    return this.visitLabel(a.date, a.kind);
  }

  /** "Baseline · 6 Oct 2026", dated as in the stills and visit summaries. */
  private visitLabel(date: string, kind: Assessment['kind']): string {
    return `${ASSESSMENT_KIND_LABELS[kind]} · ${formatDate(date, 'd MMM y', this.locale)}`;
  }

  protected rowLabel(r: ComparisonRow): string {
    return sidedLabel(r.label, r.side);
  }

  protected verdictClass(r: ComparisonRow): string {
    return `verdict verdict-${r.verdict.replaceAll('_', '-')}`;
  }
}
