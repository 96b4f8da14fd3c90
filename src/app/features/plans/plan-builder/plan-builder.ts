import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, ChangeDetectorRef, Component, computed, effect, inject, input, signal, untracked } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { FormArray, NonNullableFormBuilder, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCardModule } from '@angular/material/card';
import { MatDialog } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import { MatSnackBar } from '@angular/material/snack-bar';
import { Router, RouterLink } from '@angular/router';
import { firstValueFrom, of, throwError } from 'rxjs';
import type { Exercise, LoadingKind, PlanDetail, PlanWrite, ProgressionCriterionKind } from '../../../../contracts/plans';
import { ASSESSMENT_KIND_LABELS } from '../../../../contracts/assessment';
import { CRITERION_KINDS, DEFAULT_PAIN_RULE, LOADING_KIND_LABELS, PLAN_LIMITS } from '../../../../contracts/plans';
import { errorCode, errorDetails, errorMessage, errorStatus, fieldProblems } from '../../../core/api-error';
import { LeaveGuarded, LeaveWarning, UNSAVED_CHANGES_WARNING, warnBeforeUnload } from '../../../core/leave-guard';
import { errorText } from '../../../shared/forms/error-text';
import { applyServerErrors } from '../../../shared/forms/server-errors';
import { ErrorState } from '../../../shared/states/error-state';
import { AssessmentsApi } from '../../../core/data/assessments-api';
import { AthletesApi } from '../../../core/data/athletes-api';
import { fullName } from '../../../core/data/roster';
import { DoseFields } from '../dose-fields/dose-fields';
import { ExercisePicker, ExercisePickerData } from '../exercise-picker/exercise-picker';
import { PlanCaution } from '../../../shared/plan-caution/plan-caution';
import { ReorderButtons } from '../../../shared/reorder-buttons/reorder-buttons';
import {
  PlanForm,
  StageGroup,
  blankStage,
  createPlanForm,
  criterionGroup,
  defaultCriterion,
  moveInArray,
  planFormFromWrite,
  planFromForm,
  stageExerciseGroup,
  stageGroup,
  threeStageTemplate,
} from '../plan-form-model';
import { PlansApi } from '../../../core/data/plans-api';
import { describePlanChanges, type PlanChange } from '../plan-changes';
import { planWriteOf, rebasePlan } from '../plan-merge';
import { RetryKeys } from '../../../shared/retry-keys';
import { PlanConflict } from '../plan-conflict/plan-conflict';

const CRITERION_OPTION_LABELS: Record<ProgressionCriterionKind, string> = {
  pain_during_at_most: 'Pain during at most …',
  settled_by_morning: 'Settled by next morning',
  all_sets_done: 'All sets done',
  sessions_logged: 'Sessions logged',
  weeks_in_stage: 'Weeks in this stage',
};

/** Loading kinds a stage's picker starts with, by the stage's position in a three-stage plan. */
const STAGE_KIND_HINT: (LoadingKind | undefined)[] = ['isometric', 'eccentric', 'ballistic'];

/**
 * `/plans/new?athlete=:id` and `/plans/:id/edit`: a plan's title, the assessment it came from,
 * and its ordered stages — exercises from the library with doses, target duration, progression in
 * words and checkable criteria.
 */
@Component({
  selector: 'app-plan-builder',
  imports: [
    DatePipe,
    ReactiveFormsModule,
    RouterLink,
    MatButtonModule,
    MatCardModule,
    MatFormFieldModule,
    MatInputModule,
    MatSelectModule,
    MatIconModule,
    MatProgressBarModule,
    ErrorState,
    DoseFields,
    PlanCaution,
    PlanConflict,
    ReorderButtons,
  ],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './plan-builder.html',
  styleUrl: './plan-builder.scss',
  host: { '(window:beforeunload)': 'onBeforeUnload($event)' },
})
export class PlanBuilder implements LeaveGuarded {
  private readonly api = inject(PlansApi);
  private readonly athletesApi = inject(AthletesApi);
  private readonly assessmentsApi = inject(AssessmentsApi);
  private readonly dialog = inject(MatDialog);
  private readonly router = inject(Router);
  /** Creating the same plan again after a lost answer (or a second click) makes one. */
  private readonly createKeys = new RetryKeys();
  private readonly snackBar = inject(MatSnackBar);
  private readonly fb = inject(NonNullableFormBuilder);
  private readonly cdr = inject(ChangeDetectorRef);

  /** Route parameter when editing. */
  readonly id = input<string | undefined>();
  /** Query parameter `athlete` when creating. */
  readonly athlete = input<string | undefined>();

  protected readonly editing = computed(() => this.id() !== undefined);
  protected readonly plan = rxResource({
    params: () => this.id(),
    stream: ({ params }) => (params === undefined ? of(null) : this.api.plan(Number(params))),
  });
  protected readonly athleteId = computed(() => {
    if (this.editing()) return this.plan.hasValue() ? (this.plan.value()?.athleteId ?? null) : null;
    const n = Number(this.athlete());
    return Number.isInteger(n) && n > 0 ? n : null;
  });
  protected readonly athleteDetail = rxResource({
    params: () => this.athleteId() ?? (this.editing() ? undefined : -1),
    stream: ({ params }) =>
      params === -1 ? throwError(() => new Error('Open the new plan from an athlete’s profile.')) : this.athletesApi.get(params),
  });
  protected readonly assessments = rxResource({
    params: () => this.athleteId() ?? undefined,
    stream: ({ params }) => this.assessmentsApi.list(params),
  });
  protected readonly name = computed(() => (this.athleteDetail.hasValue() ? fullName(this.athleteDetail.value()) : ''));
  protected readonly loadError = computed(() => this.plan.error() ?? this.athleteDetail.error() ?? null);
  protected readonly form = signal<PlanForm | null>(null);
  protected readonly busy = signal(false);
  protected readonly problem = signal<string | null>(null);
  /** The stored plan the edit in the form started from (its revision goes with the save). */
  private readonly base = signal<PlanDetail | null>(null);
  /** A colleague's newer save met on saving, until the coach chooses what to do with the edit. */
  protected readonly conflict = signal<{ theirs: PlanDetail; theirChanges: PlanChange[]; myChanges: PlanChange[] } | null>(null);
  /** Ids of the stages that have started: they keep their place, ahead of the stages still to come. */
  private readonly startedStageIds = computed(() => {
    const b = this.base();
    return new Set(b ? b.stages.filter((s) => s.startedAt !== null || s.id === b.currentStageId).map((s) => s.id) : []);
  });
  /** Said to screen readers after an exercise is added ("Added … to Isometric holds"). */
  protected readonly announcement = signal('');
  private saved = false;

  protected readonly criterionKinds = CRITERION_KINDS;
  protected readonly criterionLabels = CRITERION_OPTION_LABELS;
  protected readonly kindLabels = LOADING_KIND_LABELS;
  protected readonly assessmentKindLabels = ASSESSMENT_KIND_LABELS;
  protected readonly L = PLAN_LIMITS;
  protected readonly errorText = errorText;
  protected readonly errorMessage = errorMessage;
  protected readonly notFound = computed(() => errorStatus(this.loadError()) === 404);

  constructor() {
    // Build the form once, when what it starts from has loaded.
    effect(() => {
      const ready = this.editing() ? this.plan.hasValue() && this.plan.value() !== null : this.athleteDetail.hasValue();
      if (!ready || untracked(this.form)) return;
      const plan = this.editing() ? (this.plan.value() as PlanDetail) : undefined;
      untracked(() => {
        this.base.set(plan ?? null);
        this.form.set(createPlanForm(this.fb, plan, 'Staged loading plan'));
      });
    });
  }

  protected stages(f: PlanForm): FormArray<StageGroup> {
    return f.controls.stages;
  }

  leaveWarning(): LeaveWarning | null {
    return !this.saved && this.form()?.dirty ? UNSAVED_CHANGES_WARNING : null;
  }

  protected onBeforeUnload(event: BeforeUnloadEvent): void {
    warnBeforeUnload(event, this.leaveWarning());
  }

  protected useTemplate(f: PlanForm): void {
    for (const s of threeStageTemplate(DEFAULT_PAIN_RULE.maxDuring)) f.controls.stages.push(stageGroup(this.fb, s));
    f.markAsDirty();
  }

  protected addStage(f: PlanForm): void {
    f.controls.stages.push(stageGroup(this.fb, blankStage(f.controls.stages.length + 1)));
    f.markAsDirty();
  }

  /** Whether the stage has started (it cannot move, and neither can a stage past it). */
  protected hasStarted(stage: StageGroup): boolean {
    const id = stage.controls.id.value;
    return id !== null && this.startedStageIds().has(id);
  }

  /** Whether stage `i` cannot move by `delta`: it, or the stage it would pass, has started. */
  protected stageHeld(f: PlanForm, i: number, delta: number): boolean {
    const other = f.controls.stages.at(i + delta);
    return this.hasStarted(f.controls.stages.at(i)) || (other !== undefined && this.hasStarted(other));
  }

  protected moveStage(f: PlanForm, i: number, delta: number): void {
    moveInArray(f.controls.stages, i, delta);
    f.markAsDirty();
  }

  protected removeStage(f: PlanForm, i: number): void {
    f.controls.stages.removeAt(i);
    f.markAsDirty();
  }

  protected addExercise(f: PlanForm, stage: StageGroup, index: number): void {
    this.dialog
      .open<ExercisePicker, ExercisePickerData, Exercise>(ExercisePicker, {
        data: {
          stageName: stage.controls.name.value || `Stage ${index + 1}`,
          kind: f.controls.stages.length === 3 ? STAGE_KIND_HINT[index] : undefined,
          chosenIds: stage.controls.exercises.getRawValue().map((e) => e.exerciseId),
        },
        width: '760px',
        maxWidth: '95vw',
      })
      .afterClosed()
      .subscribe((exercise) => {
        if (!exercise) return;
        stage.controls.exercises.push(stageExerciseGroup(this.fb, exercise));
        f.markAsDirty();
        this.announcement.set(`Added ${exercise.name} to ${stage.controls.name.value || `stage ${index + 1}`}.`);
        // The dialog answers outside any template event, and a FormArray is not a signal: without
        // this the OnPush view would show the new exercise only after the next click.
        this.cdr.markForCheck();
      });
  }

  protected moveExercise(f: PlanForm, stage: StageGroup, j: number, delta: number): void {
    moveInArray(stage.controls.exercises, j, delta);
    f.markAsDirty();
  }

  protected removeExercise(f: PlanForm, stage: StageGroup, j: number): void {
    stage.controls.exercises.removeAt(j);
    f.markAsDirty();
  }

  protected addCriterion(f: PlanForm, stage: StageGroup): void {
    stage.controls.criteria.push(criterionGroup(this.fb, defaultCriterion('pain_during_at_most')));
    f.markAsDirty();
  }

  protected removeCriterion(f: PlanForm, stage: StageGroup, k: number): void {
    stage.controls.criteria.removeAt(k);
    f.markAsDirty();
  }

  protected cancelLink(): unknown[] {
    const id = this.id();
    if (id !== undefined) return ['/plans', id];
    const athleteId = this.athleteId();
    return athleteId ? ['/athletes', athleteId] : ['/athletes'];
  }

  protected async save(f: PlanForm): Promise<void> {
    if (this.busy()) return;
    this.problem.set(null);
    this.conflict.set(null);
    if (f.controls.stages.length === 0) {
      this.problem.set('Add at least one stage.');
      return;
    }
    if (f.invalid) {
      f.markAllAsTouched();
      this.problem.set('Check the highlighted fields.');
      return;
    }
    const athleteId = this.athleteId();
    if (athleteId === null) return;
    const id = this.id();
    // An edit without the plan it started from is not sent (no revision to check).
    const editedFrom = this.base();
    if (id !== undefined && !editedFrom) return;
    this.busy.set(true);
    const body = planFromForm(f.getRawValue());
    try {
      // An edit names the revision it started from: a plan saved by someone else meanwhile answers 409 instead of being overwritten.
      const saved = await firstValueFrom(
        id !== undefined && editedFrom
          ? this.api.replacePlan(Number(id), { ...body, baseRevision: editedFrom.revision })
          : this.api.createPlan(athleteId, body, this.createKeys.for({ athleteId, body })),
      );
      this.saved = true;
      f.markAsPristine();
      this.snackBar.open(id !== undefined ? 'Plan saved' : 'Plan created as a draft', 'OK', { duration: 3000 });
      await this.router.navigate(['/plans', saved.id]);
    } catch (err) {
      const theirs = storedPlanOf(err);
      if (theirs && editedFrom) {
        this.showConflict(editedFrom, theirs, body, f);
      } else if (errorStatus(err) === 422) {
        const rest = applyServerErrors(f, fieldProblems(err));
        this.problem.set(rest.length ? rest.join(' ') : 'Check the highlighted fields.');
      } else {
        this.problem.set(errorMessage(err));
      }
    } finally {
      this.busy.set(false);
    }
  }

  /** Keeps the edit in the form and shows what the colleague's save and the edit each changed. */
  private showConflict(base: PlanDetail, theirs: PlanDetail, mine: PlanWrite, f: PlanForm): void {
    const library = this.library(f, base, theirs);
    const name = (id: number) => library.get(id)?.name ?? 'An exercise';
    const from = planWriteOf(base);
    this.conflict.set({
      theirs,
      theirChanges: describePlanChanges(from, planWriteOf(theirs), name),
      myChanges: describePlanChanges(from, mine, name),
    });
  }

  /** "Load their version": the form shows the colleague's save; the edit is discarded. */
  protected loadTheirs(): void {
    const c = this.conflict();
    if (!c) return;
    this.base.set(c.theirs);
    this.form.set(createPlanForm(this.fb, c.theirs));
    this.conflict.set(null);
    this.snackBar.open('Showing their version', 'OK', { duration: 3000 });
  }

  /** "Keep my changes": the edit re-applied on top of the colleague's save, saved against their revision. */
  protected async keepMine(f: PlanForm): Promise<void> {
    const c = this.conflict();
    const base = this.base();
    if (!c || !base || this.busy()) return;
    const merged = rebasePlan(planWriteOf(base), planFromForm(f.getRawValue()), planWriteOf(c.theirs));
    const next = planFormFromWrite(this.fb, merged, this.library(f, base, c.theirs));
    next.markAsDirty();
    this.base.set(c.theirs);
    this.form.set(next);
    this.conflict.set(null);
    await this.save(next);
  }

  /** Every exercise the form, the plan as opened and the colleague's save name, by id. */
  private library(f: PlanForm, ...plans: PlanDetail[]): Map<number, Exercise> {
    const all = new Map<number, Exercise>();
    for (const p of plans) for (const s of p.stages) for (const e of s.exercises) all.set(e.exerciseId, e.exercise);
    for (const s of f.controls.stages.controls)
      for (const e of s.controls.exercises.controls) all.set(e.controls.exerciseId.value, e.controls.info.value);
    return all;
  }
}

/** The stored plan sent with a 409 `stale_revision`, or null for any other error. */
function storedPlanOf(err: unknown): PlanDetail | null {
  if (errorStatus(err) !== 409 || errorCode(err) !== 'stale_revision') return null;
  const current = (errorDetails(err) as { current?: PlanDetail } | null)?.current;
  return current && typeof current.revision === 'number' && Array.isArray(current.stages) ? current : null;
}
