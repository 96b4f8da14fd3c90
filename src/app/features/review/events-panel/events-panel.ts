import { ChangeDetectionStrategy, Component, computed, inject } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatTooltipModule } from '@angular/material/tooltip';
import type { GaitEventKind, GaitEventMark } from '../../../../contracts/annotations';
import { EVENT_ORIGIN_LABELS, GAIT_EVENT_KINDS, GAIT_EVENT_LABELS } from '../../../../contracts/annotations';
import { EVENT_SHORT, hasEvent } from '../annotation-ops';
import { formatMs } from '../playback';
import { EventProposals } from '../event-proposals';
import { ReviewStore } from '../review-store';

const EVENT_KEYS: Record<GaitEventKind, string> = { initial_contact: 'I', midstance: 'M', toe_off: 'O' };

/**
 * Mark gait events on the current frame, see them listed (click to jump) with where each came from
 * (placed, proposed, accepted) and their problems; ask for proposals and accept them.
 */
@Component({
  selector: 'app-events-panel',
  imports: [MatButtonModule, MatIconModule, MatTooltipModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './events-panel.html',
  styleUrl: './events-panel.scss',
})
export class EventsPanel {
  protected readonly store = inject(ReviewStore);
  protected readonly proposals = inject(EventProposals);

  protected readonly kinds = computed(() => {
    const events = this.store.events();
    const frame = this.store.frame();
    const side = this.store.side();
    return GAIT_EVENT_KINDS.map((kind) => ({
      kind,
      label: GAIT_EVENT_LABELS[kind],
      key: EVENT_KEYS[kind],
      on: hasEvent(events, frame, side, kind),
    }));
  });

  protected readonly rows = computed(() => {
    const times = this.store.times();
    const frame = this.store.frame();
    return this.store.events().map((e) => ({
      mark: e,
      id: `${e.frame}-${e.side}-${e.kind}`,
      label: GAIT_EVENT_LABELS[e.kind],
      short: EVENT_SHORT[e.kind],
      side: e.side === 'left' ? 'Left' : 'Right',
      time: formatMs(times[e.frame]),
      current: e.frame === frame,
      origin: e.origin ?? 'placed',
      originLabel: EVENT_ORIGIN_LABELS[e.origin ?? 'placed'],
    }));
  });

  protected readonly sideName = computed(() => (this.store.side() === 'left' ? 'left' : 'right'));

  protected jump(mark: GaitEventMark): void {
    this.store.step(mark.frame - this.store.frame());
  }

  protected accept(mark: GaitEventMark): void {
    this.proposals.accept(mark);
  }

  protected remove(mark: GaitEventMark): void {
    this.store.removeEvent(mark);
  }
}
