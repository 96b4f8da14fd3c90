import { ChangeDetectionStrategy, Component, input, output } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';
import type { AthleteSummary, PendingInvitation } from '../../../contracts/api';
import { AthleteInvitation } from '../athlete-invitation/athlete-invitation';

/**
 * Where an action only helps an athlete who can sign in (starting a plan, issuing an invoice,
 * publishing a still or summary): says plainly that they have no account yet and what they
 * cannot do, with "Invite to Trailframe" / "Resend invitation" right there. Nothing for athletes
 * who have an account.
 */
@Component({
  selector: 'app-invite-prompt',
  imports: [MatIconModule, AthleteInvitation],
  changeDetection: ChangeDetectionStrategy.OnPush,
  template: `
    @if (!athlete().hasAccount) {
      <div class="info-box invite-prompt" role="note">
        <mat-icon aria-hidden="true">person_add</mat-icon>
        <p class="text">
          <strong>{{ athlete().firstName }} has no Trailframe account yet</strong>, so they cannot {{ cannot() }}.
          @if (athlete().invitationPending) {
            An invitation is waiting for them to accept.
          } @else if (athlete().email) {
            Invite them to get access.
          } @else {
            Add their e-mail address (Edit details on the profile) to invite them.
          }
        </p>
        <app-athlete-invitation [athlete]="athlete()" (invited)="invited.emit($event)" />
      </div>
    }
  `,
  styles: `
    .invite-prompt {
      flex-wrap: wrap;
      align-items: center;
      gap: 8px 12px;
      margin-block-end: 16px;
    }
    .text {
      flex: 1 1 24ch;
      margin: 0;
    }
  `,
})
export class InvitePrompt {
  /** The athlete the action is for. */
  readonly athlete = input.required<AthleteSummary>();
  /** What they cannot do without an account, e.g. "log this plan's sessions". */
  readonly cannot = input.required<string>();
  /** Emits after the server sent the invitation (the parent reloads the athlete). */
  readonly invited = output<PendingInvitation>();
}
