import { DatePipe, NgTemplateOutlet } from '@angular/common';
import { ChangeDetectionStrategy, Component, ElementRef, afterNextRender, input, output, viewChild } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import type { PlanChange } from '../plan-changes';

const KIND_ICONS: Record<PlanChange['kind'], string> = {
  added: 'add_circle_outline',
  removed: 'remove_circle_outline',
  changed: 'edit',
  moved: 'swap_vert',
};

/**
 * Shown in the plan editor when a colleague saved the plan after it was opened (409
 * `stale_revision`): what their save changed and what the coach's unsaved edit changes, and the
 * two ways on — load their version (discarding the edit) or keep the edit on top of theirs. The
 * edit stays in the form until the coach chooses. Takes focus when it appears.
 */
@Component({
  selector: 'app-plan-conflict',
  imports: [DatePipe, NgTemplateOutlet, MatButtonModule, MatIconModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './plan-conflict.html',
  styleUrl: './plan-conflict.scss',
  host: { role: 'alert', class: 'plan-conflict' },
})
export class PlanConflict {
  /** What the colleague's save changed from the plan as it was opened. */
  readonly theirChanges = input.required<PlanChange[]>();
  /** What the coach's unsaved edit changes from the plan as it was opened. */
  readonly myChanges = input.required<PlanChange[]>();
  /** When their version was saved (ISO). */
  readonly savedAt = input.required<string>();
  /** Whether a choice is being carried out (the buttons wait). */
  readonly busy = input(false);
  /** Discard the edit and show their version. */
  readonly loadTheirs = output<void>();
  /** Apply the edit on top of their version and save again. */
  readonly keepMine = output<void>();

  protected iconOf(change: PlanChange): string {
    return KIND_ICONS[change.kind];
  }
  private readonly heading = viewChild.required<ElementRef<HTMLElement>>('heading');

  constructor() {
    afterNextRender(() => this.heading().nativeElement.focus());
  }
}
