import { ChangeDetectionStrategy, Component, computed, inject } from '@angular/core';
import { SIDES } from '../../../../contracts/assessment';
import { gaitCycleCurves } from '../../../../kinematics/gait-cycle';
import { GaitCycleChart } from '../../../shared/gait-cycle-chart/gait-cycle-chart';
import type { CycleChartSeries } from '../../../shared/gait-cycle-chart/gait-cycle-chart-data';
import { ReviewStore } from '../review-store';

const SIDE_WORD = { left: 'Left', right: 'Right' } as const;

/** The clip's gait-cycle curves (both sides) from the annotations as shown, for the Measures tab. */
@Component({
  selector: 'app-cycle-panel',
  imports: [GaitCycleChart],
  changeDetection: ChangeDetectionStrategy.OnPush,
  template: `<app-gait-cycle-chart [series]="series()" idPrefix="review-cycle" />`,
  styles: `
    :host {
      display: block;
      padding: 8px 12px 12px;
    }
  `,
})
export class CyclePanel {
  private readonly store = inject(ReviewStore);

  protected readonly series = computed<CycleChartSeries[]>(() => {
    const a = this.store.annotations();
    const size = this.store.frameSize();
    if (!size.width || !size.height) return [];
    const curves = gaitCycleCurves(a.landmarks, a.events, { frameSize: size, direction: this.store.direction() });
    return SIDES.flatMap((side) => {
      const c = curves[side];
      return c ? [{ id: side, label: SIDE_WORD[side], side, curves: c, markerLabel: `TO ${SIDE_WORD[side][0]}` }] : [];
    });
  });
}
