import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';

/** Nothing here yet: an icon, a title, a line of text and projected actions. */
@Component({
  selector: 'app-empty-state',
  imports: [MatIconModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  host: { class: 'state-box' },
  template: `
    <mat-icon class="state-icon">{{ icon() }}</mat-icon>
    <p class="state-title">{{ title() }}</p>
    <p class="state-text"><ng-content /></p>
    <ng-content select="[state-actions]" />
  `,
})
export class EmptyState {
  readonly icon = input('inbox');
  readonly title = input.required<string>();
}
