import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, inject, input, signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSnackBar } from '@angular/material/snack-bar';
import { Router } from '@angular/router';
import { filter, switchMap } from 'rxjs';
import type { ErasureResult } from '../../../../contracts/privacy';
import { errorMessage } from '../../../core/api-error';
import { PrivacyApi } from '../../../core/data/privacy-api';
import { CautionNote } from '../../../shared/caution-note/caution-note';
import { ERASURE_CAUTION } from '../../../shared/caution';
import { formatBytes } from '../../../shared/clip-status';
import { ConfirmDialog, type ConfirmDialogData } from '../../../shared/confirm-dialog/confirm-dialog';
import { DataExportCard } from '../../../shared/data-export/data-export-card';
import { ErrorState } from '../../../shared/states/error-state';
import { EraseAthleteDialog, type EraseAthleteData } from './erase-athlete-dialog';

/** The owner's Data tab of an athlete: consents, what is held, export, erasing the clips after video consent is withdrawn, erasure. */
@Component({
  selector: 'app-athlete-data',
  imports: [DatePipe, MatButtonModule, MatIconModule, MatProgressBarModule, CautionNote, DataExportCard, ErrorState],
  changeDetection: ChangeDetectionStrategy.OnPush,
  template: `
    @if (overview.error(); as error) {
      <app-error-state title="Couldn't load the athlete's data" [message]="errorMessage(error)" (retry)="overview.reload()" />
    } @else if (overview.isLoading() && !overview.hasValue()) {
      <mat-progress-bar mode="indeterminate" aria-label="Loading the athlete's data" />
    } @else if (overview.hasValue()) {
      @let o = overview.value();
      @if (o.videoWithdrawnAt) {
        <section class="notice" role="status" aria-labelledby="video-withdrawn">
          <mat-icon aria-hidden="true">videocam_off</mat-icon>
          <div>
            <h3 id="video-withdrawn">Consent to video withdrawn {{ o.videoWithdrawnAt | date: 'mediumDate' }}</h3>
            <p>
              Uploads are stopped. The clinic still holds {{ o.clipCount }} clip{{ o.clipCount === 1 ? '' : 's' }} ({{
                bytes(o.clipBytes)
              }}). Erase them now, or keep them if your records require it.
            </p>
            <button mat-stroked-button type="button" (click)="eraseClips(o.clipCount)" [disabled]="erasingClips()">
              <mat-icon>delete_sweep</mat-icon>
              Erase clips only
            </button>
            @if (erasingClips()) {
              <mat-progress-bar mode="indeterminate" aria-label="Erasing the clips" />
            }
            @if (clipsProblem(); as p) {
              <p class="problem" role="alert">Couldn't erase the clips: {{ p }}</p>
            }
          </div>
        </section>
      }
      <dl class="facts">
        <div>
          <dt>Video</dt>
          <dd>{{ consentWord(o.videoConsent) }}</dd>
        </div>
        <div>
          <dt>Sharing</dt>
          <dd>{{ consentWord(o.shareConsent) }}</dd>
        </div>
        <div>
          <dt>Clips held</dt>
          <dd>{{ o.clipCount }} · {{ bytes(o.clipBytes) }}</dd>
        </div>
      </dl>

      <h3 class="section-title">Export</h3>
      <app-data-export-card [athleteId]="athleteId()" audience="owner" />

      <h3 class="section-title">Erase athlete</h3>
      <p class="muted small">
        On the athlete's request: everything about them goes, files included. Invoices stay for the clinic's records with a reference
        instead of the name; one audit entry records who erased them and when.
      </p>
      <app-caution-note [text]="erasureCaution" [compact]="true" />
      <button mat-stroked-button type="button" class="danger" (click)="erase(o.fullName, o.keptInvoiceCount)">
        <mat-icon>person_remove</mat-icon>
        Erase athlete…
      </button>
    }
  `,
  styles: `
    :host {
      display: grid;
      gap: 12px;
    }
    .notice {
      display: flex;
      gap: 12px;
      padding: 12px 16px;
      border-radius: 8px;
      background: var(--mat-sys-surface-container-high);
      border-left: 4px solid var(--mat-sys-tertiary);
    }
    .notice h3 {
      margin: 0 0 4px;
      font: var(--mat-sys-title-small);
    }
    .notice p {
      margin: 0 0 8px;
    }
    .notice .problem {
      margin: 8px 0 0;
      color: var(--mat-sys-error);
    }
    .facts {
      display: flex;
      flex-wrap: wrap;
      gap: 8px 32px;
      margin: 0;
    }
    .facts dt {
      font: var(--mat-sys-label-medium);
      color: var(--mat-sys-on-surface-variant);
    }
    .facts dd {
      margin: 0;
    }
    .section-title {
      margin: 12px 0 0;
      font: var(--mat-sys-title-medium);
    }
    .danger {
      justify-self: start;
      color: var(--mat-sys-error);
    }
  `,
})
export class AthleteData {
  private readonly api = inject(PrivacyApi);
  private readonly dialog = inject(MatDialog);
  private readonly snackBar = inject(MatSnackBar);
  private readonly router = inject(Router);

  readonly athleteId = input.required<number>();
  protected readonly overview = rxResource({ params: () => this.athleteId(), stream: ({ params }) => this.api.overview(params) });
  protected readonly erasureCaution = ERASURE_CAUTION;
  protected readonly bytes = formatBytes;
  protected readonly errorMessage = errorMessage;
  /** Whether the clips are being erased. */
  protected readonly erasingClips = signal(false);
  /** Why erasing the clips failed, or null. */
  protected readonly clipsProblem = signal<string | null>(null);

  protected consentWord(granted: boolean | null): string {
    return granted === null ? 'Not recorded' : granted ? 'Given' : 'Withdrawn';
  }

  protected eraseClips(count: number): void {
    this.dialog
      .open<ConfirmDialog, ConfirmDialogData, boolean>(ConfirmDialog, {
        data: {
          title: `Erase ${count} clip${count === 1 ? '' : 's'}?`,
          message:
            'The clips, their frames, marks and measures, and the stills and annotated clips made from them are removed for good. The rest of the record stays.',
          confirmLabel: 'Erase clips',
          dismissLabel: 'Keep clips',
        },
      })
      .afterClosed()
      .pipe(
        filter((yes) => yes === true),
        switchMap(() => {
          this.clipsProblem.set(null);
          this.erasingClips.set(true);
          return this.api.eraseClips(this.athleteId());
        }),
      )
      .subscribe({
        next: (r) => {
          this.erasingClips.set(false);
          this.snackBar.open(`${r.removedClips} clip${r.removedClips === 1 ? '' : 's'} erased`, 'OK', { duration: 4000 });
          this.overview.reload();
        },
        error: (err: unknown) => {
          this.erasingClips.set(false);
          this.clipsProblem.set(errorMessage(err));
        },
      });
  }

  protected erase(fullName: string, keptInvoiceCount: number): void {
    this.dialog
      .open<EraseAthleteDialog, EraseAthleteData, ErasureResult>(EraseAthleteDialog, {
        data: { athleteId: this.athleteId(), fullName, keptInvoiceCount },
        width: '560px',
        maxWidth: '95vw',
        autoFocus: 'first-tabbable',
      })
      .afterClosed()
      .subscribe((result) => {
        if (!result) return;
        this.snackBar.open(
          `${fullName} was erased.${result.keptInvoices ? ` Kept invoices now show “Erased athlete ${result.reference}”.` : ''}`,
          'OK',
          { duration: 8000 },
        );
        void this.router.navigate(['/athletes']);
      });
  }
}
