import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import { MatExpansionModule } from '@angular/material/expansion';
import { MatIconModule } from '@angular/material/icon';

interface GuideStep {
  icon: string;
  title: string;
  text: string;
}

/** How to film a clip that measures well, in our own words (source: Souza 2016). */
export const CAMERA_GUIDE_STEPS: readonly GuideStep[] = [
  {
    icon: 'videocam',
    title: 'Side-on, at hip height',
    text: 'Point the camera straight across the running direction, square to it, with the lens at about the height of the hip.',
  },
  {
    icon: 'fit_screen',
    title: 'Far enough back',
    text: 'Two full strides should fit in the picture from head to feet. Do not zoom or pan while filming.',
  },
  {
    icon: 'vertical_align_center',
    title: 'Keep it still',
    text: 'Use a tripod, or prop the phone on something steady. The same spot on the next visit makes clips comparable.',
  },
  {
    icon: 'slow_motion_video',
    title: 'Highest frame rate',
    text: 'Choose the highest frame rate the phone offers — 120 fps or more if it can, usually in slow-motion mode.',
  },
  {
    icon: 'light_mode',
    title: 'Light and clothing',
    text: 'Film in good, even light. Fitted shorts and top let the hip and knee show.',
  },
  {
    icon: 'adjust',
    title: 'Tape markers help',
    text: 'Small tape markers on the outside of the hip (the bony point, greater trochanter), the knee and the ankle make joints easy to find frame by frame.',
  },
  {
    icon: 'directions_run',
    title: 'Settle first on a treadmill',
    text: 'Let the runner run for 6–10 minutes before filming so the stride has settled.',
  },
  {
    icon: 'timer',
    title: '10–20 seconds',
    text: 'Film 10 to 20 seconds of steady running for each clip.',
  },
];

/** Collapsible camera-setup guidance shown above the clip upload. */
@Component({
  selector: 'app-camera-guide',
  imports: [MatExpansionModule, MatIconModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  template: `
    <mat-expansion-panel [expanded]="expanded()" class="guide">
      <mat-expansion-panel-header>
        <mat-panel-title>
          <mat-icon aria-hidden="true" class="title-icon">photo_camera</mat-icon>
          Setting up the camera
        </mat-panel-title>
        <mat-panel-description class="hide-narrow">Eight points for a clip that measures well</mat-panel-description>
      </mat-expansion-panel-header>
      <ol class="steps">
        @for (step of steps; track step.title) {
          <li>
            <mat-icon aria-hidden="true">{{ step.icon }}</mat-icon>
            <div>
              <strong>{{ step.title }}.</strong>
              {{ step.text }}
            </div>
          </li>
        }
      </ol>
      <p class="why">
        Why: a fixed, side-on camera at a high frame rate keeps joint angles and event timing comparable from one visit to the next (Souza
        2016).
      </p>
    </mat-expansion-panel>
  `,
  styles: `
    :host {
      display: block;
      margin-block-end: 16px;
    }
    .title-icon {
      margin-inline-end: 8px;
      color: var(--mat-sys-primary);
    }
    .steps {
      list-style: none;
      margin: 0;
      padding: 0;
      display: grid;
      grid-template-columns: repeat(auto-fill, minmax(260px, 1fr));
      gap: 12px 24px;
    }
    li {
      display: flex;
      gap: 12px;
      align-items: flex-start;
      font: var(--mat-sys-body-medium);
    }
    li mat-icon {
      flex: none;
      color: var(--mat-sys-on-surface-variant);
    }
    .why {
      margin: 16px 0 0;
      font: var(--mat-sys-body-small);
      color: var(--mat-sys-on-surface-variant);
    }
    @media (max-width: 599.98px) {
      .hide-narrow {
        display: none;
      }
    }
  `,
})
export class CameraGuide {
  /** Open at first (e.g. while the assessment has no clips); the user can toggle it. */
  readonly expanded = input(false);
  protected readonly steps = CAMERA_GUIDE_STEPS;
}
