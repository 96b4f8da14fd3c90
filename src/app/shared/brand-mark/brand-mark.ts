import { ChangeDetectionStrategy, Component, input } from '@angular/core';

/**
 * Trailframe's mark: a winding stride path across a frame, with three marked points on it.
 * Drawn for this product; decorative (the product name always appears beside it).
 */
@Component({
  selector: 'app-brand-mark',
  changeDetection: ChangeDetectionStrategy.OnPush,
  host: { 'aria-hidden': 'true', '[style.--mark-size.px]': 'size()' },
  template: `
    <svg viewBox="0 0 32 32" focusable="false">
      <rect class="frame" x="1" y="1" width="30" height="30" rx="8" />
      <path class="path" d="M6 24c5 0 6-6 10-8s5-6 10-8" />
      <circle class="point" cx="6" cy="24" r="2.2" />
      <circle class="point" cx="16" cy="16" r="2.2" />
      <circle class="point" cx="26" cy="8" r="2.2" />
    </svg>
  `,
  styles: `
    :host {
      display: inline-block;
      inline-size: var(--mark-size, 28px);
      block-size: var(--mark-size, 28px);
      flex: none;
    }
    svg {
      display: block;
      inline-size: 100%;
      block-size: 100%;
    }
    .frame {
      fill: var(--mat-sys-primary);
    }
    .path {
      fill: none;
      stroke: var(--mat-sys-on-primary);
      stroke-width: 2.4;
      stroke-linecap: round;
      opacity: 0.7;
    }
    .point {
      fill: var(--mat-sys-on-primary);
    }
  `,
})
export class BrandMark {
  /** Edge length in CSS pixels. */
  readonly size = input(28);
}
