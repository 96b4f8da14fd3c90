import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, LOCALE_ID, inject, signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { FormGroupDirective, NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCardModule } from '@angular/material/card';
import { MatDialog } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSnackBar } from '@angular/material/snack-bar';
import { MatTableModule } from '@angular/material/table';
import { firstValueFrom } from 'rxjs';
import type { PendingInvitation, StaffMember } from '../../../../contracts/api';
import { formatDate } from '@angular/common';
import { AuthStore } from '../../../core/auth-store';
import { DemoInboxNote } from '../../../shared/demo-inbox-note/demo-inbox-note';
import { DeactivateDialog, DeactivateDialogData } from '../deactivate-dialog/deactivate-dialog';
import { staffStatus } from '../team-logic';
import { LIMITS } from '../../../../contracts/intake';
import { errorMessage, errorStatus, fieldProblems } from '../../../core/api-error';
import { LeaveGuarded, LeaveWarning, UNSAVED_CHANGES_WARNING, warnBeforeUnload } from '../../../core/leave-guard';
import { ROLE_LABELS } from '../../../core/roles';
import { ConfirmDialog, ConfirmDialogData } from '../../../shared/confirm-dialog/confirm-dialog';
import { errorText } from '../../../shared/forms/error-text';
import { applyServerErrors } from '../../../shared/forms/server-errors';
import { requiredTrimmed } from '../../../shared/forms/validators';
import { ErrorState } from '../../../shared/states/error-state';
import { TeamApi } from '../team-api';

/**
 * `/team`: the clinic's staff (with each one's athletes and state; a coach who leaves is
 * deactivated, and can be reactivated), pending coach invitations, and an "Invite coach" form.
 */
@Component({
  selector: 'app-team-page',
  imports: [
    DatePipe,
    ReactiveFormsModule,
    MatCardModule,
    MatTableModule,
    MatFormFieldModule,
    MatInputModule,
    MatButtonModule,
    MatIconModule,
    MatProgressBarModule,
    ErrorState,
    DemoInboxNote,
  ],
  changeDetection: ChangeDetectionStrategy.OnPush,
  host: { '(window:beforeunload)': 'onBeforeUnload($event)' },
  templateUrl: './team-page.html',
  styleUrl: './team-page.scss',
})
export class TeamPage implements LeaveGuarded {
  private readonly api = inject(TeamApi);
  private readonly dialog = inject(MatDialog);
  private readonly snackBar = inject(MatSnackBar);
  private readonly auth = inject(AuthStore);
  private readonly locale = inject(LOCALE_ID);

  protected readonly team = rxResource({ stream: () => this.api.list() });
  protected readonly staffColumns = ['name', 'email', 'role', 'athletes', 'active', 'actions'];
  protected readonly inviteColumns = ['name', 'email', 'expires', 'revoke'];

  protected readonly form = inject(NonNullableFormBuilder).group({
    name: ['', [requiredTrimmed, Validators.maxLength(LIMITS.name)]],
    email: ['', [Validators.required, Validators.email, Validators.maxLength(LIMITS.email)]],
  });
  protected readonly inviting = signal(false);
  protected readonly inviteProblem = signal<string | null>(null);
  protected readonly revoking = signal<number | null>(null);
  /** The staff member being deactivated or reactivated. */
  protected readonly changing = signal<number | null>(null);
  protected readonly errorText = errorText;
  protected readonly errorMessage = errorMessage;

  protected roleLabel(member: StaffMember): string {
    return ROLE_LABELS[member.role] ?? member.role;
  }

  protected status(member: StaffMember): { label: string; since: string | null } {
    return staffStatus(member, (iso) => formatDate(iso, 'd MMM y', this.locale));
  }

  protected athletesLabel(member: StaffMember): string {
    return member.athleteCount === 1 ? '1 athlete' : `${member.athleteCount} athletes`;
  }

  protected deactivate(member: StaffMember, staff: StaffMember[]): void {
    this.dialog
      .open<DeactivateDialog, DeactivateDialogData, number>(DeactivateDialog, {
        data: { member, staff, selfId: this.auth.user()?.id ?? 0 },
        maxWidth: '480px',
      })
      .afterClosed()
      .subscribe((reassignTo) => {
        if (reassignTo !== undefined) void this.change(member, 'deactivate', reassignTo);
      });
  }

  protected reactivate(member: StaffMember): void {
    this.dialog
      .open<ConfirmDialog, ConfirmDialogData, boolean>(ConfirmDialog, {
        data: {
          title: `Reactivate ${member.name}?`,
          message:
            'They can sign in again with their password. Athletes who moved to another coach stay there; assign them back on each athlete if needed.',
          confirmLabel: 'Reactivate',
        },
      })
      .afterClosed()
      .subscribe((confirmed) => {
        if (confirmed) void this.change(member, 'reactivate');
      });
  }

  private async change(member: StaffMember, action: 'deactivate' | 'reactivate', reassignTo?: number): Promise<void> {
    this.changing.set(member.id);
    try {
      await firstValueFrom(action === 'deactivate' ? this.api.deactivate(member.id, { reassignTo }) : this.api.reactivate(member.id));
      // Athlete counts of others change too: read the list again.
      this.team.reload();
      this.snackBar.open(
        action === 'deactivate' ? `${member.name} is deactivated and signed out` : `${member.name} can sign in again`,
        'OK',
        { duration: 4000 },
      );
    } catch {
      // Reported by the error snackbar.
    } finally {
      this.changing.set(null);
    }
  }

  /** A coach's name or e-mail typed and not sent yet: asked before leaving. */
  leaveWarning(): LeaveWarning | null {
    return this.form.dirty ? UNSAVED_CHANGES_WARNING : null;
  }

  protected onBeforeUnload(event: BeforeUnloadEvent): void {
    warnBeforeUnload(event, this.leaveWarning());
  }

  protected async invite(formDirective: FormGroupDirective): Promise<void> {
    if (this.inviting()) return;
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    this.inviting.set(true);
    this.inviteProblem.set(null);
    const { name, email } = this.form.getRawValue();
    try {
      const invitation = await firstValueFrom(this.api.inviteCoach({ name: name.trim(), email: email.trim() }));
      this.team.update((t) => (t ? { ...t, invitations: [invitation, ...t.invitations] } : t));
      formDirective.resetForm();
      this.snackBar.open(`Invitation sent to ${invitation.email}`, 'OK', { duration: 4000 });
    } catch (err) {
      if (errorStatus(err) === 422) {
        const rest = applyServerErrors(this.form, fieldProblems(err));
        this.inviteProblem.set(rest.length ? rest.join(' ') : null);
      } else if (errorStatus(err) === 409) {
        applyServerErrors(this.form, [{ path: ['email'], message: errorMessage(err) }]);
      }
    } finally {
      this.inviting.set(false);
    }
  }

  protected revoke(invitation: PendingInvitation): void {
    this.dialog
      .open<ConfirmDialog, ConfirmDialogData, boolean>(ConfirmDialog, {
        data: {
          title: 'Revoke invitation?',
          message: `The link sent to ${invitation.email} will stop working. You can invite them again later.`,
          confirmLabel: 'Revoke',
        },
      })
      .afterClosed()
      .subscribe((confirmed) => {
        if (confirmed) void this.doRevoke(invitation);
      });
  }

  private async doRevoke(invitation: PendingInvitation): Promise<void> {
    this.revoking.set(invitation.id);
    try {
      await firstValueFrom(this.api.revoke(invitation.id));
      this.team.update((t) => (t ? { ...t, invitations: t.invitations.filter((i) => i.id !== invitation.id) } : t));
      this.snackBar.open('Invitation revoked', 'OK', { duration: 3000 });
    } catch {
      // Reported by the error snackbar.
    } finally {
      this.revoking.set(null);
    }
  }
}
