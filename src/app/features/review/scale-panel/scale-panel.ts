import { ChangeDetectionStrategy, Component, ElementRef, computed, effect, inject, linkedSignal, signal, viewChild } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { ANNOTATION_LIMITS } from '../../../../contracts/annotations';
import { ReviewStore } from '../review-store';
import { lengthBasisText, mmPerPx, readScaleLength, scaleLengthPx } from '../scale-bar';

/** Draw the scale bar, give its length in metres, see mm per pixel and what lengths rest on. */
@Component({
  selector: 'app-scale-panel',
  imports: [MatButtonModule, MatFormFieldModule, MatIconModule, MatInputModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './scale-panel.html',
  styleUrl: './scale-panel.scss',
})
export class ScalePanel {
  protected readonly store = inject(ReviewStore);
  private readonly lengthInput = viewChild<ElementRef<HTMLInputElement>>('lengthInput');

  protected readonly limits = ANNOTATION_LIMITS.scaleLengthM;
  protected readonly scale = computed(() => this.store.annotations().scale);
  protected readonly draft = computed(() => (this.store.scaleDraftComplete() ? this.store.scaleDraft() : null));
  protected readonly basis = computed(() => lengthBasisText(this.store.surface(), this.store.beltSpeedMps()));

  /** The length typed (prefilled with the saved bar's length). */
  protected readonly lengthText = linkedSignal(() => {
    const s = this.scale();
    return s ? String(s.lengthM) : '';
  });
  protected readonly lengthError = signal<string | null>(null);

  protected readonly draftPx = computed(() => {
    const d = this.draft();
    return d ? Math.round(scaleLengthPx(d.a, d.b, this.store.frameSize())) : null;
  });
  protected readonly saved = computed(() => {
    const s = this.scale();
    if (!s) return null;
    const frame = this.store.frameSize();
    const px = scaleLengthPx(s.a, s.b, frame);
    return { px: Math.round(px), mmPerPx: mmPerPx(s.a, s.b, s.lengthM, frame), lengthM: s.lengthM, frame: s.frame };
  });

  constructor() {
    // When a line has just been drawn, put the cursor in the length field.
    effect(() => {
      if (this.draft()) queueMicrotask(() => this.lengthInput()?.nativeElement.focus());
    });
  }

  protected onInput(text: string): void {
    this.lengthText.set(text);
    this.lengthError.set(null);
  }

  /** Saves the drawn line with the typed length, or a new length for the saved bar. */
  protected apply(): void {
    const read = readScaleLength(this.lengthText());
    if ('error' in read) {
      this.lengthError.set(read.error);
      return;
    }
    const draft = this.draft();
    const saved = this.scale();
    if (draft) this.store.setScale({ frame: draft.frame, a: draft.a, b: draft.b, lengthM: read.value });
    else if (saved) this.store.setScale({ ...saved, lengthM: read.value });
  }

  protected discard(): void {
    this.store.scaleDraft.set(null);
    this.lengthError.set(null);
  }

  protected draw(): void {
    this.store.setTool('scale');
  }

  protected remove(): void {
    this.store.setScale(null);
  }

  protected goToFrame(frame: number): void {
    this.store.step(frame - this.store.frame());
  }
}
