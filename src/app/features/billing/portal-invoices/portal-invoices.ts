import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { RouterLink } from '@angular/router';
import { errorMessage } from '../../../core/api-error';
import { EmptyState } from '../../../shared/states/empty-state';
import { ErrorState } from '../../../shared/states/error-state';
import { BillingApi } from '../../../core/data/billing-api';
import { money } from '../../../shared/billing-words';
import { InvoiceStatusBadge } from '../invoice-status/invoice-status';

/** `/portal/invoices` (athlete): their invoices, newest first; open ones can be paid by card. */
@Component({
  selector: 'app-portal-invoices',
  imports: [DatePipe, RouterLink, MatButtonModule, MatIconModule, MatProgressBarModule, EmptyState, ErrorState, InvoiceStatusBadge],
  changeDetection: ChangeDetectionStrategy.OnPush,
  template: `
    <div class="page">
      <header class="page-header">
        <div>
          <h1>My invoices</h1>
          <p class="page-subtitle">What your clinic has billed you, and your receipts.</p>
        </div>
      </header>
      @if (list.isLoading()) {
        <mat-progress-bar mode="indeterminate" aria-label="Loading invoices" />
      }
      @if (list.error(); as error) {
        <app-error-state title="Couldn't load your invoices" [message]="errorMessage(error)" (retry)="list.reload()" />
      } @else if (list.value(); as data) {
        @if (data.invoices.length === 0) {
          <app-empty-state icon="receipt_long" title="No invoices">Your clinic hasn't sent you an invoice.</app-empty-state>
        } @else {
          <ul class="invoices">
            @for (i of data.invoices; track i.id) {
              <li>
                <a class="row" [routerLink]="['/portal/invoices', i.id]">
                  <span class="what">
                    <strong>{{ i.number }}</strong>
                    <span class="muted small">Issued {{ i.issuedAt | date: 'd MMM y' }} · due {{ i.dueDate | date: 'd MMM y' }}</span>
                  </span>
                  <span class="amount">{{ money(i.totalMinor, i.currency) }}</span>
                  <app-invoice-status [status]="i.status" />
                  <mat-icon aria-hidden="true">chevron_right</mat-icon>
                </a>
              </li>
            }
          </ul>
        }
      }
    </div>
  `,
  styles: `
    .invoices {
      list-style: none;
      margin: 0;
      padding: 0;
      border: 1px solid var(--mat-sys-outline-variant);
      border-radius: 12px;
      background: var(--mat-sys-surface);
    }
    li + li {
      border-block-start: 1px solid var(--mat-sys-outline-variant);
    }
    .row {
      display: flex;
      align-items: center;
      gap: 12px;
      padding: 12px 16px;
      color: inherit;
      text-decoration: none;
      min-block-size: 48px;
    }
    .row:hover {
      background: var(--mat-sys-surface-container-low);
    }
    .what {
      display: flex;
      flex-direction: column;
      flex: 1;
      min-inline-size: 0;
    }
    .amount {
      font-variant-numeric: tabular-nums;
      white-space: nowrap;
    }
    @media (max-width: 599.98px) {
      .row {
        flex-wrap: wrap;
      }
      .what {
        flex-basis: 100%;
      }
      .amount {
        flex: 1;
      }
    }
  `,
})
export class PortalInvoices {
  private readonly api = inject(BillingApi);
  protected readonly list = rxResource({ stream: () => this.api.invoices() });
  protected readonly money = money;
  protected readonly errorMessage = errorMessage;
}
