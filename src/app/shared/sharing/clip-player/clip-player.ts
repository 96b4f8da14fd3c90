import { ChangeDetectionStrategy, Component, ElementRef, computed, input, signal, viewChild } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import type { AnnotatedClip } from '../../../../contracts/annotated-clips';
import { clipTitle, frameOfText, frameStepTime } from '../clip-logic';

/** Safari on iPhone plays video full screen only through the element's own call. */
interface PhoneVideo extends HTMLVideoElement {
  webkitEnterFullscreen?: () => void;
}

/**
 * An annotated clip's inline player (phone first): play / pause, one frame back or on (a source
 * frame: the copies of the slow-motion rule together), full screen, and where it stands
 * ("Frame 12 of 60"). The video plays inline on phones, without sound (it has none).
 */
@Component({
  selector: 'app-clip-player',
  imports: [MatButtonModule, MatIconModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './clip-player.html',
  styleUrl: './clip-player.scss',
  host: { class: 'clip-player' },
})
export class ClipPlayer {
  readonly clip = input.required<AnnotatedClip>();

  private readonly video = viewChild.required<ElementRef<PhoneVideo>>('video');
  private readonly frame = viewChild.required<ElementRef<HTMLElement>>('frame');

  protected readonly playing = signal(false);
  protected readonly time = signal(0);
  protected readonly title = computed(() => clipTitle(this.clip()));
  protected readonly position = computed(() => {
    const c = this.clip();
    return c.fps && c.durationS ? frameOfText(this.time(), c.fps, c.repeat ?? 1, c.durationS) : '';
  });

  protected togglePlay(): void {
    const v = this.video().nativeElement;
    if (v.paused || v.ended) void v.play().catch(() => this.playing.set(false));
    else v.pause();
  }

  protected step(direction: 1 | -1): void {
    const c = this.clip();
    const v = this.video().nativeElement;
    if (!c.fps || !c.durationS) return;
    v.pause();
    v.currentTime = frameStepTime(v.currentTime, c.fps, c.repeat ?? 1, c.durationS, direction);
    this.time.set(v.currentTime);
  }

  protected fullScreen(): void {
    const box = this.frame().nativeElement;
    const v = this.video().nativeElement;
    if (document.fullscreenElement) void document.exitFullscreen();
    else if (box.requestFullscreen) void box.requestFullscreen().catch(() => v.webkitEnterFullscreen?.());
    else v.webkitEnterFullscreen?.();
  }

  protected onTime(): void {
    this.time.set(this.video().nativeElement.currentTime);
  }
}
