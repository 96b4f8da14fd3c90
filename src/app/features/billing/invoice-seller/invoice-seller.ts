import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';
import { RouterLink } from '@angular/router';
import type { InvoiceDetail } from '../../../../contracts/billing';

/**
 * Who the invoice is from, as invoices must say in most countries: the clinic's legal name,
 * address, tax number and contact line (owner settings, Clinic details). The owner is told when
 * they are missing, with a link to fill them in.
 */
@Component({
  selector: 'app-invoice-seller',
  imports: [MatIconModule, RouterLink],
  changeDetection: ChangeDetectionStrategy.OnPush,
  template: `
    @let legal = invoice().clinicLegal;
    <section class="seller" aria-label="From">
      @if (invoice().clinicLogoUrl; as logo) {
        <img class="logo" [src]="logo" [alt]="invoice().clinicName + ' logo'" />
      }
      <p class="label">From</p>
      <p class="name">{{ legal.legalName || invoice().clinicName }}</p>
      @if (legal.legalName && legal.legalName !== invoice().clinicName) {
        <p class="line">Trading as {{ invoice().clinicName }}</p>
      }
      @for (line of addressLines(); track $index) {
        <p class="line">{{ line }}</p>
      }
      @if (legal.taxNumber) {
        <p class="line">Tax number: {{ legal.taxNumber }}</p>
      }
      @if (legal.contactLine) {
        <p class="line">{{ legal.contactLine }}</p>
      }
    </section>
    @if (forOwner() && missing()) {
      <p class="info-box missing" role="note">
        <mat-icon aria-hidden="true">info</mat-icon>
        <span
          >Invoices and receipts must carry the clinic's legal name, address and tax number in most countries.
          <a routerLink="/settings/clinic">Add them in Clinic details</a>.</span
        >
      </p>
    }
  `,
  styles: `
    :host {
      display: block;
      margin-block-end: 12px;
    }
    .seller p {
      margin: 0;
    }
    .logo {
      float: inline-end;
      max-block-size: 48px;
      max-inline-size: 160px;
      object-fit: contain;
    }
    .label {
      font: var(--mat-sys-label-medium);
      color: var(--mat-sys-on-surface-variant);
    }
    .name {
      font: var(--mat-sys-title-small);
    }
    .line {
      font: var(--mat-sys-body-medium);
      color: var(--mat-sys-on-surface-variant);
    }
    .missing {
      margin: 8px 0 0;
    }
  `,
})
export class InvoiceSeller {
  readonly invoice = input.required<Pick<InvoiceDetail, 'clinicName' | 'clinicLegal' | 'clinicLogoUrl'>>();
  /** Whether the owner looks (and is told what is missing). */
  readonly forOwner = input(false);
  protected readonly addressLines = computed(() => this.invoice().clinicLegal.address.split('\n').filter(Boolean));
  protected readonly missing = computed(() => {
    const l = this.invoice().clinicLegal;
    return !l.legalName || !l.address || !l.taxNumber;
  });
}
