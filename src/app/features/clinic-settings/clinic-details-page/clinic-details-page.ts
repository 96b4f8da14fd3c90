import { ChangeDetectionStrategy, Component } from '@angular/core';
import { LegalDetailsForm } from '../legal-details-form/legal-details-form';

/**
 * `/settings/clinic` (owner): the clinic's details, one card per concern — today the legal details
 * that invoices and receipts carry; the clinic's logo gets its own card beside it.
 */
@Component({
  selector: 'app-clinic-details-page',
  imports: [LegalDetailsForm],
  changeDetection: ChangeDetectionStrategy.OnPush,
  template: `
    <div class="page page-narrow">
      <header class="page-header">
        <div>
          <h1>Clinic details</h1>
          <p class="page-subtitle">What your invoices and receipts say about the clinic.</p>
        </div>
      </header>
      <div class="cards">
        <app-legal-details-form />
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
export class ClinicDetailsPage {}
