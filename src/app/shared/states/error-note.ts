import { ChangeDetectionStrategy, Component, input, output } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';

/**
 * A failed load of something the page can do without (the clinic's bands, a name, an invitation
 * check): one calm line saying what is missing and why, with "Try again". The page around it keeps
 * working; a load the page depends on gets `<app-error-state>` instead.
 */
@Component({
  selector: 'app-error-note',
  imports: [MatButtonModule, MatIconModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  host: { role: 'status', class: 'error-note' },
  template: `
    <mat-icon class="error-note-icon" aria-hidden="true">info</mat-icon>
    <span class="error-note-text">{{ text() }} {{ message() }}</span>
    <button mat-button type="button" class="error-note-retry" (click)="retry.emit()">
      <mat-icon>refresh</mat-icon>
      Try again
    </button>
  `,
  styles: `
    :host {
      display: flex;
      flex-wrap: wrap;
      align-items: center;
      gap: 4px 8px;
      font: var(--mat-sys-body-small);
      color: var(--mat-sys-on-surface-variant);
    }
    .error-note-icon {
      flex: none;
      font-size: 18px;
      inline-size: 18px;
      block-size: 18px;
    }
    .error-note-text {
      flex: 0 1 auto;
    }
  `,
})
export class ErrorNote {
  /** What is missing and what the page does instead, e.g. "The clinic's bands could not be loaded; the defaults are shown." */
  readonly text = input.required<string>();
  /** The reason (the server's message). */
  readonly message = input('');
  /** Emits when the user asks to load it again. */
  readonly retry = output<void>();
}
