import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, input } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatCardModule } from '@angular/material/card';
import { MatDialog } from '@angular/material/dialog';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { RouterLink } from '@angular/router';
import { catchError, of } from 'rxjs';
import type { Assessment } from '../../../../contracts/api';
import { ASSESSMENT_KIND_LABELS, FILM_SURFACE_LABELS } from '../../../../contracts/assessment';
import type { Still } from '../../../../contracts/sharing';
import { errorMessage } from '../../../core/api-error';
import { ErrorState } from '../../states/error-state';
import { AssessmentsApi } from '../../../core/data/assessments-api';
import { SHARED_CAUTION, downloadUrl, nextAssessment, panelText, stillAlt, stillSrc, todayIso } from '../sharing-logic';
import { openStillViewer } from '../still-viewer/still-viewer';
import { StillsApi } from '../../../core/data/stills-api';
import { PortalClips } from '../portal-clips/portal-clips';

/**
 * The athlete's portal home, shared part (phone first): the latest published stills as a strip
 * of cards (tap to enlarge, swipe between them), the published visit summaries (view, download),
 * and the next assessment, with the caution line (the plan has its own card on the portal home).
 */
@Component({
  selector: 'app-portal-shared',
  imports: [DatePipe, RouterLink, MatButtonModule, MatCardModule, MatIconModule, MatProgressBarModule, ErrorState, PortalClips],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './portal-shared.html',
  styleUrl: './portal-shared.scss',
  host: { class: 'portal-shared' },
})
export class PortalShared {
  private readonly api = inject(StillsApi);
  private readonly assessmentsApi = inject(AssessmentsApi);
  private readonly dialog = inject(MatDialog);

  readonly athleteId = input.required<number>();

  protected readonly shared = rxResource({ stream: () => this.api.portalShared() });
  protected readonly stills = computed<Still[]>(() => (this.shared.hasValue() ? this.shared.value().stills : []));
  protected readonly summaries = computed(() => (this.shared.hasValue() ? this.shared.value().summaries : []));
  private readonly assessments = rxResource({
    params: () => this.athleteId(),
    stream: ({ params }) => this.assessmentsApi.list(params).pipe(catchError(() => of<Assessment[]>([]))),
  });
  protected readonly next = computed(() => nextAssessment(this.assessments.value() ?? [], todayIso()));

  protected readonly caution = SHARED_CAUTION;
  protected readonly kindLabels = ASSESSMENT_KIND_LABELS;
  protected readonly surfaceLabels = FILM_SURFACE_LABELS;
  protected readonly stillAlt = stillAlt;
  protected readonly stillSrc = stillSrc;
  protected readonly panelText = panelText;
  protected readonly downloadUrl = downloadUrl;
  protected readonly errorMessage = errorMessage;

  protected open(index: number): void {
    openStillViewer(this.dialog, this.stills(), index);
  }
}
