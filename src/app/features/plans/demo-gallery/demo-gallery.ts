import { ChangeDetectionStrategy, Component, ElementRef, computed, inject, input, signal, viewChild } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { errorMessage, errorStatus } from '../../../core/api-error';
import { DemonstrationsApi } from '../demonstrations-api';
import { demoSlides, positionLabel, shownIndex, steppedIndex } from './gallery-logic';

/**
 * The demonstration pictures and clip of one exercise, one at a time: swipe on a phone (the track
 * snaps slide by slide), the arrow buttons or ← → on a computer; each with its one-line caption.
 * The clip plays inline, looped and muted, with its poster until it starts. Shows nothing when the
 * exercise has neither (or the caller may not see them); a failed load says why, with Try again.
 */
@Component({
  selector: 'app-demo-gallery',
  imports: [MatButtonModule, MatIconModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './demo-gallery.html',
  styleUrl: './demo-gallery.scss',
})
export class DemoGallery {
  private readonly api = inject(DemonstrationsApi);
  readonly exerciseId = input.required<number>();
  /** The exercise's name, for the pictures' descriptions. */
  readonly exerciseName = input.required<string>();

  protected readonly loaded = rxResource({
    params: () => ({ id: this.exerciseId(), changes: this.api.changes() }),
    stream: ({ params }) => this.api.of(params.id),
  });
  protected readonly slides = computed(() =>
    this.loaded.hasValue() ? demoSlides(this.loaded.value().pictures, this.loaded.value().clip) : [],
  );
  /**
   * Why the pictures could not be loaded, or null. A 404 (an exercise the athlete's plans do not
   * hold) shows nothing, as an exercise without pictures does.
   */
  protected readonly problem = computed(() => {
    const err = this.loaded.error();
    return err && errorStatus(err) !== 404 ? errorMessage(err) : null;
  });
  protected readonly index = signal(0);
  protected readonly label = computed(() => positionLabel(this.index(), this.slides().length, this.slides()[this.index()]?.kind));
  private readonly track = viewChild<ElementRef<HTMLElement>>('track');

  protected onScroll(el: HTMLElement): void {
    this.index.set(shownIndex(el.scrollLeft, el.clientWidth, this.slides().length));
  }

  protected step(by: number): void {
    this.go(steppedIndex(this.index(), by, this.slides().length));
  }

  protected go(i: number): void {
    const el = this.track()?.nativeElement;
    if (!el) return;
    this.index.set(i);
    el.scrollTo({ left: i * el.clientWidth, behavior: 'smooth' });
  }

  protected onKey(event: KeyboardEvent): void {
    if (event.key !== 'ArrowLeft' && event.key !== 'ArrowRight') return;
    event.preventDefault();
    this.step(event.key === 'ArrowLeft' ? -1 : 1);
  }
}
