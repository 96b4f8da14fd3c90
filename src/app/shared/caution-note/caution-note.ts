import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';
import { MEASURES_CAUTION } from '../caution';

/**
 * A caution shown as calm information (never the error colour): an icon and a short text on a
 * neutral surface. The look lives once in `styles.scss` (`.caution`), so a plain
 * `<p class="caution">` reads the same.
 */
@Component({
  selector: 'app-caution-note',
  imports: [MatIconModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  host: {
    class: 'caution',
    role: 'note',
    '[class.caution-compact]': 'compact()',
    '[class.caution-on-dark]': 'onDark()',
  },
  template: `<mat-icon aria-hidden="true">health_and_safety</mat-icon><span class="caution-text">{{ text() }}</span>`,
})
export class CautionNote {
  /** The words; the measures caution unless told. */
  readonly text = input(MEASURES_CAUTION);
  /** Whether it is one quiet line under a table or chart instead of a boxed note. */
  readonly compact = input(false);
  /** Whether it sits on a dark surface (the enlarged still). */
  readonly onDark = input(false);
}
