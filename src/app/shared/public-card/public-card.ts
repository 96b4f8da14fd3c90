import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import { MatCardModule } from '@angular/material/card';
import { BrandMark } from '../brand-mark/brand-mark';

/**
 * Frame for the pages people see before signing in: the brand above a centred card.
 * Project the page body; `[card-footer]` content goes under it.
 */
@Component({
  selector: 'app-public-card',
  imports: [MatCardModule, BrandMark],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './public-card.html',
  styleUrl: './public-card.scss',
})
export class PublicCard {
  /** Card heading (the page's `<h1>`). */
  readonly heading = input.required<string>();
}
