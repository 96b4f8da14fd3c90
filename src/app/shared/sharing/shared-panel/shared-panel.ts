import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, DestroyRef, computed, inject, input, output, signal } from '@angular/core';
import { rxResource, takeUntilDestroyed } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSnackBar } from '@angular/material/snack-bar';
import { MatTooltipModule } from '@angular/material/tooltip';
import { filter, firstValueFrom, switchMap } from 'rxjs';
import type { AthleteSummary } from '../../../../contracts/api';
import { CAPTION_MAX, type Still, type VisitSummary } from '../../../../contracts/sharing';
import { errorMessage, errorStatus } from '../../../core/api-error';
import { ProcessingEvents } from '../../../core/processing-events';
import { EmptyState } from '../../states/empty-state';
import { InvitePrompt } from '../../invite-prompt/invite-prompt';
import { ErrorState } from '../../states/error-state';
import { MEASURES_CAUTION } from '../../caution';
import {
  downloadUrl,
  panelText,
  progressPercent,
  publishButton,
  publishConfirmText,
  sharedListStep,
  type SharedListStep,
  stillAlt,
  stillSrc,
  summaryStateText,
  textCount,
} from '../sharing-logic';
import { saveProblems } from '../sharing-errors';
import { openStillViewer } from '../still-viewer/still-viewer';
import { StillsApi } from '../../../core/data/stills-api';
import { SummaryDialog, type SummaryDialogData } from '../summary-dialog/summary-dialog';
import { SharedClips } from '../shared-clips/shared-clips';
import { followRenders } from '../follow-renders';
import { actionTracker } from '../action-tracker';

/** The caption being edited on one still's card. */
interface CaptionEdit {
  id: number;
  text: string;
  error: string | null;
  busy: boolean;
}

/**
 * The athlete profile's "Shared" tab (staff): the athlete's stills and visit summaries with
 * their rendering progress, publish / unpublish (with a confirmation that an e-mail notice goes
 * out), caption edits, delete, and "New visit summary". Renders are followed on the athlete's
 * progress stream (`ProcessingEvents`), like every processed item.
 */
@Component({
  selector: 'app-shared-panel',
  imports: [
    DatePipe,
    MatButtonModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
    MatProgressBarModule,
    MatTooltipModule,
    EmptyState,
    ErrorState,
    InvitePrompt,
    SharedClips,
  ],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './shared-panel.html',
  styleUrl: './shared-panel.scss',
})
export class SharedPanel {
  private readonly api = inject(StillsApi);
  private readonly dialog = inject(MatDialog);
  private readonly snackBar = inject(MatSnackBar);
  private readonly destroyRef = inject(DestroyRef);
  private readonly progress = inject(ProcessingEvents);

  readonly athleteId = input.required<number>();
  /** For the publish confirmation ("Ada Kestrel will see…"). */
  readonly athleteName = input('');
  /** The athlete, when the page has them: without an account, publishing prompts an invitation. */
  readonly athlete = input<AthleteSummary | null>(null);
  /** Emits after an invitation went out from the prompt (the page reloads the athlete). */
  readonly invited = output<void>();
  private readonly hasAccount = computed(() => this.athlete()?.hasAccount ?? true);

  protected readonly stills = rxResource({ params: () => this.athleteId(), stream: ({ params }) => this.api.stillsOf(params) });
  protected readonly summaries = rxResource({ params: () => this.athleteId(), stream: ({ params }) => this.api.summariesOf(params) });
  protected readonly stillList = computed<Still[]>(() => (this.stills.hasValue() ? this.stills.value() : []));
  protected readonly summaryList = computed<VisitSummary[]>(() => (this.summaries.hasValue() ? this.summaries.value() : []));
  protected readonly readyStills = computed(() => this.stillList().filter((s) => s.status === 'ready'));
  /** Requests on the way (their buttons wait) and what went wrong, by `still-<id>` / `summary-<id>`. */
  protected readonly actions = actionTracker<string>();
  protected readonly edit = signal<CaptionEdit | null>(null);
  protected readonly editCount = computed(() => textCount(this.edit()?.text ?? '', CAPTION_MAX));

  protected readonly captionMax = CAPTION_MAX;
  protected readonly caution = MEASURES_CAUTION;
  protected readonly publishButton = publishButton;
  protected readonly progressPercent = progressPercent;
  protected readonly panelText = panelText;
  protected readonly stillAlt = stillAlt;
  protected readonly stillSrc = stillSrc;
  protected readonly summaryStateText = summaryStateText;
  protected readonly downloadUrl = downloadUrl;
  protected readonly errorMessage = errorMessage;

  constructor() {
    followRenders(this.progress, this.athleteId, {
      connected: (again) => {
        // What finished while the connection was down, or before it first opened (a render
        // shown running that ended in between sends no more events), comes with a reload.
        const rendering = [...this.stillList(), ...this.summaryList()].some((i) => i.status === 'rendering');
        if (again || rendering) this.reload();
      },
      item: (event) => this.follow(sharedListStep(event, { stills: this.stillList(), summaries: this.summaryList() })),
    })
      .pipe(takeUntilDestroyed())
      .subscribe();
  }

  /** Carries out one step of following the renders. */
  private follow(step: SharedListStep): void {
    if (step.kind === 'ignore') return;
    if (step.kind === 'drop') {
      if (step.subject === 'still') this.stills.update((list) => list?.filter((s) => s.id !== step.id));
      else this.summaries.update((list) => list?.filter((s) => s.id !== step.id));
      return;
    }
    if (step.kind === 'progress') {
      const progress = step.progress;
      if (step.subject === 'still') this.stills.update((list) => list?.map((s) => (s.id === step.id ? { ...s, progress } : s)));
      else this.summaries.update((list) => list?.map((s) => (s.id === step.id ? { ...s, progress } : s)));
      return;
    }
    const gone = (err: unknown) => {
      if (errorStatus(err) === 404) this.follow({ ...step, kind: 'drop' });
    };
    if (step.subject === 'still') {
      this.api
        .getStill(step.id)
        .pipe(takeUntilDestroyed(this.destroyRef))
        .subscribe({ next: (still) => this.upsertStill(still), error: gone });
    } else {
      this.api
        .getSummary(step.id)
        .pipe(takeUntilDestroyed(this.destroyRef))
        .subscribe({ next: (summary) => this.upsertSummary(summary), error: gone });
    }
  }

  private upsertStill(still: Still): void {
    if (still.athleteId !== this.athleteId()) return;
    this.stills.update((list) =>
      list?.some((s) => s.id === still.id) ? list.map((s) => (s.id === still.id ? still : s)) : [still, ...(list ?? [])],
    );
  }

  private upsertSummary(summary: VisitSummary): void {
    if (summary.athleteId !== this.athleteId()) return;
    this.summaries.update((list) =>
      list?.some((s) => s.id === summary.id) ? list.map((s) => (s.id === summary.id ? summary : s)) : [summary, ...(list ?? [])],
    );
  }

  /** Reloads both lists (after something was added elsewhere, e.g. a still from the review). */
  reload(): void {
    this.stills.reload();
    this.summaries.reload();
  }

  private replaceStill(still: Still): void {
    this.stills.update((list) => list?.map((s) => (s.id === still.id ? still : s)));
  }

  private replaceSummary(summary: VisitSummary): void {
    this.summaries.update((list) => list?.map((s) => (s.id === summary.id ? summary : s)));
  }

  // ── Stills ──

  protected open(still: Still): void {
    const ready = this.readyStills();
    openStillViewer(this.dialog, ready, Math.max(0, ready.indexOf(still)));
  }

  protected async togglePublishStill(still: Still): Promise<void> {
    const button = publishButton(still);
    if (button.disabled) return;
    if (button.action === 'publish' && !(await this.actions.confirm(publishConfirmText('still', this.athleteName(), this.hasAccount()))))
      return;
    const saved = await this.actions.run(`still-${still.id}`, this.api.publishStill(still.id, button.action === 'publish'));
    if (!saved) return;
    this.replaceStill(saved);
    this.snackBar.open(saved.publishedAt ? 'Still published — the athlete gets an e-mail notice' : 'Still unpublished', undefined, {
      duration: 3000,
    });
  }

  protected async deleteStill(still: Still): Promise<void> {
    const ok = await this.actions.confirm({
      title: 'Delete this still?',
      message: still.publishedAt
        ? 'The athlete will no longer see it. Visit summaries already rendered keep their copy.'
        : 'It is removed for good.',
      confirmLabel: 'Delete still',
    });
    if (!ok) return;
    const done = await this.actions.run(`still-${still.id}`, this.api.deleteStill(still.id).pipe(switchMap(() => [true])));
    if (!done) return;
    this.stills.update((list) => list?.filter((s) => s.id !== still.id));
    if (this.edit()?.id === still.id) this.edit.set(null);
    this.snackBar.open('Still deleted', undefined, { duration: 3000 });
  }

  /** Renders a failed still again: the same frames, caption and angles as a new still, then drops the failed one. */
  protected async retryStill(still: Still): Promise<void> {
    const main = still.panels[still.panels.length - 1];
    if (!main) return;
    const pair = still.kind === 'pair' ? still.panels[0] : null;
    const created = await this.actions.run(
      `still-${still.id}`,
      this.api.createStill(main.clipId, {
        frameIndex: main.frameIndex,
        caption: still.caption,
        showAngles: still.showAngles,
        pairWith: pair ? { clipId: pair.clipId, frameIndex: pair.frameIndex } : null,
      }),
    );
    if (!created) return;
    this.stills.update((list) => [created, ...(list ?? []).filter((s) => s.id !== still.id)]);
    this.api
      .deleteStill(still.id)
      .pipe(takeUntilDestroyed(this.destroyRef))
      .subscribe({ error: () => this.stills.reload() });
  }

  protected startEdit(still: Still): void {
    this.edit.set({ id: still.id, text: still.caption, error: null, busy: false });
  }

  protected onEditText(text: string): void {
    this.edit.update((e) => (e ? { ...e, text, error: null } : e));
  }

  protected async saveEdit(): Promise<void> {
    const e = this.edit();
    if (!e || e.busy || this.editCount().over) return;
    this.edit.set({ ...e, busy: true });
    try {
      const saved = await firstValueFrom(this.api.updateStill(e.id, { caption: e.text.trim() }).pipe(takeUntilDestroyed(this.destroyRef)));
      this.replaceStill(saved);
      this.edit.set(null);
      this.snackBar.open('Caption saved', undefined, { duration: 2500 });
    } catch (err) {
      const { byField, general } = saveProblems(err, ['caption']);
      // Keep the typed caption; say what is wrong under it.
      this.edit.update((cur) => (cur && cur.id === e.id ? { ...cur, busy: false, error: byField['caption'] ?? general } : cur));
    }
  }

  // ── Visit summaries ──

  protected newSummary(): void {
    this.dialog
      .open<SummaryDialog, SummaryDialogData, VisitSummary>(SummaryDialog, {
        data: { athleteId: this.athleteId(), stills: this.readyStills() },
        width: '760px',
        maxWidth: '95vw',
        maxHeight: '92vh',
        autoFocus: 'first-tabbable',
        disableClose: true,
      })
      .afterClosed()
      .pipe(filter((s): s is VisitSummary => !!s))
      .subscribe((created) => {
        this.summaries.update((list) => [created, ...(list ?? [])]);
        this.snackBar.open('Visit summary started — rendering…', undefined, { duration: 3000 });
      });
  }

  protected async togglePublishSummary(summary: VisitSummary): Promise<void> {
    const button = publishButton(summary);
    if (button.disabled) return;
    if (button.action === 'publish' && !(await this.actions.confirm(publishConfirmText('summary', this.athleteName(), this.hasAccount()))))
      return;
    const saved = await this.actions.run(`summary-${summary.id}`, this.api.publishSummary(summary.id, button.action === 'publish'));
    if (!saved) return;
    this.replaceSummary(saved);
    this.snackBar.open(
      saved.publishedAt ? 'Visit summary published — the athlete gets an e-mail notice' : 'Visit summary unpublished',
      undefined,
      { duration: 3000 },
    );
  }

  protected async deleteSummary(summary: VisitSummary): Promise<void> {
    const ok = await this.actions.confirm({
      title: 'Delete this visit summary?',
      message: summary.publishedAt
        ? 'The athlete will no longer see it. The stills it shows stay.'
        : 'The PDF is removed for good. The stills it shows stay.',
      confirmLabel: 'Delete summary',
    });
    if (!ok) return;
    const done = await this.actions.run(`summary-${summary.id}`, this.api.deleteSummary(summary.id).pipe(switchMap(() => [true])));
    if (!done) return;
    this.summaries.update((list) => list?.filter((s) => s.id !== summary.id));
    this.snackBar.open('Visit summary deleted', undefined, { duration: 3000 });
  }

  /** Renders a failed summary again with the same text and stills, then drops the failed one. */
  protected async retrySummary(summary: VisitSummary): Promise<void> {
    const created = await this.actions.run(
      `summary-${summary.id}`,
      this.api.createSummary(summary.assessmentId, {
        baselineAssessmentId: summary.baselineAssessmentId,
        findings: summary.findings,
        planText: summary.planText,
        stillIds: summary.stillIds,
      }),
    );
    if (!created) return;
    this.summaries.update((list) => [created, ...(list ?? []).filter((s) => s.id !== summary.id)]);
    this.api
      .deleteSummary(summary.id)
      .pipe(takeUntilDestroyed(this.destroyRef))
      .subscribe({ error: () => this.summaries.reload() });
  }
}
