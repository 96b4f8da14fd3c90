import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, effect, inject, input, viewChild } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatCardModule } from '@angular/material/card';
import { MatDialog } from '@angular/material/dialog';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSnackBar } from '@angular/material/snack-bar';
import { MatTabsModule } from '@angular/material/tabs';
import { Title } from '@angular/platform-browser';
import { Router, RouterLink } from '@angular/router';
import { throwError } from 'rxjs';
import type { AthleteDetail } from '../../../../contracts/api';
import { errorMessage, errorStatus } from '../../../core/api-error';
import { AuthStore } from '../../../core/auth-store';
import { LeaveGuarded, LeaveWarning, UNSAVED_CHANGES_WARNING, warnBeforeUnload } from '../../../core/leave-guard';
import { ageOn } from '../../../shared/dates';
import { ErrorState } from '../../../shared/states/error-state';
import { AssessmentList } from '../../../shared/assessment-list/assessment-list';
import { AthletePlans } from '../athlete-plans/athlete-plans';
import { SharedPanel } from '../../../shared/sharing/shared-panel/shared-panel';
import { AthleteEditDialog } from '../athlete-edit-dialog/athlete-edit-dialog';
import { AthleteInvitation } from '../../../shared/athlete-invitation/athlete-invitation';
import { AthletesApi } from '../../../core/data/athletes-api';
import { IntakeForm } from '../intake-form/intake-form';
import { fullName } from '../../../core/data/roster';
import { AthleteData } from '../athlete-data/athlete-data';

const PROFILE_TABS = ['intake', 'assessments', 'plan', 'shared', 'data'] as const;
type ProfileTab = (typeof PROFILE_TABS)[number];

/** `/athletes/:id`: who the athlete is, their account, their intake and their assessments. */
@Component({
  selector: 'app-athlete-profile',
  imports: [
    DatePipe,
    RouterLink,
    MatButtonModule,
    MatCardModule,
    MatIconModule,
    MatProgressBarModule,
    MatTabsModule,
    ErrorState,
    AthleteInvitation,
    IntakeForm,
    AssessmentList,
    AthletePlans,
    SharedPanel,
    AthleteData,
  ],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './athlete-profile.html',
  styleUrl: './athlete-profile.scss',
  host: { '(window:beforeunload)': 'onBeforeUnload($event)' },
})
export class AthleteProfile implements LeaveGuarded {
  private readonly api = inject(AthletesApi);
  private readonly dialog = inject(MatDialog);
  private readonly snackBar = inject(MatSnackBar);
  /** Whether the clinic owner is looking (the only one who bills: "New invoice"). */
  protected readonly isOwner = inject(AuthStore).isOwner;

  /** Route parameter. */
  readonly id = input.required<string>();
  /** Query parameter `tab`: `intake` (default), `assessments`, `plan`, `shared` or `data` (owner). */
  readonly tab = input<string | undefined>();

  protected readonly athlete = rxResource({
    params: () => Number(this.id()),
    stream: ({ params }) =>
      Number.isInteger(params) && params > 0 ? this.api.get(params) : throwError(() => new Error('Not a valid athlete address.')),
  });
  protected readonly detail = computed(() => (this.athlete.hasValue() ? this.athlete.value() : null));
  protected readonly age = computed(() => ageOn(this.detail()?.dateOfBirth, new Date()));
  protected readonly name = computed(() => {
    const a = this.detail();
    return a ? fullName(a) : '';
  });
  protected readonly notFound = computed(() => errorStatus(this.athlete.error()) === 404);
  protected readonly errorMessage = errorMessage;
  protected readonly tabIndex = computed(() => Math.max(0, PROFILE_TABS.indexOf(this.tab() as ProfileTab)));
  private readonly router = inject(Router);
  private readonly intakeForm = viewChild(IntakeForm);

  constructor() {
    const title = inject(Title);
    effect(() => {
      const name = this.name();
      if (name) title.setTitle(`${name} · Trailframe`);
    });
  }

  leaveWarning(): LeaveWarning | null {
    return this.intakeForm()?.dirty() ? UNSAVED_CHANGES_WARNING : null;
  }

  protected onBeforeUnload(event: BeforeUnloadEvent): void {
    warnBeforeUnload(event, this.leaveWarning());
  }

  /** Keeps the open tab in the address, so coming back from an assessment returns to the list. */
  protected onTabChange(index: number): void {
    const tab = PROFILE_TABS[index] ?? 'intake';
    void this.router.navigate([], {
      queryParams: { tab: tab === 'intake' ? null : tab },
      queryParamsHandling: 'merge',
      replaceUrl: true,
    });
  }

  protected editDetails(): void {
    const current = this.detail();
    if (!current) return;
    this.dialog
      .open<AthleteEditDialog, AthleteDetail, AthleteDetail>(AthleteEditDialog, {
        data: current,
        width: '640px',
        maxWidth: '95vw',
        autoFocus: 'first-tabbable',
      })
      .afterClosed()
      .subscribe((updated) => {
        if (!updated) return;
        this.athlete.set(updated);
        this.snackBar.open('Details saved', 'OK', { duration: 3000 });
      });
  }

  protected onInvited(): void {
    this.athlete.update((a) => (a ? { ...a, invitationPending: true } : a));
  }

  protected onIntakeSaved(saved: AthleteDetail): void {
    this.athlete.set(saved);
  }
}
