import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MAT_DIALOG_DATA, MatDialogModule } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { concatMap, from } from 'rxjs';
import { DEMO_LIMITS, type DemoPicture } from '../../../../contracts/demonstrations';
import type { Exercise } from '../../../../contracts/plans';
import { errorMessage } from '../../../core/api-error';
import { DemonstrationsApi } from '../demonstrations-api';
import { EmptyState } from '../../../shared/states/empty-state';
import { ErrorState } from '../../../shared/states/error-state';
import { DemoClipEditor } from './demo-clip-editor';

/** One file being sent: its name, progress (null while the server processes it) or why it was refused. */
interface Sending {
  key: number;
  name: string;
  fraction: number | null;
  problem: string | null;
}

let nextKey = 0;

/**
 * The demonstration pictures of one exercise (staff): add up to four (JPEG, PNG or GIF; location
 * and camera data are removed on the server), give each a one-line caption, put them in order,
 * remove them. Each file shows its upload and processing progress, or why it was refused. Below
 * them the exercise's clip ({@link DemoClipEditor}).
 */
@Component({
  selector: 'app-demo-editor-dialog',
  imports: [
    MatButtonModule,
    MatDialogModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
    MatProgressBarModule,
    DemoClipEditor,
    EmptyState,
    ErrorState,
  ],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './demo-editor-dialog.html',
  styleUrl: './demo-editor-dialog.scss',
})
export class DemoEditorDialog {
  private readonly api = inject(DemonstrationsApi);
  protected readonly exercise = inject<{ exercise: Exercise }>(MAT_DIALOG_DATA).exercise;
  protected readonly limits = DEMO_LIMITS;
  protected readonly loaded = rxResource({
    params: () => ({ id: this.exercise.id, changes: this.api.changes() }),
    stream: ({ params }) => this.api.of(params.id),
  });
  protected readonly pictures = computed(() => (this.loaded.hasValue() ? this.loaded.value().pictures : []));
  protected readonly clip = computed(() => (this.loaded.hasValue() ? this.loaded.value().clip : null));
  protected readonly sending = signal<Sending[]>([]);
  protected readonly busy = computed(() => this.sending().some((s) => s.problem === null));
  protected readonly room = computed(() => DEMO_LIMITS.pictures - this.pictures().length - this.sending().filter((s) => !s.problem).length);
  protected readonly problem = signal<string | null>(null);
  protected readonly errorMessage = errorMessage;

  protected choose(input: HTMLInputElement): void {
    const files = [...(input.files ?? [])];
    input.value = '';
    this.problem.set(null);
    const room = this.room();
    if (files.length > room) {
      this.problem.set(
        `An exercise has at most ${DEMO_LIMITS.pictures} pictures: ${room === 0 ? 'remove one first' : `choose at most ${room} more`}.`,
      );
      files.splice(room);
    }
    const rows = files.map((f) => ({ key: nextKey++, name: f.name, fraction: 0, problem: null }) satisfies Sending);
    this.sending.update((s) => [...s.filter((x) => !x.problem), ...rows]);
    from(files.map((file, i) => ({ file, key: rows[i]!.key })))
      .pipe(concatMap(({ file, key }) => this.send(file, key)))
      .subscribe();
  }

  private send(file: File, key: number) {
    const patch = (change: Partial<Sending>) => this.sending.update((all) => all.map((s) => (s.key === key ? { ...s, ...change } : s)));
    return new Promise<void>((resolve) => {
      this.api.add(this.exercise.id, file, '').subscribe({
        next: (e) => {
          if (e.kind === 'sending') patch({ fraction: e.fraction });
          else if (e.kind === 'processing') patch({ fraction: null });
          else this.sending.update((all) => all.filter((s) => s.key !== key));
        },
        error: (err: unknown) => {
          patch({ problem: errorMessage(err) });
          resolve();
        },
        complete: () => resolve(),
      });
    });
  }

  protected saveCaption(p: DemoPicture, value: string): void {
    const caption = value.trim();
    if (caption === p.caption) return;
    this.api.update(p.id, { caption }).subscribe({ error: (err: unknown) => this.problem.set(errorMessage(err)) });
  }

  protected move(p: DemoPicture, by: number): void {
    this.api.update(p.id, { position: p.position + by }).subscribe({ error: (err: unknown) => this.problem.set(errorMessage(err)) });
  }

  protected remove(p: DemoPicture): void {
    this.api.remove(p.id).subscribe({ error: (err: unknown) => this.problem.set(errorMessage(err)) });
  }

  protected dismiss(key: number): void {
    this.sending.update((all) => all.filter((s) => s.key !== key));
  }
}
