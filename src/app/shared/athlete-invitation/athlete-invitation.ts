import { ChangeDetectionStrategy, Component, computed, inject, input, output, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatSnackBar } from '@angular/material/snack-bar';
import { firstValueFrom } from 'rxjs';
import type { AthleteSummary, PendingInvitation } from '../../../contracts/api';
import { AthletesApi } from '../../core/data/athletes-api';
import { accountState } from '../../core/data/roster';

let nextHint = 0;

/**
 * The athlete's Trailframe account at a glance, with "Invite to Trailframe" / "Resend invitation".
 * Inviting needs an e-mail address; athletes with an account show as Active.
 */
@Component({
  selector: 'app-athlete-invitation',
  imports: [MatButtonModule, MatIconModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './athlete-invitation.html',
  styleUrl: './athlete-invitation.scss',
})
export class AthleteInvitation {
  private readonly api = inject(AthletesApi);
  private readonly snackBar = inject(MatSnackBar);

  readonly athlete = input.required<AthleteSummary>();
  /** Emits after the server accepted the invitation. */
  readonly invited = output<PendingInvitation>();

  protected readonly state = computed(() => accountState(this.athlete()));
  protected readonly hasEmail = computed(() => !!this.athlete().email);
  protected readonly sending = signal(false);
  /** Unique per instance: the profile header and an invite prompt can both be on a page. */
  protected readonly hintId = `invite-hint-${++nextHint}`;

  protected async invite(): Promise<void> {
    if (this.sending() || !this.hasEmail()) return;
    this.sending.set(true);
    try {
      const invitation = await firstValueFrom(this.api.invite(this.athlete().id));
      this.snackBar.open(`Invitation sent to ${invitation.email}`, 'OK', { duration: 4000 });
      this.invited.emit(invitation);
    } catch {
      // The error snackbar explains what went wrong (e.g. they already have an account).
    } finally {
      this.sending.set(false);
    }
  }
}
