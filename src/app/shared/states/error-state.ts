import { ChangeDetectionStrategy, Component, input, output } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';

/** A failed load: what went wrong and a "Try again" button. */
@Component({
  selector: 'app-error-state',
  imports: [MatButtonModule, MatIconModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  host: { role: 'alert', class: 'state-box' },
  template: `
    <mat-icon class="state-icon">error_outline</mat-icon>
    <p class="state-title">{{ title() }}</p>
    <p class="state-text">{{ message() }}</p>
    @if (retryable()) {
      <button mat-stroked-button type="button" (click)="retry.emit()">
        <mat-icon>refresh</mat-icon>
        Try again
      </button>
    }
  `,
})
export class ErrorState {
  readonly title = input("Couldn't load this");
  readonly message = input.required<string>();
  readonly retryable = input(true);
  readonly retry = output<void>();
}
