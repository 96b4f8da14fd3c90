import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, linkedSignal, signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { FormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCardModule } from '@angular/material/card';
import { MatDialog } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSnackBar } from '@angular/material/snack-bar';
import { filter, type Observable } from 'rxjs';
import { RETENTION_MAX_MONTHS, type RetentionSettings } from '../../../../contracts/privacy';
import { errorMessage, fieldProblems } from '../../../core/api-error';
import { PrivacyApi } from '../../../core/data/privacy-api';
import { CautionNote } from '../../../shared/caution-note/caution-note';
import { RETENTION_CAUTION } from '../../../shared/caution';
import { formatBytes } from '../../../shared/clip-status';
import { ConfirmDialog, type ConfirmDialogData } from '../../../shared/confirm-dialog/confirm-dialog';
import { ErrorState } from '../../../shared/states/error-state';

/**
 * Clip retention (owner, `/settings/clinic`): how many months clips of athletes without activity
 * are kept (off by default), the daily check's list with sizes, and Confirm, the only way clips go.
 */
/** Typed months: empty is null (off), whole digits are the number, anything else NaN (refused before sending). */
function monthsValue(typed: number | string | null): number | null {
  const t = String(typed ?? '').trim();
  if (t === '') return null;
  return /^\d+$/.test(t) ? Number(t) : Number.NaN;
}

@Component({
  selector: 'app-retention-card',
  imports: [
    DatePipe,
    FormsModule,
    MatButtonModule,
    MatCardModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
    MatProgressBarModule,
    CautionNote,
    ErrorState,
  ],
  changeDetection: ChangeDetectionStrategy.OnPush,
  template: `
    <mat-card appearance="outlined">
      <mat-card-content>
        <h2 class="card-title">Clip retention</h2>
        <p class="muted small">
          Clips of athletes with no activity (no visit, clip, logged session, plan or profile change) for this many months are listed once a
          day for you to review. Leave empty to keep clips.
        </p>
        <app-caution-note [text]="caution" [compact]="true" />
        @if (settings.error(); as error) {
          <app-error-state title="Couldn't load the retention setting" [message]="errorMessage(error)" (retry)="settings.reload()" />
        } @else if (settings.isLoading() && !settings.hasValue()) {
          <mat-progress-bar mode="indeterminate" aria-label="Loading the retention setting" />
        } @else {
          <form class="row" (ngSubmit)="save()" novalidate>
            <mat-form-field class="months">
              <mat-label>Months without activity</mat-label>
              <input
                matInput
                inputmode="numeric"
                autocomplete="off"
                name="months"
                [ngModel]="months()"
                (ngModelChange)="months.set($event)"
                placeholder="Off"
                [disabled]="busy()"
              />
              @if (fieldProblem(); as p) {
                <mat-hint class="problem" role="alert">{{ p }}</mat-hint>
              }
            </mat-form-field>
            <button mat-stroked-button type="submit" [disabled]="busy()">Save</button>
            @if (stored()?.months) {
              <button mat-button type="button" (click)="check()" [disabled]="busy()">
                <mat-icon>manage_search</mat-icon>
                Check now
              </button>
            }
          </form>
          @if (busy()) {
            <mat-progress-bar mode="indeterminate" aria-label="Saving the retention setting" />
          }
          @if (problem(); as p) {
            <p class="problem" role="alert">{{ p }}</p>
          }

          @if (stored()?.review; as r) {
            @if (r.confirmedAt) {
              <p class="muted small">
                Last list confirmed {{ r.confirmedAt | date: 'medium' }}: {{ r.removedCount }} clip{{ r.removedCount === 1 ? '' : 's' }}
                removed.
              </p>
            } @else if (r.items.length === 0) {
              <p class="muted small">Checked {{ r.listedAt | date: 'medium' }}: no clips are due.</p>
            } @else {
              <h3 class="list-title">Due for removal (listed {{ r.listedAt | date: 'medium' }})</h3>
              <div class="table-wrap">
                <table class="due">
                  <thead>
                    <tr>
                      <th scope="col">Athlete</th>
                      <th scope="col">Visit</th>
                      <th scope="col">Clip</th>
                      <th scope="col" class="num">Size</th>
                      <th scope="col">Last activity</th>
                    </tr>
                  </thead>
                  <tbody>
                    @for (i of r.items; track i.clipId) {
                      <tr>
                        <td>{{ i.athleteName }}</td>
                        <td>{{ i.assessmentDate | date: 'mediumDate' }}</td>
                        <td class="name">{{ i.originalName }}</td>
                        <td class="num">{{ bytes(i.sizeBytes) }}</td>
                        <td>{{ i.lastActivity | date: 'mediumDate' }}</td>
                      </tr>
                    }
                  </tbody>
                </table>
              </div>
              <div class="row">
                <strong>{{ r.items.length }} clip{{ r.items.length === 1 ? '' : 's' }} · {{ bytes(r.totalBytes) }}</strong>
                <button mat-flat-button type="button" (click)="confirm(r.id, r.items.length)">Confirm removal</button>
              </div>
            }
          } @else if (stored()?.months) {
            <p class="muted small">Not checked yet: the daily check lists the clips due. Choose Check now to list them at once.</p>
          }
        }
      </mat-card-content>
    </mat-card>
  `,
  styles: `
    :host {
      display: block;
      /* A grid item: the list's table scrolls inside the card instead of widening the page. */
      min-width: 0;
    }
    .card-title {
      font: var(--mat-sys-title-large);
      margin: 8px 0 8px;
    }
    .row {
      display: flex;
      flex-wrap: wrap;
      align-items: center;
      gap: 8px 16px;
      margin-top: 12px;
    }
    .months {
      width: 220px;
    }
    .problem {
      color: var(--mat-sys-error);
    }
    p.problem {
      margin: 8px 0 0;
    }
    .list-title {
      font: var(--mat-sys-title-small);
      margin: 16px 0 8px;
    }
    .table-wrap {
      overflow-x: auto;
    }
    .due {
      border-collapse: collapse;
      width: 100%;
    }
    .due th,
    .due td {
      text-align: left;
      padding: 6px 8px;
      border-bottom: 1px solid var(--mat-sys-outline-variant);
      white-space: nowrap;
    }
    .due .num {
      text-align: right;
    }
    .due .name {
      max-width: 220px;
      overflow: hidden;
      text-overflow: ellipsis;
    }
  `,
})
export class RetentionCard {
  private readonly api = inject(PrivacyApi);
  private readonly dialog = inject(MatDialog);
  private readonly snackBar = inject(MatSnackBar);

  protected readonly settings = rxResource({ stream: () => this.api.retention() });
  /** The stored setting, or null while loading or failed (a resource in error throws from value()). */
  protected readonly stored = computed(() => (this.settings.hasValue() ? this.settings.value() : null));
  protected readonly caution = RETENTION_CAUTION;
  protected readonly max = RETENTION_MAX_MONTHS;
  protected readonly bytes = formatBytes;
  /** Why the months were refused, shown by the field; null when none. */
  protected readonly fieldProblem = signal<string | null>(null);
  /** Why checking or confirming failed, or null. */
  protected readonly problem = signal<string | null>(null);
  /** Whether a change is on its way to the server. */
  protected readonly busy = signal(false);
  protected readonly errorMessage = errorMessage;
  /** What the field shows: the stored value once loaded, then what the owner types. */
  protected readonly months = linkedSignal<number | string | null>(() => this.stored()?.months ?? null);

  /** Whether months were typed and not saved yet. */
  hasUnsavedChanges(): boolean {
    const stored = this.stored();
    if (!stored) return false;
    const typed = this.months();
    return String(typed ?? '') !== String(stored.months ?? '');
  }

  protected save(): void {
    const value = monthsValue(this.months());
    if (Number.isNaN(value)) {
      // Not sent: "0,5" or "12e" must not become 5 months or "off".
      this.problem.set(null);
      this.fieldProblem.set(`Enter whole months from 1 to ${this.max}, e.g. 24, or leave it empty for off.`);
      return;
    }
    this.apply(this.api.setRetention(value), value === null ? 'Clip retention off' : `Clips kept ${value} months after the last activity`);
  }

  protected check(): void {
    this.apply(this.api.checkRetention());
  }

  protected confirm(reviewId: number, count: number): void {
    this.dialog
      .open<ConfirmDialog, ConfirmDialogData, boolean>(ConfirmDialog, {
        data: {
          title: `Remove ${count} clip${count === 1 ? '' : 's'}?`,
          message:
            'The listed clips, their frames, marks and measures are removed for good. The athletes and the rest of their records stay.',
          confirmLabel: 'Remove clips',
          dismissLabel: 'Keep them',
        },
      })
      .afterClosed()
      .pipe(filter((yes) => yes === true))
      .subscribe(() => this.apply(this.api.confirmRetention(reviewId)));
  }

  /** Sends one change; on failure what was typed stays and the problem shows by the field (refused months) or below the form. */
  private apply(call: Observable<RetentionSettings>, done?: string): void {
    this.problem.set(null);
    this.fieldProblem.set(null);
    this.busy.set(true);
    call.subscribe({
      next: (s) => {
        this.busy.set(false);
        this.settings.set(s);
        this.months.set(s.months);
        if (done) this.snackBar.open(done, 'OK', { duration: 3000 });
      },
      error: (err: unknown) => {
        this.busy.set(false);
        const field = fieldProblems(err)[0]?.message;
        if (field) this.fieldProblem.set(field);
        else this.problem.set(errorMessage(err));
      },
    });
  }
}
