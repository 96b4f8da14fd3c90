import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, effect, inject, input, viewChild } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatCardModule } from '@angular/material/card';
import { MatDialog } from '@angular/material/dialog';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSnackBar } from '@angular/material/snack-bar';
import { Title } from '@angular/platform-browser';
import { Router, RouterLink } from '@angular/router';
import { catchError, filter, firstValueFrom, of, throwError } from 'rxjs';
import type { Assessment, AssessmentDetail } from '../../../../contracts/api';
import { ASSESSMENT_KIND_LABELS } from '../../../../contracts/assessment';
import { errorMessage, errorStatus } from '../../../core/api-error';
import { AuthStore } from '../../../core/auth-store';
import { LeaveGuarded, LeaveWarning, warnBeforeUnload } from '../../../core/leave-guard';
import { ConfirmDialog, ConfirmDialogData } from '../../../shared/confirm-dialog/confirm-dialog';
import { ErrorState } from '../../../shared/states/error-state';
import { AthletesApi } from '../../../core/data/athletes-api';
import { fullName } from '../../../core/data/roster';
import { AssessmentClips, UPLOADS_RUNNING_WARNING } from '../assessment-clips/assessment-clips';
import { AssessmentDialog, AssessmentDialogData } from '../../../shared/assessment-dialog/assessment-dialog';
import { AssessmentFacts } from '../assessment-facts';
import { AssessmentsApi } from '../../../core/data/assessments-api';

/** `/athletes/:athleteId/assessments/:id`: one visit's facts, camera guidance and clips (staff). */
@Component({
  selector: 'app-assessment-page',
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
  ],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './assessment-page.html',
  styleUrl: './assessment-page.scss',
  host: { '(window:beforeunload)': 'onBeforeUnload($event)' },
})
export class AssessmentPage implements LeaveGuarded {
  private readonly api = inject(AssessmentsApi);
  private readonly athletesApi = inject(AthletesApi);
  private readonly dialog = inject(MatDialog);
  private readonly router = inject(Router);
  private readonly snackBar = inject(MatSnackBar);
  /** Whether the clinic owner is looking (the only one who bills: "Invoice this visit"). */
  protected readonly isOwner = inject(AuthStore).isOwner;

  /** Route parameters. */
  readonly athleteId = input.required<string>();
  readonly id = input.required<string>();

  protected readonly assessment = rxResource({
    params: () => ({ id: Number(this.id()), athleteId: Number(this.athleteId()) }),
    stream: ({ params }) =>
      Number.isInteger(params.id) && params.id > 0
        ? this.api.get(params.id)
        : throwError(() => new Error('Not a valid assessment address.')),
  });
  /** The athlete's name for the breadcrumb and title; the page works without it. */
  protected readonly athlete = rxResource({
    params: () => Number(this.athleteId()),
    stream: ({ params }) => this.athletesApi.get(params).pipe(catchError(() => of(null))),
  });
  protected readonly detail = computed(() => {
    const a = this.assessment.hasValue() ? this.assessment.value() : null;
    // An assessment reached under another athlete's address is not shown there.
    return a && a.athleteId === Number(this.athleteId()) ? a : null;
  });
  protected readonly notFound = computed(
    () => errorStatus(this.assessment.error()) === 404 || (this.assessment.hasValue() && this.detail() === null),
  );
  protected readonly athleteName = computed(() => {
    const a = this.athlete.hasValue() ? this.athlete.value() : null;
    return a ? fullName(a) : 'Athlete';
  });
  protected readonly heading = computed(() => {
    const a = this.detail();
    return a ? ASSESSMENT_KIND_LABELS[a.kind] : 'Assessment';
  });
  protected readonly consentLink = computed(() =>
    this.router.createUrlTree(['/athletes', this.athleteId()], { queryParams: { tab: 'intake' } }),
  );
  protected readonly profileLink = computed(() =>
    this.router.createUrlTree(['/athletes', this.athleteId()], { queryParams: { tab: 'assessments' } }),
  );
  protected readonly errorMessage = errorMessage;
  private readonly clips = viewChild(AssessmentClips);

  constructor() {
    const title = inject(Title);
    effect(() => {
      const a = this.detail();
      const name = this.athlete.hasValue() && this.athlete.value() ? this.athleteName() : null;
      if (a) title.setTitle(`${ASSESSMENT_KIND_LABELS[a.kind]} ${a.date}${name ? ' · ' + name : ''} · Trailframe`);
    });
  }

  leaveWarning(): LeaveWarning | null {
    return this.clips()?.uploading() ? UPLOADS_RUNNING_WARNING : null;
  }

  protected onBeforeUnload(event: BeforeUnloadEvent): void {
    warnBeforeUnload(event, this.leaveWarning());
  }

  protected edit(): void {
    const current = this.detail();
    if (!current) return;
    this.dialog
      .open<AssessmentDialog, AssessmentDialogData, Assessment>(AssessmentDialog, {
        data: { athleteId: current.athleteId, assessment: current },
        width: '640px',
        maxWidth: '95vw',
        autoFocus: 'first-tabbable',
      })
      .afterClosed()
      .subscribe((saved) => {
        if (!saved) return;
        // Keep the live clip list; take the visit facts from the server.
        this.assessment.update((a) => (a ? ({ ...a, ...saved, clips: a.clips } satisfies AssessmentDetail) : a));
        this.snackBar.open('Assessment saved', 'OK', { duration: 3000 });
      });
  }

  protected confirmDelete(): void {
    const current = this.detail();
    if (!current) return;
    const clips = current.clipCount;
    this.dialog
      .open<ConfirmDialog, ConfirmDialogData, boolean>(ConfirmDialog, {
        data: {
          title: 'Delete this assessment?',
          message:
            clips > 0
              ? `The ${ASSESSMENT_KIND_LABELS[current.kind]} of ${current.date} and its ${clips === 1 ? 'clip' : clips + ' clips'} with all frames are deleted. This cannot be undone.`
              : `The ${ASSESSMENT_KIND_LABELS[current.kind]} of ${current.date} is deleted. This cannot be undone.`,
          confirmLabel: 'Delete assessment',
        },
        maxWidth: '95vw',
        width: '440px',
      })
      .afterClosed()
      .pipe(filter((yes) => yes === true))
      .subscribe(() => void this.delete(current));
  }

  private async delete(current: AssessmentDetail): Promise<void> {
    try {
      await firstValueFrom(this.api.delete(current.id));
      this.snackBar.open('Assessment deleted', 'OK', { duration: 3000 });
      await this.router.navigateByUrl(this.profileLink());
    } catch {
      // The error snackbar says why.
    }
  }
}
