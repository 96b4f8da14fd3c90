import { DatePipe } from '@angular/common';
import {
  afterNextRender,
  ChangeDetectionStrategy,
  Component,
  computed,
  effect,
  ElementRef,
  inject,
  Injector,
  signal,
  untracked,
} from '@angular/core';
import { rxResource, takeUntilDestroyed } from '@angular/core/rxjs-interop';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCardModule } from '@angular/material/card';
import { MatDatepickerModule } from '@angular/material/datepicker';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSnackBar } from '@angular/material/snack-bar';
import type { LogWrite, PlanStage } from '../../../../contracts/plans';
import { PLAN_LIMITS } from '../../../../contracts/plans';
import { addDays } from '../../../../plans-rules';
import { errorMessage } from '../../../core/api-error';
import { AuthStore } from '../../../core/auth-store';
import { LeaveGuarded, LeaveWarning, warnBeforeUnload } from '../../../core/leave-guard';
import { parseIsoDate, toIsoDate } from '../../../shared/dates';
import { errorText } from '../../../shared/forms/error-text';
import { EmptyState } from '../../../shared/states/empty-state';
import { ErrorState } from '../../../shared/states/error-state';
import { ExerciseCard } from '../exercise-card/exercise-card';
import { LogOutbox } from '../../../core/data/log-outbox';
import { retargetLog } from '../../../core/data/log-outbox-queue';
import { PlanCaution } from '../../../shared/plan-caution/plan-caution';
import { morningCheckDue, newLogKey, painAboveLimitText, runningPlan } from '../../../shared/plan-words';
import { CautionNote } from '../../../shared/caution-note/caution-note';
import { PlansApi } from '../../../core/data/plans-api';
import { entriesForMorning, historyRows, sessionLoggedOn } from '../../../core/data/portal-log';

const PAIN_SCALE = Array.from({ length: 11 }, (_, i) => i);

/**
 * `/portal/plan` (athlete, phone first): today's session of the current stage — exercises with
 * doses, instructions and cautions, sets to tick, pain during and a note — the one-tap morning
 * check, and the history of their own log. Sessions go through the outbox: saved on the phone
 * first, sent with retries, never twice.
 */
@Component({
  selector: 'app-portal-plan',
  imports: [
    DatePipe,
    ReactiveFormsModule,
    MatButtonModule,
    MatCardModule,
    MatDatepickerModule,
    MatFormFieldModule,
    MatInputModule,
    MatIconModule,
    MatProgressBarModule,
    EmptyState,
    ErrorState,
    ExerciseCard,
    PlanCaution,
    CautionNote,
  ],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './portal-plan.html',
  styleUrl: './portal-plan.scss',
  host: { '(window:beforeunload)': 'onBeforeUnload($event)' },
})
export class PortalPlan implements LeaveGuarded {
  private readonly api = inject(PlansApi);
  private readonly auth = inject(AuthStore);
  private readonly snackBar = inject(MatSnackBar);
  protected readonly outbox = inject(LogOutbox);
  private readonly fb = inject(NonNullableFormBuilder);
  private readonly host = inject<ElementRef<HTMLElement>>(ElementRef);
  private readonly injector = inject(Injector);

  protected readonly athleteId = computed(() => this.auth.user()?.athleteId ?? null);
  protected readonly plans = rxResource({
    params: () => this.athleteId() ?? undefined,
    stream: ({ params }) => this.api.plansOf(params),
  });
  protected readonly summary = computed(() => (this.plans.hasValue() ? runningPlan(this.plans.value()) : null));
  protected readonly plan = rxResource({
    params: () => this.summary()?.id,
    stream: ({ params }) => this.api.plan(params),
  });
  protected readonly logs = rxResource({
    params: () => this.summary()?.id,
    stream: ({ params }) => this.api.logs(params),
  });
  protected readonly detail = computed(() => (this.plan.hasValue() ? this.plan.value() : null));
  protected readonly stage = computed<PlanStage | null>(
    () => this.detail()?.stages.find((s) => s.id === this.detail()?.currentStageId) ?? null,
  );

  protected readonly today = signal(toIsoDate(new Date())!);
  protected readonly earliest = computed(() => parseIsoDate(addDays(this.today(), -PLAN_LIMITS.logBackdateDays)));
  protected readonly latest = computed(() => parseIsoDate(this.today()));

  protected readonly form = this.fb.group({
    date: this.fb.control<Date | null>(parseIsoDate(this.today()), Validators.required),
    painDuring: this.fb.control<number | null>(null, Validators.required),
    note: this.fb.control('', Validators.maxLength(PLAN_LIMITS.text.logNote)),
  });
  /** Sets ticked per stage exercise id. */
  protected readonly ticks = signal<Record<number, boolean[]>>({});
  protected readonly pain = signal<number | null>(null);
  protected readonly tried = signal(false);

  private readonly planItems = computed(() => {
    const id = this.summary()?.id;
    return this.outbox.items().filter((i) => i.planId === id);
  });
  protected readonly history = computed(() =>
    historyRows(this.logs.hasValue() ? this.logs.value() : [], this.planItems(), this.detail()?.stages ?? []),
  );
  /** Today's session once saved (sent or waiting on the phone): the page says it is done. */
  protected readonly doneToday = computed(() => sessionLoggedOn(this.history(), this.today()));
  /** Whether the athlete chose to log another session (an earlier day, or a second one) anyway. */
  protected readonly logAnother = signal(false);
  protected readonly morningDue = computed(() =>
    morningCheckDue(entriesForMorning(this.logs.hasValue() ? this.logs.value() : [], this.planItems()), this.today()),
  );
  protected readonly waiting = computed(() => this.planItems().filter((i) => !i.refused));
  protected readonly refusedMorning = computed(() => this.planItems().filter((i) => i.refused && i.kind === 'morning'));
  /** Entries saved for a plan that is no longer the running one: shown until sent or discarded. */
  protected readonly otherPlanItems = computed(() => {
    const id = this.summary()?.id;
    return this.outbox.items().filter((i) => i.planId !== id && i.kind === 'log');
  });
  protected readonly painScale = PAIN_SCALE;
  protected readonly painAboveLimitText = painAboveLimitText;
  protected readonly errorText = errorText;
  protected readonly errorMessage = errorMessage;
  protected readonly L = PLAN_LIMITS;

  constructor() {
    // A new stage (or plan) starts with fresh ticks.
    effect(() => {
      const s = this.stage();
      untracked(() => this.ticks.set(s ? Object.fromEntries(s.exercises.map((e) => [e.id, Array<boolean>(e.dose.sets).fill(false)])) : {}));
    });
    // When the outbox delivers, show the server's truth; a refusal may mean the stage moved on.
    this.outbox.delivered.pipe(takeUntilDestroyed()).subscribe(({ item }) => {
      if (item.planId === this.summary()?.id) this.logs.reload();
    });
    // A refusal (the coach moved the stage on, paused or finished the plan meanwhile): read the plan
    // again, so the page shows today's stage and "Send for today's stage" aims at it, not the old one.
    this.outbox.refusals.pipe(takeUntilDestroyed()).subscribe((item) => {
      if (item.planId !== this.summary()?.id) return;
      this.plans.reload();
      this.plan.reload();
      this.logs.reload();
    });
  }

  leaveWarning(): LeaveWarning | null {
    const started =
      this.pain() !== null || this.form.controls.note.value.trim() !== '' || Object.values(this.ticks()).some((t) => t.some(Boolean));
    return started
      ? {
          title: 'Leave without saving the session?',
          message: 'The sets, pain and note you entered are not saved yet. If you leave now, they are lost.',
          confirmLabel: 'Leave and discard',
        }
      : null;
  }

  protected onBeforeUnload(event: BeforeUnloadEvent): void {
    warnBeforeUnload(event, this.leaveWarning());
  }

  protected ticksOf(stageExerciseId: number): boolean[] {
    return this.ticks()[stageExerciseId] ?? [];
  }

  protected setsDone(stageExerciseId: number): number {
    return (this.ticks()[stageExerciseId] ?? []).filter(Boolean).length;
  }

  protected toggleSet(stageExerciseId: number, index: number): void {
    this.ticks.update((all) => {
      const sets = [...(all[stageExerciseId] ?? [])];
      sets[index] = !sets[index];
      return { ...all, [stageExerciseId]: sets };
    });
  }

  protected choosePain(value: number): void {
    this.pain.set(value);
    this.form.controls.painDuring.setValue(value);
    this.form.controls.painDuring.markAsTouched();
  }

  /** Arrow keys move within the 0–10 scale, as in any radio group. */
  protected painKey(event: KeyboardEvent, value: number): void {
    const delta =
      event.key === 'ArrowRight' || event.key === 'ArrowDown' ? 1 : event.key === 'ArrowLeft' || event.key === 'ArrowUp' ? -1 : 0;
    if (!delta) return;
    event.preventDefault();
    const next = Math.min(10, Math.max(0, value + delta));
    this.choosePain(next);
    (event.currentTarget as HTMLElement).parentElement?.querySelectorAll<HTMLElement>('[role=radio]')[next]?.focus();
  }

  protected submit(): void {
    const plan = this.detail();
    const stage = this.stage();
    this.tried.set(true);
    if (!plan || !stage) return;
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    const v = this.form.getRawValue();
    const body: LogWrite = {
      key: newLogKey(),
      stageId: stage.id,
      date: toIsoDate(v.date)!,
      painDuring: v.painDuring!,
      sets: stage.exercises.map((e) => ({ stageExerciseId: e.id, exerciseId: e.exerciseId, setsDone: this.setsDone(e.id) })),
      note: v.note.trim() || null,
    };
    this.outbox.submitLog(plan.id, body);
    this.today.set(toIsoDate(new Date())!);
    this.form.reset({ date: parseIsoDate(this.today()), painDuring: null, note: '' });
    this.pain.set(null);
    this.tried.set(false);
    this.logAnother.set(false);
    this.ticks.set(Object.fromEntries(stage.exercises.map((e) => [e.id, Array<boolean>(e.dose.sets).fill(false)])));
    // The form gives way to "Done for today": focus moves there instead of being lost with the Save button.
    this.focusAfterRender('.done-title');
    this.snackBar.open(
      navigator.onLine === false ? 'Session saved on this phone; it is sent when you are back online' : 'Session saved',
      'OK',
      { duration: 4000 },
    );
  }

  /** Opens the session form again; focus moves to its heading, as the button that opened it is gone. */
  protected startAnother(): void {
    this.logAnother.set(true);
    this.focusAfterRender('.session-title');
  }

  /** Focuses (and so scrolls to) the element matching `selector` once the view shows it, if it does. */
  private focusAfterRender(selector: string): void {
    afterNextRender(() => this.host.nativeElement.querySelector<HTMLElement>(selector)?.focus(), { injector: this.injector });
  }

  /** Sends a refused session again as a session of today's stage (sets matched by exercise). */
  protected sendForToday(itemId: string): void {
    const stage = this.stage();
    const item = this.outbox.items().find((i) => i.id === itemId);
    if (!stage || !item || item.kind !== 'log') return;
    this.outbox.resend(itemId, retargetLog(item.body, stage));
  }

  protected morning(pain: number): void {
    const plan = this.detail();
    const due = this.morningDue();
    if (!plan || !due) return;
    this.outbox.submitMorning(plan.id, due.key, pain, due.date);
    this.snackBar.open('Morning check saved', 'OK', { duration: 3000 });
  }

  protected setsText(sets: { setsDone: number; setsPrescribed: number }[]): string {
    const done = sets.reduce((n, x) => n + Math.min(x.setsDone, x.setsPrescribed), 0);
    return `${done}/${sets.reduce((n, x) => n + x.setsPrescribed, 0)}`;
  }
}
