import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import type { InvoiceDetail } from '../../../../contracts/billing';
import { money, taxText } from '../billing-words';

/** An invoice's lines with the server's per-line amounts and the totals beneath. */
@Component({
  selector: 'app-invoice-lines-table',
  changeDetection: ChangeDetectionStrategy.OnPush,
  template: `
    @let inv = invoice();
    <div class="table-scroll" role="region" aria-label="Invoice lines" tabindex="0">
      <table class="lines">
        <thead>
          <tr><th>Item</th><th class="num">Qty</th><th class="num">Unit</th><th class="num">Tax</th><th class="num">Amount</th></tr>
        </thead>
        <tbody>
          @for (l of inv.lines; track l.id) {
            <tr>
              <td>{{ l.description }}</td>
              <td class="num">{{ l.quantity }}</td>
              <td class="num">{{ money(l.unitAmountMinor, inv.currency) }}</td>
              <td class="num">{{ taxText(l.taxRateBp) }}</td>
              <td class="num">{{ money(l.totalMinor, inv.currency) }}</td>
            </tr>
          }
        </tbody>
        <tfoot>
          <tr><th colspan="4" class="num">Subtotal</th><td class="num">{{ money(inv.subtotalMinor, inv.currency) }}</td></tr>
          <tr><th colspan="4" class="num">Tax</th><td class="num">{{ money(inv.taxMinor, inv.currency) }}</td></tr>
          <tr class="grand"><th colspan="4" class="num">Total</th><td class="num" data-testid="invoice-total">{{ money(inv.totalMinor, inv.currency) }}</td></tr>
        </tfoot>
      </table>
    </div>
  `,
  styles: `
    .lines { inline-size: 100%; border-collapse: collapse; }
    th, td { padding: 8px 12px; text-align: start; border-block-end: 1px solid var(--mat-sys-outline-variant); }
    thead th { font: var(--mat-sys-title-small); color: var(--mat-sys-on-surface-variant); }
    tfoot th { font-weight: 400; color: var(--mat-sys-on-surface-variant); }
    tfoot tr:last-child th, tfoot tr:last-child td { border-block-end: 0; }
    .num { text-align: end; white-space: nowrap; font-variant-numeric: tabular-nums; }
    .grand td, .grand th { font: var(--mat-sys-title-medium); color: inherit; }
  `,
})
export class InvoiceLinesTable {
  readonly invoice = input.required<InvoiceDetail>();
  protected readonly money = money;
  protected readonly taxText = taxText;
}
