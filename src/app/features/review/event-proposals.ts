import { Injectable, computed, inject, signal } from '@angular/core';
import { firstValueFrom } from 'rxjs';
import type { EventProposalsResult, GaitEventMark } from '../../../contracts/annotations';
import { GAIT_EVENT_LABELS } from '../../../contracts/annotations';
import { errorMessage } from '../../core/api-error';
import { ReviewApi } from '../../core/data/review-api';
import { diffStates, stateOf } from './annotation-changes';
import { acceptProposalChanges } from './annotation-ops';
import { AnnotationSync } from './annotation-sync';
import { ReviewStore } from './review-store';

/** What a proposal request did, in words: "8 events proposed; 1 left out beside events already marked." */
export function proposalSummary(r: Pick<EventProposalsResult, 'proposed' | 'byRule' | 'skipped'>): string {
  const n = r.proposed;
  const parts = [n === 0 ? 'No new events proposed' : `${n} event${n === 1 ? '' : 's'} proposed`];
  const coordinate = r.byRule.coordinate ?? 0;
  if (coordinate)
    parts.push(
      `${coordinate} toe-off${coordinate === 1 ? '' : 's'} from the toe's rearmost point only (no knee or ankle marked there): check closely`,
    );
  if (r.skipped.length) parts.push(`${r.skipped.length} left out beside events already marked`);
  return `${parts.join('; ')}.`;
}

/**
 * Proposed gait events in the review: asks the server for proposals from the landmarks (saved as
 * proposals, so the page adopts the server's copy and records one undo step), and accepts them all
 * or one by one (ordinary edits, autosaved and undoable). Provided by the review page.
 */
@Injectable()
export class EventProposals {
  private readonly api = inject(ReviewApi);
  private readonly sync = inject(AnnotationSync);
  private readonly store = inject(ReviewStore);

  private readonly busy$ = signal(false);
  private readonly message$ = signal<string | null>(null);
  private readonly problem$ = signal<string | null>(null);

  /** Whether a proposal request is under way. */
  readonly busy = this.busy$.asReadonly();
  /** What the last request proposed, in words. */
  readonly message = this.message$.asReadonly();
  /** Why the last request was refused (too few landmarked frames…), or null. */
  readonly problem = this.problem$.asReadonly();
  /** Proposed events not yet accepted. */
  readonly waiting = computed(() => this.store.events().filter((e) => e.origin === 'proposed'));
  /** Whether proposals can be asked for now: a clip is open and every edit is saved. */
  readonly canPropose = computed(() => !!this.store.clip() && !this.busy$() && !this.sync.hasUnsaved());

  /** Asks the server for proposals and shows its copy; nothing placed or accepted changes. */
  async propose(): Promise<void> {
    const clip = this.store.clip();
    const base = this.sync.base();
    if (!clip || !base || !this.canPropose()) return;
    this.busy$.set(true);
    this.problem$.set(null);
    this.message$.set(null);
    try {
      const result = await firstValueFrom(this.api.proposeEvents(clip.clip.id, base.revision));
      const changes = diffStates(this.store.annotations(), stateOf(result.annotations));
      this.sync.adopt(result.annotations);
      this.store.edit('propose gait events', changes);
      this.message$.set(proposalSummary(result));
    } catch (err) {
      this.problem$.set(errorMessage(err));
    } finally {
      this.busy$.set(false);
    }
  }

  /** Accepts every proposed event (one undo step). */
  acceptAll(): void {
    const changes = acceptProposalChanges(this.store.annotations());
    this.store.edit(`accept ${changes.length} proposed event${changes.length === 1 ? '' : 's'}`, changes);
  }

  /** Accepts one proposed event. */
  accept(mark: GaitEventMark): void {
    this.store.edit(
      `accept ${GAIT_EVENT_LABELS[mark.kind]} at frame ${mark.frame}`,
      acceptProposalChanges(this.store.annotations(), [mark]),
    );
  }
}
