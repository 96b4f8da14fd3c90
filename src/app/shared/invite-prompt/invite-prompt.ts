import { ChangeDetectionStrategy, Component, computed, input, output } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';
import type { AthleteSummary, PendingInvitation } from '../../../contracts/api';
import { errorMessage } from '../../core/api-error';
import { AthleteInvitation } from '../athlete-invitation/athlete-invitation';
import { ErrorNote } from '../states/error-note';

/**
 * Where an action only helps an athlete who can sign in (starting a plan, issuing an invoice,
 * publishing a still or summary): says plainly that they have no account yet and what they
 * cannot do, with "Invite to Trailframe" / "Resend invitation" right there. Nothing for athletes
 * who have an account. When the athlete could not be loaded, says that their account could not be
 * checked, with Try again, instead of showing nothing.
 */
@Component({
  selector: 'app-invite-prompt',
  imports: [MatIconModule, AthleteInvitation, ErrorNote],
  changeDetection: ChangeDetectionStrategy.OnPush,
  template: `
    @if (failure(); as reason) {
      <app-error-note class="invite-check-failed" [text]="failedText()" [message]="reason" (retry)="retry.emit()" />
    } @else if (athlete(); as a) {
      @if (!a.hasAccount) {
        <div class="info-box invite-prompt" role="note">
          <mat-icon aria-hidden="true">person_add</mat-icon>
          <p class="text">
            <strong>{{ a.firstName }} has no Trailframe account yet</strong>, so they cannot {{ cannot() }}.
            @if (a.invitationPending) {
              An invitation is waiting for them to accept.
            } @else if (a.email) {
              Invite them to get access.
            } @else {
              Add their e-mail address (Edit details on the profile) to invite them.
            }
          </p>
          <app-athlete-invitation [athlete]="a" (invited)="invited.emit($event)" />
        </div>
      }
    }
  `,
  styles: `
    .invite-prompt {
      flex-wrap: wrap;
      align-items: center;
      gap: 8px 12px;
      margin-block-end: 16px;
    }
    .invite-check-failed {
      margin-block-end: 16px;
    }
    .text {
      flex: 1 1 24ch;
      margin: 0;
    }
  `,
})
export class InvitePrompt {
  /** The athlete the action is for (null while loading or when the load failed). */
  readonly athlete = input.required<AthleteSummary | null>();
  /** The error of the athlete's load, if it failed (shown with Try again). */
  readonly loadError = input<unknown>(undefined);
  /** What they cannot do without an account, e.g. "log this plan's sessions". */
  readonly cannot = input.required<string>();
  /** Emits after the server sent the invitation (the parent reloads the athlete). */
  readonly invited = output<PendingInvitation>();
  /** Emits when the user asks to load the athlete again. */
  readonly retry = output<void>();

  protected readonly failedText = computed(
    () => `Couldn't check whether the athlete has a Trailframe account (they need one to ${this.cannot()}).`,
  );
  protected readonly failure = computed(() => {
    const err = this.loadError();
    return err ? errorMessage(err) : null;
  });
}
