import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import type { InvoiceDetail } from '../../../../contracts/billing';
import { lineDetail, money, taxText } from '../../../shared/billing-words';

/** An invoice's lines with the server's per-line amounts and the totals beneath. */
@Component({
  selector: 'app-invoice-lines-table',
  changeDetection: ChangeDetectionStrategy.OnPush,
  template: `
    @let inv = invoice();
    <div class="table-scroll" role="region" aria-label="Invoice lines" tabindex="0">
      <table class="lines">
        <thead>
          <tr>
            <th>Item</th>
            <th class="num wide-only">Qty</th>
            <th class="num wide-only">Unit</th>
            <th class="num wide-only">Tax</th>
            <th class="num">Amount</th>
          </tr>
        </thead>
        <tbody>
          @for (l of inv.lines; track l.id) {
            <tr>
              <td class="item">
                <span dir="auto">{{ l.description }}</span>
                <div class="phone-only sub">{{ lineDetail(l, inv.currency) }}</div>
              </td>
              <td class="num wide-only">{{ l.quantity }}</td>
              <td class="num wide-only">{{ money(l.unitAmountMinor, inv.currency) }}</td>
              <td class="num wide-only">{{ taxText(l.taxRateBp) }}</td>
              <td class="num">{{ money(l.totalMinor, inv.currency) }}</td>
            </tr>
          }
        </tbody>
      </table>
    </div>
    <dl class="totals" aria-label="Totals">
      <div>
        <dt>Subtotal</dt>
        <dd>{{ money(inv.subtotalMinor, inv.currency) }}</dd>
      </div>
      <div>
        <dt>Tax</dt>
        <dd>{{ money(inv.taxMinor, inv.currency) }}</dd>
      </div>
      <div class="grand">
        <dt>Total</dt>
        <dd data-testid="invoice-total">{{ money(inv.totalMinor, inv.currency) }}</dd>
      </div>
    </dl>
  `,
  styles: `
    .lines {
      inline-size: 100%;
      border-collapse: collapse;
    }
    th,
    td {
      padding: 8px 12px;
      text-align: start;
      border-block-end: 1px solid var(--mat-sys-outline-variant);
    }
    tbody tr:last-child td {
      border-block-end: 0;
    }
    thead th {
      font: var(--mat-sys-title-small);
      color: var(--mat-sys-on-surface-variant);
    }
    /* Short words such as "Re-test" never break at their hyphen; long text still wraps between words. */
    .item {
      inline-size: 100%;
      hyphens: manual;
      overflow-wrap: break-word;
    }
    .num {
      text-align: end;
      white-space: nowrap;
      font-variant-numeric: tabular-nums;
    }
    .sub {
      margin-block-start: 2px;
      font: var(--mat-sys-body-small);
      color: var(--mat-sys-on-surface-variant);
      font-variant-numeric: tabular-nums;
    }
    .phone-only {
      display: none;
    }
    .totals {
      display: flex;
      flex-direction: column;
      align-items: flex-end;
      gap: 2px;
      margin: 12px 0 0;
      padding-inline: 12px;
    }
    .totals div {
      display: flex;
      gap: 16px;
    }
    .totals dt {
      color: var(--mat-sys-on-surface-variant);
    }
    .totals dd {
      margin: 0;
      min-inline-size: 7em;
      text-align: end;
      font-variant-numeric: tabular-nums;
    }
    .totals .grand {
      font: var(--mat-sys-title-medium);
    }
    .totals .grand dt {
      color: inherit;
    }
    /* On a phone: item and amount only; quantity, unit price and tax go under the item. */
    @media (max-width: 599.98px) {
      .wide-only {
        display: none;
      }
      .phone-only {
        display: block;
      }
      th,
      td {
        padding-inline: 10px;
      }
    }
  `,
})
export class InvoiceLinesTable {
  readonly invoice = input.required<InvoiceDetail>();
  protected readonly money = money;
  protected readonly taxText = taxText;
  protected readonly lineDetail = lineDetail;
}
