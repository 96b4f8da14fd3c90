import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, input } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { Router, RouterLink } from '@angular/router';
import type { Assessment } from '../../../contracts/api';
import { ASSESSMENT_KIND_LABELS, FILM_SURFACE_LABELS } from '../../../contracts/assessment';
import type { DistanceUnit } from '../../../contracts/intake';
import { errorMessage } from '../../core/api-error';
import { EmptyState } from '../states/empty-state';
import { ErrorState } from '../states/error-state';
import { AssessmentDialog, AssessmentDialogData } from '../assessment-dialog/assessment-dialog';
import { defaultKind, formatSpeed } from '../assessment-form-model';
import { AssessmentsApi } from '../../core/data/assessments-api';

/** Newest visit first; the later-created one first on the same day. */
export function newestFirst(list: readonly Assessment[]): Assessment[] {
  return [...list].sort((a, b) => (a.date !== b.date ? (a.date < b.date ? 1 : -1) : b.id - a.id));
}

/** "1 clip", "3 clips", "No clips yet". */
export function clipCountText(n: number): string {
  return n === 0 ? 'No clips yet' : n === 1 ? '1 clip' : `${n} clips`;
}

/**
 * An athlete's assessments, newest first. Staff can start a new one (then land on its page to add
 * clips); athletes see theirs and open them to upload clips.
 */
@Component({
  selector: 'app-assessment-list',
  imports: [DatePipe, RouterLink, MatButtonModule, MatIconModule, MatProgressBarModule, EmptyState, ErrorState],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './assessment-list.html',
  styleUrl: './assessment-list.scss',
})
export class AssessmentList {
  private readonly api = inject(AssessmentsApi);
  private readonly dialog = inject(MatDialog);
  private readonly router = inject(Router);

  readonly athleteId = input.required<number>();
  readonly audience = input<'staff' | 'athlete'>('staff');
  /** The athlete's distance unit, so a new assessment's speed starts in km/h or mph. */
  readonly distanceUnit = input<DistanceUnit>('km');

  protected readonly assessments = rxResource({
    params: () => this.athleteId(),
    stream: ({ params }) => this.api.list(params),
  });
  protected readonly rows = computed(() => (this.assessments.hasValue() ? newestFirst(this.assessments.value()) : []));
  protected readonly kindLabels = ASSESSMENT_KIND_LABELS;
  protected readonly surfaceLabels = FILM_SURFACE_LABELS;
  protected readonly formatSpeed = formatSpeed;
  protected readonly clipCountText = clipCountText;
  protected readonly errorMessage = errorMessage;

  protected link(a: Assessment): unknown[] {
    return this.audience() === 'staff' ? ['/athletes', this.athleteId(), 'assessments', a.id] : ['/portal/assessments', a.id];
  }

  protected create(): void {
    this.dialog
      .open<AssessmentDialog, AssessmentDialogData, Assessment>(AssessmentDialog, {
        data: { athleteId: this.athleteId(), kind: defaultKind(this.rows()), distanceUnit: this.distanceUnit() },
        width: '640px',
        maxWidth: '95vw',
        autoFocus: 'first-tabbable',
      })
      .afterClosed()
      .subscribe((created) => {
        if (!created) return;
        void this.router.navigate(['/athletes', created.athleteId, 'assessments', created.id]);
      });
  }
}
