import {
  afterNextRender,
  ChangeDetectionStrategy,
  Component,
  DestroyRef,
  ElementRef,
  Injector,
  computed,
  inject,
  input,
  output,
  signal,
} from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { Subscription } from 'rxjs';
import type { Clip } from '../../../../contracts/api';
import { UPLOAD } from '../../../../contracts/assessment';
import { ResumableClipUploads } from '../../../core/data/resumable-clip-uploads';
import { formatBytes } from '../../../shared/clip-status';
import { ConfigStore } from '../../../core/config-store';
import {
  HeldClip,
  UploadItem,
  UploadState,
  addFiles,
  clearFinished,
  isBusy,
  markCancelled,
  markDone,
  markFailed,
  markProgress,
  markReconnected,
  markReconnecting,
  markResumed,
  markStarted,
  nextToStart,
  removeItem,
  requeue,
  uploadErrorMessage,
  uploadPercent,
  uploadStatusText,
} from '../upload-queue';

const STATE_ICONS: Record<UploadState, string> = {
  waiting: 'hourglass_top',
  uploading: 'upload',
  done: 'check_circle',
  failed: 'error',
  cancelled: 'cancel',
};

/**
 * Adds clips to an assessment: "Record with camera" (opens the phone's camera), "Choose files"
 * (several at once) and drag-and-drop on a desktop. Every chosen file gets a row with its own
 * progress; files go one after another as resumable uploads: a dropped connection shows
 * "reconnecting" and continues from what the server holds, and the same file chosen again after a
 * reload continues where it stopped. Emits each clip the server created.
 */
@Component({
  selector: 'app-clip-uploader',
  imports: [MatButtonModule, MatIconModule, MatProgressBarModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './clip-uploader.html',
  styleUrl: './clip-uploader.scss',
  host: {
    // A file dropped next to the zone would otherwise open in the tab and leave the app.
    '(window:dragover)': 'keepFileInApp($event)',
    '(window:drop)': 'keepFileInApp($event)',
  },
})
export class ClipUploader {
  private readonly uploads = inject(ResumableClipUploads);
  private readonly config = inject(ConfigStore);
  private readonly host = inject<ElementRef<HTMLElement>>(ElementRef);
  private readonly injector = inject(Injector);

  readonly assessmentId = input.required<number>();
  /** The assessment's clips: a file chosen again with the same name and size is held back, not sent twice. */
  readonly existing = input<readonly HeldClip[]>([]);
  /** Emits each clip as soon as the server has accepted its upload. */
  readonly uploaded = output<Clip>();

  protected readonly items = signal<UploadItem[]>([]);
  protected readonly dragging = signal(false);
  /** Whether files are still waiting or uploading (leaving the page would stop them). */
  readonly busy = computed(() => isBusy(this.items()));
  protected readonly hasFinished = computed(() => this.items().some((i) => i.state === 'done' || i.state === 'cancelled'));
  protected readonly accept = UPLOAD.accept;
  protected readonly icons = STATE_ICONS;
  protected readonly formatBytes = formatBytes;
  protected readonly percent = uploadPercent;
  protected readonly statusText = uploadStatusText;

  private nextId = 1;
  private active: { id: number; subscription: Subscription; discard(): void } | null = null;
  private dragDepth = 0;

  constructor() {
    inject(DestroyRef).onDestroy(() => this.active?.subscription.unsubscribe());
  }

  /** Adds files to the line (also used by tests and by drops). */
  addFiles(files: readonly File[]): void {
    if (!files.length) return;
    const result = addFiles(this.items(), files, this.nextId, this.config.uploadMaxBytes(), this.existing());
    this.nextId = result.nextId;
    this.items.set(result.items);
    this.pump();
    // On a phone the list opens below the picker buttons, off the screen: bring its progress into view.
    afterNextRender(() => this.host.nativeElement.querySelector('.uploads')?.scrollIntoView?.({ block: 'nearest' }), {
      injector: this.injector,
    });
  }

  protected onPicked(input: HTMLInputElement): void {
    const files = input.files ? Array.from(input.files) : [];
    // Clear the picker so choosing the same file again still reports a change.
    input.value = '';
    this.addFiles(files);
  }

  /** Outside the zone a file cannot be dropped (and the browser must not open it instead). */
  protected keepFileInApp(event: DragEvent): void {
    if (event.defaultPrevented || !event.dataTransfer?.types.includes('Files')) return;
    event.preventDefault();
    event.dataTransfer.dropEffect = 'none';
  }

  protected onDragOver(event: DragEvent): void {
    if (!event.dataTransfer?.types.includes('Files')) return;
    event.preventDefault();
    event.dataTransfer.dropEffect = 'copy';
    this.dragging.set(true);
  }

  protected onDragEnter(event: DragEvent): void {
    if (!event.dataTransfer?.types.includes('Files')) return;
    this.dragDepth += 1;
    this.dragging.set(true);
  }

  protected onDragLeave(): void {
    this.dragDepth = Math.max(0, this.dragDepth - 1);
    if (this.dragDepth === 0) this.dragging.set(false);
  }

  protected onDrop(event: DragEvent): void {
    event.preventDefault();
    this.dragDepth = 0;
    this.dragging.set(false);
    this.addFiles(event.dataTransfer?.files ? Array.from(event.dataTransfer.files) : []);
  }

  protected cancel(id: number): void {
    if (this.active?.id === id) {
      this.active.discard();
      this.active.subscription.unsubscribe();
      this.active = null;
    }
    this.items.update((list) => markCancelled(list, id));
    this.pump();
  }

  protected retry(id: number): void {
    this.items.update((list) => requeue(list, id));
    this.pump();
  }

  protected dismiss(id: number): void {
    this.items.update((list) => removeItem(list, id));
  }

  protected clearFinished(): void {
    this.items.update(clearFinished);
  }

  /** Starts the next waiting file when nothing is uploading. */
  private pump(): void {
    const next = nextToStart(this.items());
    if (!next) return;
    const id = next.id;
    this.items.update((list) => markStarted(list, id));
    const subscription = new Subscription();
    const upload = this.uploads.upload(this.assessmentId(), next.file);
    this.active = { id, subscription, discard: upload.discard };
    const finished = () => {
      if (this.active?.id === id) this.active = null;
      this.pump();
    };
    subscription.add(
      upload.events.subscribe({
        next: (event) => {
          switch (event.type) {
            case 'progress':
              this.items.update((list) => markProgress(list, id, event.loaded, event.total));
              break;
            case 'reconnecting':
              this.items.update((list) => markReconnecting(list, id));
              break;
            case 'reconnected':
              this.items.update((list) => markReconnected(list, id));
              break;
            case 'resumed':
              this.items.update((list) => markResumed(list, id));
              break;
            case 'done':
              this.items.update((list) => markDone(list, id, event.clip));
              this.uploaded.emit(event.clip);
          }
        },
        error: (err: unknown) => {
          this.items.update((list) => markFailed(list, id, uploadErrorMessage(err)));
          finished();
        },
        complete: finished,
      }),
    );
  }
}
