import { ChangeDetectionStrategy, Component, computed, inject, signal, viewChildren } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import type { MeasureKey, ReferenceBand } from '../../../../contracts/measures';
import { errorMessage } from '../../../core/api-error';
import { LeaveGuarded, LeaveWarning, UNSAVED_CHANGES_WARNING, warnBeforeUnload } from '../../../core/leave-guard';
import { ErrorState } from '../../../shared/states/error-state';
import { MEASURES_CAUTION } from '../../../shared/caution';
import { DEFAULT_REFERENCE_BANDS } from '../../../../kinematics';
import { BandEditor } from '../band-editor/band-editor';
import { MEASURE_KEYS, MEASURE_LABELS, blankBand, hasDefault, isDefaultBand, sortBands } from '../band-form-model';
import { ReferenceBandsApi } from '../../../core/data/reference-bands-api';

/**
 * `/settings/reference-bands` (owner): the bands the clinic's measures are read against, each with
 * its limits, unit, context, cited source and evidence; editable, and resettable to the default.
 */
@Component({
  selector: 'app-reference-bands-page',
  imports: [MatButtonModule, MatFormFieldModule, MatIconModule, MatProgressBarModule, MatSelectModule, ErrorState, BandEditor],
  changeDetection: ChangeDetectionStrategy.OnPush,
  host: { '(window:beforeunload)': 'onBeforeUnload($event)' },
  templateUrl: './reference-bands-page.html',
  styleUrl: './reference-bands-page.scss',
})
export class ReferenceBandsPage implements LeaveGuarded {
  private readonly api = inject(ReferenceBandsApi);

  protected readonly bands = rxResource({ stream: () => this.api.list() });
  /** A band being added for a measure without one. */
  protected readonly adding = signal<MeasureKey | null>(null);
  protected readonly defaults = DEFAULT_REFERENCE_BANDS;
  protected readonly labels = MEASURE_LABELS;
  protected readonly errorMessage = errorMessage;
  protected readonly caution = MEASURES_CAUTION;

  protected readonly sorted = computed(() => (this.bands.hasValue() ? sortBands(this.bands.value()) : []));
  /** Measures without a band, for "Add a band". */
  protected readonly withoutBand = computed(() => {
    const have = new Set(this.sorted().map((b) => b.key));
    return MEASURE_KEYS.filter((k) => !have.has(k));
  });
  protected readonly newBand = computed(() => {
    const key = this.adding();
    return key ? blankBand(key) : null;
  });

  private readonly editors = viewChildren(BandEditor);

  /** A band changed (or a new one started) and not saved yet: asked before leaving. */
  leaveWarning(): LeaveWarning | null {
    return this.editors().some((e) => e.hasUnsavedChanges()) ? UNSAVED_CHANGES_WARNING : null;
  }

  protected onBeforeUnload(event: BeforeUnloadEvent): void {
    warnBeforeUnload(event, this.leaveWarning());
  }

  protected isDefault(band: ReferenceBand): boolean {
    return isDefaultBand(band, this.defaults);
  }

  protected hasDefault(key: MeasureKey): boolean {
    return hasDefault(key, this.defaults);
  }

  protected onChanged(change: { key: MeasureKey; band: ReferenceBand | null }): void {
    if (change.band) {
      const saved = change.band;
      this.bands.update((list) => [...(list ?? []).filter((b) => b.key !== saved.key), saved]);
      if (this.adding() === saved.key) this.adding.set(null);
      return;
    }
    // Reset: the default applies again (or no band at all).
    const fallback = this.defaults.find((d) => d.key === change.key) ?? null;
    this.bands.update((list) => [...(list ?? []).filter((b) => b.key !== change.key), ...(fallback ? [fallback] : [])]);
  }
}
