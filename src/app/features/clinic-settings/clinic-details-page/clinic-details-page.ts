import { ChangeDetectionStrategy, Component, viewChild } from '@angular/core';
import { LeaveGuarded, LeaveWarning, UNSAVED_CHANGES_WARNING, warnBeforeUnload } from '../../../core/leave-guard';
import { LegalDetailsForm } from '../legal-details-form/legal-details-form';
import { LogoCard } from '../logo-card/logo-card';
import { RetentionCard } from '../retention-card/retention-card';

/**
 * `/settings/clinic` (owner): the clinic's details, one card per concern — the legal details and the
 * logo that documents, e-mails and the portal carry, and how long clips are kept.
 */
@Component({
  selector: 'app-clinic-details-page',
  imports: [LegalDetailsForm, LogoCard, RetentionCard],
  changeDetection: ChangeDetectionStrategy.OnPush,
  host: { '(window:beforeunload)': 'onBeforeUnload($event)' },
  template: `
    <div class="page page-narrow">
      <header class="page-header">
        <div>
          <h1>Clinic details</h1>
          <p class="page-subtitle">What your documents, e-mails and pages say about the clinic.</p>
        </div>
      </header>
      <div class="cards">
        <app-logo-card />
        <app-legal-details-form />
        <app-retention-card />
      </div>
    </div>
  `,
  styles: `
    .cards {
      display: grid;
      gap: 16px;
    }
  `,
})
export class ClinicDetailsPage implements LeaveGuarded {
  private readonly legal = viewChild(LegalDetailsForm);
  private readonly retention = viewChild(RetentionCard);

  /** Legal details or retention months typed and not saved yet: asked before leaving. */
  leaveWarning(): LeaveWarning | null {
    return this.legal()?.hasUnsavedChanges() || this.retention()?.hasUnsavedChanges() ? UNSAVED_CHANGES_WARNING : null;
  }

  protected onBeforeUnload(event: BeforeUnloadEvent): void {
    warnBeforeUnload(event, this.leaveWarning());
  }
}
