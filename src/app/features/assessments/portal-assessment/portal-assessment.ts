import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, effect, inject, input, viewChild } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatCardModule } from '@angular/material/card';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { Title } from '@angular/platform-browser';
import { RouterLink } from '@angular/router';
import { throwError } from 'rxjs';
import { ASSESSMENT_KIND_LABELS } from '../../../../contracts/assessment';
import { errorMessage, errorStatus } from '../../../core/api-error';
import { LeaveGuarded, LeaveWarning, warnBeforeUnload } from '../../../core/leave-guard';
import { FILMING_CAUTION } from '../../../shared/caution';
import { CautionNote } from '../../../shared/caution-note/caution-note';
import { ErrorState } from '../../../shared/states/error-state';
import { AssessmentClips, UPLOADS_RUNNING_WARNING } from '../assessment-clips/assessment-clips';
import { AssessmentFacts } from '../assessment-facts';
import { AssessmentsApi } from '../../../core/data/assessments-api';

/**
 * `/portal/assessments/:id`: the athlete's own assessment — visit facts (never the coach's
 * notes), how to film, uploading clips and following their processing.
 */
@Component({
  selector: 'app-portal-assessment',
  imports: [
    DatePipe,
    RouterLink,
    MatButtonModule,
    MatCardModule,
    MatIconModule,
    MatProgressBarModule,
    ErrorState,
    AssessmentClips,
    AssessmentFacts,
    CautionNote,
  ],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './portal-assessment.html',
  styles: `
    .visit {
      margin-block-end: 16px;
    }
  `,
  host: { '(window:beforeunload)': 'onBeforeUnload($event)' },
})
export class PortalAssessment implements LeaveGuarded {
  private readonly api = inject(AssessmentsApi);

  /** Route parameter. */
  readonly id = input.required<string>();

  protected readonly filmingCaution = FILMING_CAUTION;
  protected readonly assessment = rxResource({
    params: () => Number(this.id()),
    stream: ({ params }) =>
      Number.isInteger(params) && params > 0 ? this.api.get(params) : throwError(() => new Error('Not a valid assessment address.')),
  });
  /** The assessment without coach notes, whatever the server sent. */
  protected readonly detail = computed(() => (this.assessment.hasValue() ? { ...this.assessment.value(), notes: null } : null));
  protected readonly notFound = computed(() => errorStatus(this.assessment.error()) === 404);
  protected readonly heading = computed(() => {
    const a = this.detail();
    return a ? ASSESSMENT_KIND_LABELS[a.kind] : 'Assessment';
  });
  protected readonly errorMessage = errorMessage;
  private readonly clips = viewChild(AssessmentClips);

  constructor() {
    const title = inject(Title);
    effect(() => {
      const a = this.detail();
      if (a) title.setTitle(`${ASSESSMENT_KIND_LABELS[a.kind]} ${a.date} · Trailframe`);
    });
  }

  leaveWarning(): LeaveWarning | null {
    return this.clips()?.uploading() ? UPLOADS_RUNNING_WARNING : null;
  }

  protected onBeforeUnload(event: BeforeUnloadEvent): void {
    warnBeforeUnload(event, this.leaveWarning());
  }
}
