import { formatDate } from '@angular/common';
import { ChangeDetectionStrategy, Component, LOCALE_ID, computed, inject, linkedSignal, signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatCheckboxModule } from '@angular/material/checkbox';
import { MAT_DIALOG_DATA, MatDialogModule, MatDialogRef } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import { firstValueFrom } from 'rxjs';
import type { Assessment } from '../../../../contracts/api';
import { ASSESSMENT_KIND_LABELS } from '../../../../contracts/assessment';
import {
  SUMMARY_STILLS_MAX,
  SUMMARY_TEXT_MAX,
  type Still,
  type VisitSummary,
  type VisitSummaryCreate,
} from '../../../../contracts/sharing';
import { errorMessage } from '../../../core/api-error';
import { ErrorState } from '../../states/error-state';
import { AssessmentsApi } from '../../../core/data/assessments-api';
import { baselineChoices, defaultBaseline, panelText, stillAlt, stillSrc, stillChoices, textCount } from '../sharing-logic';
import { saveProblems } from '../sharing-errors';
import { StillsApi } from '../../../core/data/stills-api';

export interface SummaryDialogData {
  athleteId: number;
  /** The athlete's ready stills to choose from. */
  stills: Still[];
  /** Preselected assessment (default: the newest). */
  assessmentId?: number | null;
}

/**
 * "New visit summary": the assessment (and, for a Re-test comparison, the baseline), the stills
 * to include, the coach's findings and plan in plain words with counters against
 * SUMMARY_TEXT_MAX. Closes with the summary as the server answered (`rendering`); on an error
 * everything typed stays.
 */
@Component({
  selector: 'app-summary-dialog',
  imports: [
    MatDialogModule,
    MatFormFieldModule,
    MatInputModule,
    MatSelectModule,
    MatCheckboxModule,
    MatButtonModule,
    MatIconModule,
    MatProgressBarModule,
    ErrorState,
  ],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './summary-dialog.html',
  styleUrl: './summary-dialog.scss',
})
export class SummaryDialog {
  private readonly api = inject(StillsApi);
  private readonly assessmentsApi = inject(AssessmentsApi);
  private readonly dialogRef = inject<MatDialogRef<SummaryDialog, VisitSummary>>(MatDialogRef);
  private readonly locale = inject(LOCALE_ID);
  protected readonly data = inject<SummaryDialogData>(MAT_DIALOG_DATA);

  protected readonly textMax = SUMMARY_TEXT_MAX;
  protected readonly stillsMax = SUMMARY_STILLS_MAX;
  protected readonly kindLabels = ASSESSMENT_KIND_LABELS;
  protected readonly errorMessage = errorMessage;
  protected readonly stillAlt = stillAlt;
  protected readonly stillSrc = stillSrc;
  protected readonly panelText = panelText;

  protected readonly assessments = rxResource({
    params: () => this.data.athleteId,
    stream: ({ params }) => this.assessmentsApi.list(params),
  });
  private readonly list = computed<Assessment[]>(() => (this.assessments.hasValue() ? this.assessments.value() : []));
  protected readonly assessmentId = linkedSignal<number | null>(() => {
    const list = this.list();
    const wanted = this.data.assessmentId;
    return list.find((a) => a.id === wanted)?.id ?? list[0]?.id ?? null;
  });
  protected readonly baselineOptions = computed(() => baselineChoices(this.list(), this.assessmentId()));
  protected readonly baselineId = linkedSignal<number | null>(() => defaultBaseline(this.list(), this.assessmentId()));
  protected readonly stillOptions = computed(() => stillChoices(this.data.stills, [this.assessmentId(), this.baselineId()]));
  protected readonly chosen = signal<ReadonlySet<number>>(new Set());
  /** Chosen stills that are still offered (changing the visits drops the others). */
  protected readonly chosenIds = computed(() =>
    this.stillOptions()
      .filter((s) => this.chosen().has(s.id))
      .map((s) => s.id),
  );
  protected readonly findings = signal('');
  protected readonly planText = signal('');
  protected readonly findingsCount = computed(() => textCount(this.findings(), SUMMARY_TEXT_MAX));
  protected readonly planCount = computed(() => textCount(this.planText(), SUMMARY_TEXT_MAX));
  protected readonly fieldErrors = signal<Record<string, string>>({});
  protected readonly problem = signal<string | null>(null);
  protected readonly busy = signal(false);
  protected readonly blocked = computed(
    () => this.busy() || this.assessmentId() === null || this.findingsCount().over || this.planCount().over,
  );

  /** "Re-test · 24 Nov 2026", as the stills below and the PDF name the visits. */
  protected assessmentLabel(a: Assessment): string {
    return `${ASSESSMENT_KIND_LABELS[a.kind]} · ${formatDate(a.date, 'd MMM y', this.locale)}`;
  }

  protected toggleStill(id: number, on: boolean): void {
    this.chosen.update((s) => {
      const next = new Set(s);
      if (on) next.add(id);
      else next.delete(id);
      return next;
    });
    this.clearError('stillIds');
  }

  protected atMax(id: number): boolean {
    return !this.chosen().has(id) && this.chosenIds().length >= SUMMARY_STILLS_MAX;
  }

  protected setText(which: 'findings' | 'planText', value: string): void {
    this[which].set(value);
    this.clearError(which);
  }

  private clearError(field: string): void {
    if (this.fieldErrors()[field]) this.fieldErrors.update(({ [field]: _gone, ...rest }) => rest);
  }

  protected async save(): Promise<void> {
    const assessmentId = this.assessmentId();
    if (this.blocked() || assessmentId === null) return;
    this.problem.set(null);
    this.busy.set(true);
    const body: VisitSummaryCreate = {
      baselineAssessmentId: this.baselineId(),
      findings: this.findings().trim(),
      planText: this.planText().trim(),
      stillIds: this.chosenIds(),
    };
    try {
      const created = await firstValueFrom(this.api.createSummary(assessmentId, body));
      this.dialogRef.close(created);
    } catch (err) {
      const { byField, general } = saveProblems(err, ['findings', 'planText', 'stillIds', 'baselineAssessmentId']);
      this.fieldErrors.set(byField);
      this.problem.set(general);
    } finally {
      this.busy.set(false);
    }
  }
}
