import { ChangeDetectionStrategy, Component, input, output } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';

/**
 * Move up, move down and remove buttons of one entry of an ordered list (a plan's stage, a
 * stage's exercise), labelled for screen readers with the entry's name ("Move stage 2 up",
 * "Remove Bridge hold"), with touch targets of at least 44 px on a phone.
 */
@Component({
  selector: 'app-reorder-buttons',
  imports: [MatButtonModule, MatIconModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  template: `
    <button mat-icon-button type="button" (click)="moveUp.emit()" [disabled]="first()" [attr.aria-label]="'Move ' + label() + ' up'">
      <mat-icon>arrow_upward</mat-icon>
    </button>
    <button mat-icon-button type="button" (click)="moveDown.emit()" [disabled]="last()" [attr.aria-label]="'Move ' + label() + ' down'">
      <mat-icon>arrow_downward</mat-icon>
    </button>
    <button mat-icon-button type="button" (click)="remove.emit()" [attr.aria-label]="'Remove ' + label()">
      <mat-icon>{{ removeIcon() }}</mat-icon>
    </button>
  `,
  styles: `
    :host {
      display: inline-flex;
      flex: none;
      gap: 2px;
    }
    button {
      min-inline-size: 44px;
      min-block-size: 44px;
    }
  `,
})
export class ReorderButtons {
  /** The entry's name in the buttons' labels: "stage 2", "Bridge hold". */
  readonly label = input.required<string>();
  /** Whether the entry cannot move up (the first, or held in place). */
  readonly first = input(false);
  /** Whether the entry cannot move down (the last, or held in place). */
  readonly last = input(false);
  /** Icon of the remove button. */
  readonly removeIcon = input<'delete' | 'close'>('close');
  readonly moveUp = output<void>();
  readonly moveDown = output<void>();
  readonly remove = output<void>();
}
