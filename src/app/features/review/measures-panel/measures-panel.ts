import { ChangeDetectionStrategy, Component, computed, inject } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';
import type { Measure } from '../../../../contracts/measures';
import { MEASURES_CAUTION } from '../../../shared/caution';
import { BandLine, bandLine } from '../measure-band';
import {
  FOOT_STRIKE_LABELS,
  FOOT_STRIKE_SOURCE,
  footStrikeClass,
  formatMeasure,
  formatValue,
  groupMeasures,
  measureContext,
  stepsText,
} from '../measure-view';
import { MarkerFollowing } from '../marker-following';
import { ReviewStore } from '../review-store';

interface MeasureRow {
  id: string;
  measure: Measure;
  value: string;
  context: string;
  steps: { text: string; few: boolean };
  values: string;
  band: BandLine | null;
}

/**
 * The measures, computed live in the browser from the marks as shown: mean ± SD with unit, side,
 * event and step count; beside each, where it sits against its reference band (in words and icon),
 * the band with its unit and the band's source; the derivation and each step's value on expand.
 */
@Component({
  selector: 'app-measures-panel',
  imports: [MatIconModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './measures-panel.html',
  styleUrl: './measures-panel.scss',
})
export class MeasuresPanel {
  protected readonly store = inject(ReviewStore);
  protected readonly following = inject(MarkerFollowing);
  protected readonly footStrikeSource = FOOT_STRIKE_SOURCE;
  protected readonly caution = MEASURES_CAUTION;

  protected readonly result = computed(() => this.store.measures());
  protected readonly groups = computed(() => {
    const value = this.result().value;
    if (!value) return [];
    return groupMeasures(value.measures).map((g) => ({
      def: g.def,
      rows: g.measures.map((m) => this.row(m)),
      footStrike:
        g.def.id === 'shank-foot'
          ? g.measures
              .filter((m) => m.key === 'foot_angle_initial_contact' && m.status === 'ok')
              .map((m) => ({ side: measureContext({ side: m.side, event: null }), cls: footStrikeClass(m.mean) }))
              .filter((f) => f.cls !== null)
              .map((f) => ({ side: f.side, label: FOOT_STRIKE_LABELS[f.cls!] }))
          : [],
    }));
  });

  private row(m: Measure): MeasureRow {
    return {
      id: `${m.key}-${m.side ?? 'both'}`,
      measure: m,
      value: formatMeasure(m),
      context: measureContext(m),
      steps: stepsText(m),
      values: m.values.map((v) => formatValue(v, m.unit)).join(', '),
      band: bandLine(m, this.store.bands()),
    };
  }
}
