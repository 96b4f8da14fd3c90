import { ChangeDetectionStrategy, Component, computed, inject, input } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatCardModule } from '@angular/material/card';
import { MatIconModule } from '@angular/material/icon';
import { RouterLink } from '@angular/router';
import { errorMessage } from '../../../core/api-error';
import { toIsoDate } from '../../../shared/dates';
import { LogOutbox } from '../../../core/data/log-outbox';
import { runningPlan } from '../../../shared/plan-words';
import { PlansApi } from '../../../core/data/plans-api';
import { historyRows, sessionLoggedOn } from '../../../core/data/portal-log';

/**
 * The portal home's "Your plan" card: current stage, whether today's session is done, unsent
 * entries, a link to today's session.
 */
@Component({
  selector: 'app-portal-plan-card',
  imports: [RouterLink, MatCardModule, MatButtonModule, MatIconModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  template: `
    <mat-card appearance="outlined" class="plan-card">
      <mat-card-content class="card-body">
        <mat-icon aria-hidden="true" class="card-icon">view_timeline</mat-icon>
        <div>
          <h2 class="card-title">Your plan</h2>
          @if (plan(); as p) {
            <p>
              <strong>{{ p.title }}</strong>
              @if (p.status === 'paused') {
                — paused by your clinician.
              } @else if (p.currentStagePosition) {
                — stage {{ p.currentStagePosition }} of {{ p.stageCount }}: {{ p.currentStageName }}.
              }
            </p>
            @if (doneToday()) {
              <p class="done"><mat-icon aria-hidden="true">task_alt</mat-icon>Today's session is done.</p>
            }
          } @else if (plans.hasValue()) {
            <p class="muted">Your clinician has not started an exercise plan for you yet.</p>
          } @else if (plans.error(); as error) {
            <p class="muted" role="alert">Couldn't load your plan just now: {{ errorMessage(error) }}</p>
          } @else {
            <p class="muted">Your exercise plan and today's session.</p>
          }
          @if (outbox.pending().length) {
            <p class="pending">
              <mat-icon aria-hidden="true">cloud_upload</mat-icon>{{ outbox.pending().length }} log
              {{ outbox.pending().length === 1 ? 'entry' : 'entries' }} waiting to send
            </p>
          }
        </div>
      </mat-card-content>
      @if (plans.error()) {
        <mat-card-actions align="end">
          <a mat-stroked-button routerLink="/portal/plan">Open my plan</a>
        </mat-card-actions>
      } @else if (plan()) {
        <mat-card-actions align="end">
          @if (doneToday()) {
            <a mat-stroked-button routerLink="/portal/plan">Open my plan</a>
          } @else {
            <a mat-flat-button routerLink="/portal/plan">Open today's session</a>
          }
        </mat-card-actions>
      }
    </mat-card>
  `,
  styles: `
    .card-body {
      display: flex;
      gap: 16px;
      align-items: flex-start;
    }
    .card-icon {
      color: var(--mat-sys-primary);
      flex: none;
    }
    .card-title {
      font: var(--mat-sys-title-medium);
      margin: 0 0 4px;
    }
    p {
      margin: 0 0 4px;
    }
    .pending,
    .done {
      display: flex;
      align-items: center;
      gap: 6px;
      font: var(--mat-sys-body-medium);
    }
  `,
})
export class PortalPlanCard {
  private readonly api = inject(PlansApi);
  protected readonly outbox = inject(LogOutbox);
  readonly athleteId = input.required<number>();
  protected readonly errorMessage = errorMessage;
  protected readonly plans = rxResource({ params: () => this.athleteId(), stream: ({ params }) => this.api.plansOf(params) });
  protected readonly plan = computed(() => (this.plans.hasValue() ? runningPlan(this.plans.value()) : null));
  private readonly logs = rxResource({ params: () => this.plan()?.id, stream: ({ params }) => this.api.logs(params) });
  private readonly today = toIsoDate(new Date())!;
  /** Whether today's session is logged (sent, or waiting on this phone). */
  protected readonly doneToday = computed(() => {
    const id = this.plan()?.id;
    const rows = historyRows(
      this.logs.hasValue() ? this.logs.value() : [],
      this.outbox.items().filter((i) => i.planId === id),
      [],
    );
    return sessionLoggedOn(rows, this.today) !== null;
  });
}
