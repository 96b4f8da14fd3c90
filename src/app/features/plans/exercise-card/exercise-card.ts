import { ChangeDetectionStrategy, Component, computed, input, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import type { Dose, Exercise } from '../../../../contracts/plans';
import { EXERCISE_REGION_LABELS, LOADING_KIND_LABELS } from '../../../../contracts/plans';
import { doseParts } from '../../../shared/plan-words';
import { DemoGallery } from '../demo-gallery/demo-gallery';

let nextId = 0;

/**
 * An exercise: name, kind and region, dose (the prescription when given, else the library
 * default), its demonstration pictures when asked, purpose, and step-by-step instructions with cautions behind "How to do it" — and,
 * for the staff, the published programme it comes from.
 */
@Component({
  selector: 'app-exercise-card',
  imports: [MatButtonModule, MatIconModule, DemoGallery],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './exercise-card.html',
  styleUrl: './exercise-card.scss',
})
export class ExerciseCard {
  readonly exercise = input.required<Exercise>();
  /** The dose prescribed on a stage; the library default when absent. */
  readonly dose = input<Dose | null>(null);
  readonly notes = input<string | null>(null);
  /** Open "How to do it" from the start. */
  readonly expanded = input(false);
  /** Heading level of the name (h3 inside pages, h2 in lists). */
  readonly headingLevel = input<2 | 3 | 4>(3);
  /** Whether to show where the exercise comes from (staff pages; the athlete's plan leaves it out). */
  readonly showSource = input(false);
  /** Whether to show the exercise's demonstration pictures (swipe) above the dose. */
  readonly showDemonstrations = input(false);

  private readonly toggled = signal<boolean | null>(null);
  protected readonly open = computed(() => this.toggled() ?? this.expanded());
  protected readonly parts = computed(() => doseParts(this.dose() ?? this.exercise().dose));
  protected readonly kindLabels = LOADING_KIND_LABELS;
  protected readonly regionLabels = EXERCISE_REGION_LABELS;
  protected readonly detailsId = `exercise-details-${nextId++}`;

  protected toggle(): void {
    this.toggled.set(!this.open());
  }
}
