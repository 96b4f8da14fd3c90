import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, effect, inject, input, signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { Title } from '@angular/platform-browser';
import { MatButtonModule } from '@angular/material/button';
import { MatCardModule } from '@angular/material/card';
import { MatDialog } from '@angular/material/dialog';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSnackBar } from '@angular/material/snack-bar';
import { Router, RouterLink } from '@angular/router';
import { firstValueFrom, throwError } from 'rxjs';
import type { AthleteSummary } from '../../../../contracts/api';
import type { PlanAction, PlanDetail, PlanStage } from '../../../../contracts/plans';
import { PAIN_ALERT_LABELS, PLAN_STATUS_LABELS } from '../../../../contracts/plans';
import { describeCriterion } from '../../../../plans-rules';
import { errorMessage, errorStatus } from '../../../core/api-error';
import { ConfirmDialog, ConfirmDialogData } from '../../../shared/confirm-dialog/confirm-dialog';
import { ErrorState } from '../../../shared/states/error-state';
import { AthletesApi } from '../../../core/data/athletes-api';
import { InvitePrompt } from '../../../shared/invite-prompt/invite-prompt';
import { fullName } from '../../../core/data/roster';
import { AdherenceList } from '../adherence-list/adherence-list';
import { ExerciseCard } from '../exercise-card/exercise-card';
import { PainChart } from '../pain-chart/pain-chart';
import { PainRuleDialog } from '../pain-rule-dialog/pain-rule-dialog';
import { PlanCaution } from '../../../shared/plan-caution/plan-caution';
import { startPlanMessage, statusClass } from '../../../shared/plan-words';
import { PlansApi } from '../../../core/data/plans-api';

const CONFIRM: Partial<Record<PlanAction, (p: PlanDetail, next: PlanStage | null, athlete: AthleteSummary | null) => ConfirmDialogData>> = {
  start: (p, _next, athlete) => ({ title: 'Start this plan?', message: startPlanMessage(p.title, athlete), confirmLabel: 'Start plan' }),
  advance: (_p, next) => ({
    title: `Move to “${next?.name ?? 'the next stage'}”?`,
    message: 'The athlete sees the new stage’s exercises from now on. Sessions already logged stay with the earlier stage.',
    confirmLabel: 'Move to next stage',
  }),
  finish: (p) => ({
    title: 'Finish this plan?',
    message: `${p.title} ends: the athlete can no longer log sessions on it. Its log and charts stay.`,
    confirmLabel: 'Finish plan',
  }),
};

/** `/plans/:id` (staff): stages and doses, status actions, adherence, pain chart, alerts and log. */
@Component({
  selector: 'app-plan-page',
  imports: [
    DatePipe,
    RouterLink,
    MatButtonModule,
    MatCardModule,
    MatIconModule,
    MatProgressBarModule,
    ErrorState,
    AdherenceList,
    ExerciseCard,
    PainChart,
    PlanCaution,
    InvitePrompt,
  ],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './plan-page.html',
  styleUrl: './plan-page.scss',
})
export class PlanPage {
  private readonly api = inject(PlansApi);
  private readonly athletesApi = inject(AthletesApi);
  private readonly dialog = inject(MatDialog);
  private readonly snackBar = inject(MatSnackBar);
  private readonly router = inject(Router);

  readonly id = input.required<string>();
  private readonly planId = computed(() => Number(this.id()));

  protected readonly plan = rxResource({
    params: () => this.planId(),
    stream: ({ params }) =>
      Number.isInteger(params) && params > 0 ? this.api.plan(params) : throwError(() => new Error('Not a valid plan address.')),
  });
  protected readonly progress = rxResource({
    params: () => (this.plan.hasValue() ? { id: this.plan.value().id, at: this.plan.value().updatedAt } : undefined),
    stream: ({ params }) => this.api.progress(params.id),
  });
  protected readonly logs = rxResource({
    params: () => (this.plan.hasValue() ? { id: this.plan.value().id, at: this.plan.value().updatedAt } : undefined),
    stream: ({ params }) => this.api.logs(params.id),
  });
  protected readonly athlete = rxResource({
    params: () => (this.plan.hasValue() ? this.plan.value().athleteId : undefined),
    stream: ({ params }) => this.athletesApi.get(params),
  });

  protected readonly detail = computed(() => (this.plan.hasValue() ? this.plan.value() : null));
  protected readonly name = computed(() => (this.athlete.hasValue() ? fullName(this.athlete.value()) : ''));
  protected readonly current = computed(() => this.detail()?.stages.find((s) => s.id === this.detail()?.currentStageId) ?? null);
  protected readonly nextStage = computed(() => {
    const d = this.detail();
    const c = this.current();
    return d && c ? (d.stages.find((s) => s.position > c.position) ?? null) : null;
  });
  protected readonly prog = computed(() => (this.progress.hasValue() ? this.progress.value() : null));
  protected readonly suggestion = computed(() => {
    const p = this.prog()?.progression;
    return p?.ready && this.detail()?.status === 'active' ? p : null;
  });
  protected readonly busy = signal(false);
  protected readonly notFound = computed(() => errorStatus(this.plan.error()) === 404);

  protected readonly statusLabels = PLAN_STATUS_LABELS;
  protected readonly alertLabels = PAIN_ALERT_LABELS;
  protected readonly statusClass = statusClass;
  protected readonly describe = describeCriterion;
  protected readonly errorMessage = errorMessage;

  constructor() {
    const title = inject(Title);
    effect(() => {
      const d = this.detail();
      if (d) title.setTitle(`${d.title} · Trailframe`);
    });
  }

  /** The check of a criterion of the current stage, when the server evaluated it. */
  protected checkOf(stage: PlanStage, index: number) {
    const p = this.prog()?.progression;
    return p && p.stageId === stage.id ? (p.checks[index] ?? null) : null;
  }

  protected act(action: PlanAction): void {
    const d = this.detail();
    if (!d || this.busy()) return;
    const ask = CONFIRM[action];
    if (!ask) {
      void this.run(d, action);
      return;
    }
    this.dialog
      .open<ConfirmDialog, ConfirmDialogData, boolean>(ConfirmDialog, {
        data: ask(d, this.nextStage(), this.athlete.hasValue() ? this.athlete.value() : null),
        width: '460px',
        maxWidth: '95vw',
      })
      .afterClosed()
      .subscribe((yes) => {
        if (yes) void this.run(d, action);
      });
  }

  private async run(d: PlanDetail, action: PlanAction): Promise<void> {
    this.busy.set(true);
    try {
      const updated = await firstValueFrom(this.api.transition(d.id, action));
      this.plan.set(updated);
      const words: Record<PlanAction, string> = {
        start: 'Plan started',
        advance: `Moved to “${updated.currentStageName}”`,
        pause: 'Plan paused',
        resume: 'Plan resumed',
        finish: 'Plan finished',
      };
      this.snackBar.open(words[action], 'OK', { duration: 3000 });
    } catch {
      // The error snackbar says why (e.g. another plan is running).
    } finally {
      this.busy.set(false);
    }
  }

  protected editRule(): void {
    const d = this.detail();
    if (!d) return;
    this.dialog
      .open<PainRuleDialog, PlanDetail, PlanDetail>(PainRuleDialog, { data: d, width: '560px', maxWidth: '95vw' })
      .afterClosed()
      .subscribe((updated) => {
        if (!updated) return;
        this.plan.set(updated);
        this.snackBar.open('Pain rule saved', 'OK', { duration: 3000 });
      });
  }

  protected remove(): void {
    const d = this.detail();
    if (!d) return;
    this.dialog
      .open<ConfirmDialog, ConfirmDialogData, boolean>(ConfirmDialog, {
        data: {
          title: 'Delete this draft?',
          message: `${d.title} and its stages are deleted. This cannot be undone.`,
          confirmLabel: 'Delete draft',
        },
        width: '440px',
        maxWidth: '95vw',
      })
      .afterClosed()
      .subscribe((yes) => {
        if (!yes) return;
        this.api.deletePlan(d.id).subscribe(() => {
          this.snackBar.open('Draft deleted', 'OK', { duration: 3000 });
          void this.router.navigate(['/athletes', d.athleteId], { queryParams: { tab: 'plan' } });
        });
      });
  }

  protected setsText(sets: { setsDone: number; setsPrescribed: number }[]): string {
    const done = sets.reduce((s, x) => s + Math.min(x.setsDone, x.setsPrescribed), 0);
    const of = sets.reduce((s, x) => s + x.setsPrescribed, 0);
    return `${done} of ${of}`;
  }
}
