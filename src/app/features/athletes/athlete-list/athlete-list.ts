import { BreakpointObserver } from '@angular/cdk/layout';
import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { rxResource, toSignal } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatPaginatorModule, PageEvent } from '@angular/material/paginator';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSortModule, Sort } from '@angular/material/sort';
import { MatTableModule } from '@angular/material/table';
import { RouterLink } from '@angular/router';
import { map } from 'rxjs';
import { errorMessage } from '../../../core/api-error';
import { PAIN_CAUTION } from '../../../shared/caution';
import { CautionNote } from '../../../shared/caution-note/caution-note';
import { EmptyState } from '../../../shared/states/empty-state';
import { ErrorState } from '../../../shared/states/error-state';
import { PlanAlertChip } from '../plan-alert-chip/plan-alert-chip';
import { PlansApi } from '../../../core/data/plans-api';
import { AthletesApi } from '../../../core/data/athletes-api';
import { ACCOUNT_STATE_LABELS, RosterSort, accountState, fullName, rosterMatches, sortRoster } from '../../../core/data/roster';

const PHONE = '(max-width: 599.98px)';
const ALL_COLUMNS = ['name', 'goal', 'coach', 'account', 'consent', 'pain', 'updated'];
const PHONE_COLUMNS = ['name', 'pain'];

/** `/athletes`: the clinic's roster with filter, sort and pages. */
@Component({
  selector: 'app-athlete-list',
  imports: [
    DatePipe,
    RouterLink,
    MatTableModule,
    MatSortModule,
    MatPaginatorModule,
    MatFormFieldModule,
    MatInputModule,
    MatIconModule,
    MatButtonModule,
    MatProgressBarModule,
    EmptyState,
    ErrorState,
    PlanAlertChip,
    CautionNote,
  ],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './athlete-list.html',
  styleUrl: './athlete-list.scss',
})
export class AthleteList {
  private readonly api = inject(AthletesApi);

  protected readonly athletes = rxResource({ stream: () => this.api.list() });
  /** On a phone the roster keeps who and how much it hurts; the rest is on the profile. */
  protected readonly isPhone = toSignal(
    inject(BreakpointObserver)
      .observe(PHONE)
      .pipe(map((state) => state.matches)),
    { initialValue: false },
  );
  protected readonly columns = computed(() => (this.isPhone() ? PHONE_COLUMNS : ALL_COLUMNS));
  /** Pain alerts of running plans, by athlete (a failed load just shows no chips). */
  private readonly plansApi = inject(PlansApi);
  /** The running plans' pain alerts, shown on the rows; a failed check says so above the roster (no alert must go unseen). */
  protected readonly planAlerts = rxResource({ stream: () => this.plansApi.alerts() });
  protected readonly alertsByAthlete = computed(
    () => new Map((this.planAlerts.hasValue() ? this.planAlerts.value() : []).map((a) => [a.athleteId, a])),
  );
  protected readonly pageSizes = [10, 25, 50];
  /** Under the pain column and alert chips. */
  protected readonly painCaution = PAIN_CAUTION;

  protected readonly query = signal('');
  protected readonly sort = signal<RosterSort>({ active: 'name', direction: 'asc' });
  protected readonly pageIndex = signal(0);
  protected readonly pageSize = signal(10);

  protected readonly all = computed(() => (this.athletes.hasValue() ? this.athletes.value() : []));
  protected readonly matching = computed(() =>
    sortRoster(
      this.all().filter((a) => rosterMatches(a, this.query())),
      this.sort(),
    ),
  );
  protected readonly pageRows = computed(() => {
    const start = this.pageIndex() * this.pageSize();
    return this.matching().slice(start, start + this.pageSize());
  });

  protected readonly fullName = fullName;
  protected readonly accountState = accountState;
  protected readonly accountLabels = ACCOUNT_STATE_LABELS;
  protected readonly errorMessage = errorMessage;

  protected onFilter(value: string): void {
    this.query.set(value);
    this.pageIndex.set(0);
  }

  protected onSort(sort: Sort): void {
    this.sort.set({ active: sort.active, direction: sort.direction });
    this.pageIndex.set(0);
  }

  protected onPage(event: PageEvent): void {
    this.pageIndex.set(event.pageIndex);
    this.pageSize.set(event.pageSize);
  }
}
