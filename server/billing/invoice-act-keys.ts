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

/**
 * Whether `row` was already moved by this `act` sent with this `key`: the same act sent again after
 * its answer was lost (or twice at once), which answers the invoice as it is now instead of 409.
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
  return true;
}
