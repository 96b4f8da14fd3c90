import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, input } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import type { AnnotatedClip } from '../../../../contracts/annotated-clips';
import { errorMessage } from '../../../core/api-error';
import { AnnotatedClipsApi } from '../../../core/data/annotated-clips-api';
import { ErrorState } from '../../states/error-state';
import { ClipPlayer } from '../clip-player/clip-player';
import { clipFactsText, clipTitle } from '../clip-logic';

/**
 * The athlete's published annotated clips on the portal home (phone first): each plays inline,
 * with play / pause, frame step and full screen. Shows nothing until the clinic published one.
 */
@Component({
  selector: 'app-portal-clips',
  imports: [DatePipe, MatIconModule, MatProgressBarModule, ErrorState, ClipPlayer],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './portal-clips.html',
  styleUrl: './portal-clips.scss',
})
export class PortalClips {
  private readonly api = inject(AnnotatedClipsApi);

  readonly athleteId = input.required<number>();

  protected readonly clips = rxResource({ params: () => this.athleteId(), stream: ({ params }) => this.api.clipsOf(params) });
  protected readonly list = computed<AnnotatedClip[]>(() => (this.clips.hasValue() ? this.clips.value() : []));
  protected readonly clipTitle = clipTitle;
  protected readonly clipFactsText = clipFactsText;
  protected readonly errorMessage = errorMessage;
}
