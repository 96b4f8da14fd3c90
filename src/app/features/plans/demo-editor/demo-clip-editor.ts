import { ChangeDetectionStrategy, Component, DestroyRef, computed, inject, input, signal } from '@angular/core';
import { takeUntilDestroyed } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { DEMO_LIMITS, type DemoClip } from '../../../../contracts/demonstrations';
import { errorMessage } from '../../../core/api-error';
import { ProcessingEvents } from '../../../core/processing-events';
import { DemonstrationsApi } from '../demonstrations-api';

/** The clip's upload: sent fraction (null while the server checks it) or why it was refused. */
interface ClipSending {
  name: string;
  fraction: number | null;
  problem: string | null;
}

/**
 * The one demonstration clip of an exercise (staff): upload a clip of at most 30 s, follow it being
 * made ready for phones (progress on the clinic's stream), play it, caption it, place it among the
 * pictures, remove it.
 */
@Component({
  selector: 'app-demo-clip-editor',
  imports: [MatButtonModule, MatFormFieldModule, MatIconModule, MatInputModule, MatProgressBarModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './demo-clip-editor.html',
  styleUrl: './demo-editor-dialog.scss',
})
export class DemoClipEditor {
  private readonly api = inject(DemonstrationsApi);
  readonly exerciseId = input.required<number>();
  readonly clip = input.required<DemoClip | null>();
  /** How many pictures the clip is placed among. */
  readonly pictureCount = input.required<number>();
  protected readonly limits = DEMO_LIMITS;
  protected readonly sending = signal<ClipSending | null>(null);
  /** Fraction of the phone version made, from the progress stream (null before any report). */
  protected readonly made = signal<number | null>(null);
  protected readonly place = computed(() => {
    const c = this.clip();
    if (!c) return '';
    const at = Math.min(c.position, this.pictureCount());
    return at >= this.pictureCount() ? 'Shown after the pictures' : `Shown before picture ${at + 1}`;
  });

  constructor() {
    inject(ProcessingEvents)
      .followClinic()
      .pipe(takeUntilDestroyed(inject(DestroyRef)))
      .subscribe({
        next: (m) => {
          if (m.type === 'connected') return this.api.refresh();
          const e = m.event;
          if (e.subject !== 'demo_clip' || e.id !== this.clip()?.id) return;
          if (e.state === 'running' && e.progress) this.made.set(e.progress.done / Math.max(1, e.progress.total));
          if (e.state === 'ready' || e.state === 'failed') {
            this.made.set(null);
            this.api.refresh();
          }
        },
        // Live updates stopped: the page still shows the state as loaded.
        error: () => undefined,
      });
  }

  protected choose(input: HTMLInputElement): void {
    const file = input.files?.[0];
    input.value = '';
    if (!file) return;
    this.sending.set({ name: file.name, fraction: 0, problem: null });
    this.api.addClip(this.exerciseId(), file, '').subscribe({
      next: (e) => {
        if (e.kind === 'sending') this.sending.set({ name: file.name, fraction: e.fraction, problem: null });
        else if (e.kind === 'processing') this.sending.set({ name: file.name, fraction: null, problem: null });
        else {
          this.sending.set(null);
          this.made.set(0);
          this.api.refresh();
        }
      },
      error: (err: unknown) => this.sending.set({ name: file.name, fraction: null, problem: errorMessage(err) }),
    });
  }

  protected saveCaption(c: DemoClip, value: string): void {
    const caption = value.trim();
    if (caption === c.caption) return;
    this.api.updateClip(c.id, { caption }).subscribe({ error: (err: unknown) => this.fail(err) });
  }

  protected move(c: DemoClip, by: number): void {
    const position = Math.min(Math.max(0, Math.min(c.position, this.pictureCount()) + by), this.pictureCount());
    this.api.updateClip(c.id, { position }).subscribe({ error: (err: unknown) => this.fail(err) });
  }

  protected remove(c: DemoClip): void {
    this.api.removeClip(c.id).subscribe({ error: (err: unknown) => this.fail(err) });
  }

  protected dismiss(): void {
    this.sending.set(null);
  }

  private fail(err: unknown): void {
    this.sending.set({ name: '', fraction: null, problem: errorMessage(err) });
  }
}
