import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatCardModule } from '@angular/material/card';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { errorMessage } from '../../../core/api-error';
import { ClinicBrandStore } from '../../../core/data/clinic-brand-store';

/**
 * The clinic's logo (owner): upload a PNG (transparency kept) or JPEG; it appears on visit
 * summaries, receipts and invoices, e-mails and the portal's header. Processed on the server
 * (upright, at most 600 px, metadata removed).
 */
@Component({
  selector: 'app-logo-card',
  imports: [MatButtonModule, MatCardModule, MatIconModule, MatProgressBarModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  template: `
    <mat-card appearance="outlined">
      <mat-card-content>
        <h2 class="card-title">Logo</h2>
        <p class="intro">
          Shown on visit summaries, receipts and invoices, e-mails to athletes and the top of every page. A PNG with a transparent
          background looks best; it is scaled to at most 600 px and its metadata removed.
        </p>
        @if (busy()) {
          <mat-progress-bar mode="indeterminate" aria-label="Processing the logo" />
        }
        @if (problem(); as p) {
          <p class="form-problem" role="alert">
            <mat-icon aria-hidden="true">error_outline</mat-icon><span>{{ p }}</span>
          </p>
        }
        <div class="preview">
          @if (brand.logoUrl(); as url) {
            <img [src]="url" alt="Current logo" />
          } @else {
            <span class="muted">No logo yet: documents show the clinic's name.</span>
          }
        </div>
        <div class="actions">
          <input #file type="file" accept="image/png,image/jpeg" hidden (change)="upload(file)" />
          <button mat-stroked-button type="button" (click)="file.click()" [disabled]="busy()">
            <mat-icon>upload</mat-icon>{{ brand.logoUrl() ? 'Replace logo' : 'Upload logo' }}
          </button>
          @if (brand.logoUrl()) {
            <button mat-button type="button" (click)="remove()" [disabled]="busy()">Remove</button>
          }
        </div>
      </mat-card-content>
    </mat-card>
  `,
  styles: `
    .preview {
      display: flex;
      align-items: center;
      min-block-size: 72px;
      margin: 8px 0;
      padding: 12px;
      border-radius: 8px;
      background: repeating-conic-gradient(var(--mat-sys-surface-container) 0 25%, var(--mat-sys-surface) 0 50%) 0 0 / 16px 16px;
    }
    .preview img {
      max-block-size: 72px;
      max-inline-size: 100%;
      object-fit: contain;
    }
    .actions {
      display: flex;
      gap: 8px;
    }
  `,
})
export class LogoCard {
  protected readonly brand = inject(ClinicBrandStore);
  protected readonly busy = signal(false);
  protected readonly problem = signal<string | null>(null);

  protected upload(input: HTMLInputElement): void {
    const file = input.files?.[0];
    input.value = '';
    if (!file) return;
    this.run(this.brand.putLogo(file));
  }

  protected remove(): void {
    this.run(this.brand.removeLogo());
  }

  private run(call: ReturnType<ClinicBrandStore['removeLogo']> | ReturnType<ClinicBrandStore['putLogo']>): void {
    this.busy.set(true);
    this.problem.set(null);
    (call as ReturnType<ClinicBrandStore['removeLogo']>).subscribe({
      next: () => undefined,
      error: (err: unknown) => {
        this.busy.set(false);
        this.problem.set(errorMessage(err));
      },
      complete: () => {
        this.busy.set(false);
        this.brand.reload();
      },
    });
  }
}
