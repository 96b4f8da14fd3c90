import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, DestroyRef, computed, inject, input, signal } from '@angular/core';
import { rxResource, takeUntilDestroyed } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { EXPORT_LINK_HOURS } from '../../../contracts/privacy';
import { errorMessage } from '../../core/api-error';
import { PrivacyApi } from '../../core/data/privacy-api';
import { ProcessingEvents } from '../../core/processing-events';
import { followRenders } from '../sharing/follow-renders';
import { ErrorState } from '../states/error-state';
import { exportLine, isBuilding } from './export-words';

/**
 * "Download the data": one zip of everything held about the athlete, prepared in the background
 * (progress from the athlete's processing stream), downloadable for {@link EXPORT_LINK_HOURS} hours.
 * Used by the owner's Data tab and the athlete's portal profile.
 */
@Component({
  selector: 'app-data-export-card',
  imports: [DatePipe, MatButtonModule, MatIconModule, MatProgressBarModule, ErrorState],
  changeDetection: ChangeDetectionStrategy.OnPush,
  template: `
    <p class="muted small">{{ intro() }}</p>
    <div class="row">
      <button mat-stroked-button type="button" (click)="start()" [disabled]="starting() || building()">
        <mat-icon>archive</mat-icon>
        Prepare export
      </button>
    </div>
    @if (problem(); as p) {
      <p class="problem" role="alert">{{ p }}</p>
    }
    @if (exports.error(); as error) {
      <app-error-state title="Couldn't load the exports" [message]="errorMessage(error)" (retry)="exports.reload()" />
    } @else if (exports.isLoading() && !exports.hasValue()) {
      <mat-progress-bar mode="indeterminate" aria-label="Loading the exports" />
    } @else if (exports.hasValue() && !exports.value().length) {
      <p class="muted small none">No export prepared yet.</p>
    } @else if (exports.hasValue()) {
      <ul class="exports" aria-label="Exports">
        @for (e of exports.value(); track e.id) {
          <li>
            <div class="line">
              <span>{{ e.createdAt | date: 'medium' }}</span>
              <span class="muted">{{ line(e) }}</span>
            </div>
            @if (e.status === 'building') {
              <mat-progress-bar mode="determinate" [value]="e.progress * 100" aria-label="Preparing the export" />
            }
            @if (e.downloadUrl) {
              <div class="line">
                <a mat-flat-button [href]="e.downloadUrl" download>
                  <mat-icon>download</mat-icon>
                  Download zip
                </a>
                <span class="muted small">The link works until {{ e.expiresAt | date: 'medium' }}.</span>
              </div>
            }
          </li>
        }
      </ul>
    }
  `,
  styles: `
    .row,
    .line {
      display: flex;
      flex-wrap: wrap;
      align-items: center;
      gap: 8px 16px;
    }
    .exports {
      list-style: none;
      padding: 0;
      margin: 12px 0 0;
      display: grid;
      gap: 12px;
    }
    .problem {
      color: var(--mat-sys-error);
    }
    .none {
      margin: 12px 0 0;
    }
  `,
})
export class DataExportCard {
  private readonly api = inject(PrivacyApi);
  private readonly events = inject(ProcessingEvents);
  private readonly destroyRef = inject(DestroyRef);

  readonly athleteId = input.required<number>();
  /** Who reads the card: the athlete ("your data") or the clinic's owner. */
  readonly audience = input<'athlete' | 'owner'>('owner');

  protected readonly exports = rxResource({ params: () => this.athleteId(), stream: ({ params }) => this.api.exports(params) });
  protected readonly starting = signal(false);
  protected readonly problem = signal<string | null>(null);
  protected readonly building = computed(() => this.exports.hasValue() && isBuilding(this.exports.value()));
  protected readonly intro = computed(() =>
    this.audience() === 'athlete'
      ? `One zip with everything your clinic holds about you: your profile and intake, consents, visits, clips, marks and measures, plans and logs, invoices and receipts, and a README explaining each file. The link works for ${EXPORT_LINK_HOURS} hours.`
      : `One zip with everything held about this athlete (rows as JSON, original clips, stills, summaries, annotated clips, receipts, a README). The link works for ${EXPORT_LINK_HOURS} hours; each download is recorded.`,
  );
  protected readonly line = exportLine;
  protected readonly errorMessage = errorMessage;

  constructor() {
    // Progress and completion come from the athlete's one progress stream (shared with the page's other lists).
    followRenders(this.events, this.athleteId, {
      connected: (again) => {
        if (again) this.exports.reload();
      },
      item: (ev) => {
        if (ev.subject !== 'data_export') return;
        if (ev.state === 'running' && ev.progress) {
          const progress = ev.progress.total > 0 ? ev.progress.done / ev.progress.total : 0;
          this.exports.update((list) => list?.map((e) => (e.id === ev.id ? { ...e, progress } : e)));
        } else if (ev.state !== 'queued') {
          this.exports.reload();
        }
      },
    })
      .pipe(takeUntilDestroyed())
      .subscribe();
  }

  protected start(): void {
    // A second click or Enter before the button shows disabled sends nothing (the server would refuse it: export_running).
    if (this.starting() || this.building()) return;
    this.starting.set(true);
    this.problem.set(null);
    this.api
      .startExport(this.athleteId())
      .pipe(takeUntilDestroyed(this.destroyRef))
      .subscribe({
        next: (e) => {
          this.starting.set(false);
          this.exports.update((list) => [e, ...(list ?? [])]);
        },
        error: (err: unknown) => {
          this.starting.set(false);
          this.problem.set(errorMessage(err));
        },
      });
  }
}
