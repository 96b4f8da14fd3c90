import type { ManualPaymentWrite } from '../../src/contracts/billing';
import { AppError } from '../errors';
import type { InvoiceRow } from './invoices-repository';

/** An act that moves an invoice on, at most once per invoice. */
export type InvoiceAct = 'issue' | 'payment' | 'cancel' | 'refund';

/** The column that keeps the `Idempotency-Key` an act was made with. */
export const ACT_KEY_COLUMN = {
  issue: 'issue_key',
  payment: 'payment_key',
  cancel: 'cancel_key',
  refund: 'refund_key',
} as const satisfies Record<InvoiceAct, keyof InvoiceRow>;

/** The states an act leaves the invoice in (a card refund may still be pending at the provider: paid). */
const LEAVES: Record<InvoiceAct, readonly InvoiceRow['status'][]> = {
  issue: ['issued'],
  payment: ['paid'],
  cancel: ['cancelled'],
  refund: ['refunded', 'paid'],
};

/** How the answer names what an act did. */
const DID: Record<InvoiceAct, string> = {
  issue: 'issued',
  payment: 'marked paid',
  cancel: 'cancelled',
  refund: 'refunded',
};

/**
 * Whether `row` was already moved by this `act` sent with this `key`: the same act sent again after
 * its answer was lost (or twice at once), which answers the invoice as the act left it (the first
 * answer) instead of 409. Once the invoice has moved on since (issued by this key, then cancelled;
 * marked paid, then refunded) the same key answers 409 `invoice_changed_since` saying so, never
 * 200 with an invoice the act did not make (the page would say "Issued" of a cancelled invoice).
 * A recorded payment is the same only with the same method, day and note: the same key with other
 * details answers 422 `idempotency_key_reused` (never a second payment). Without a key, never.
 */
export function doneWithKey(row: InvoiceRow, act: InvoiceAct, key: string | undefined, payment?: ManualPaymentWrite): boolean {
  if (!key || row[ACT_KEY_COLUMN[act]] !== key) return false;
  if (payment && (row.payment_method !== payment.method || row.paid_on !== payment.paidOn || (row.payment_note ?? '') !== payment.note)) {
    throw new AppError(
      422,
      'idempotency_key_reused',
      'This payment was already recorded with other details. Reload the invoice to see what was recorded.',
    );
  }
  if (!LEAVES[act].includes(row.status)) {
    throw new AppError(
      409,
      'invoice_changed_since',
      `This invoice was ${DID[act]} by this request and has since been ${row.status}. Reload the invoice to see it as it is now.`,
    );
  }
  return true;
}
