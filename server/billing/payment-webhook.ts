import { BadRequestError } from '../errors';
import type { BillingContext } from './billing-context';
import type { BillingMail } from './billing-mail';
import { invoicesRepository as invoices, type InvoiceRow } from './invoices-repository';
import type { PaymentConfirmed, PaymentEvent, RefundConfirmed, WebhookEvent } from './payments';

/** The provider's signed webhook: the only thing that marks a card payment paid (or refunded). */
export interface PaymentWebhook {
  /**
   * The signature is checked over the raw body, then each event id is handled once (recorded in
   * the same transaction as its effect). Answers whether it was a repeat.
   */
  webhook(rawBody: Buffer, signature: string | undefined): Promise<{ duplicate: boolean }>;
}

/** Whether a confirmed refund gives back the whole invoice, in its currency (partial refunds are not supported). */
export function refundsWholeInvoice(refund: RefundConfirmed, invoice: Pick<InvoiceRow, 'total_minor' | 'currency'>): boolean {
  return refund.done && refund.refundedMinor === invoice.total_minor && refund.currency === invoice.currency;
}

/** Whether the provider's confirmed payment is this invoice's whole total, in its currency. */
function paysInvoice(payment: PaymentConfirmed, row: InvoiceRow): boolean {
  return payment.paid && payment.amountMinor === row.total_minor && payment.currency === row.currency && !!payment.paymentId;
}

export function paymentWebhook(ctx: BillingContext, mail: BillingMail): PaymentWebhook {
  const { db, logger } = ctx;

  /** The invoice a confirmed event is about, or null. */
  async function invoiceOf(event: PaymentEvent): Promise<number | null> {
    switch (event.type) {
      case 'payment-confirmed':
      case 'payment-failed':
        return event.invoiceId;
      case 'refund-confirmed':
        return event.paymentId ? ((await invoices.findByPayment(db, event.paymentId))?.id ?? null) : null;
      default:
        return null;
    }
  }

  return {
    async webhook(rawBody, signature) {
      const p = ctx.needPayments();
      let received: WebhookEvent;
      try {
        received = p.readWebhook(rawBody, signature);
      } catch {
        throw new BadRequestError('The webhook signature is missing or does not match.', 'invalid_signature');
      }
      const seen = await db('payment_events').where({ id: received.id }).first('id');
      if (seen) return { duplicate: true };

      // Ask the provider about what the event names; its own copy is not trusted.
      const event = await ctx.provider(received.about === 'refund' ? 'confirm refund' : 'confirm payment', () => p.confirm(received));
      if (event.type === 'refund-unknown')
        logger.warn({ eventId: received.id, type: received.providerType }, 'refund event the payment service does not confirm; ignored');
      const invoiceId = await invoiceOf(event);

      const at = ctx.now();
      let newlyPaid: InvoiceRow | null = null;
      let refundVoided: string | null = null;
      const handled = await db.transaction(async (trx) => {
        if (!(await invoices.recordEvent(trx, received.id, received.providerType, invoiceId, at))) return false;
        const row = invoiceId ? await invoices.findById(trx, invoiceId) : undefined;
        if (!row) return true;
        if (event.type === 'payment-confirmed') {
          if (!paysInvoice(event, row)) {
            logger.warn({ invoiceId: row.id, session: event.checkoutId }, 'payment event does not match the invoice; not marked paid');
          } else if (
            await invoices.transition(trx, row.id, ['issued'], {
              status: 'paid',
              paid_at: at,
              paid_on: at.slice(0, 10),
              payment_method: 'card',
              payment_intent_id: event.paymentId,
              checkout_session_id: event.checkoutId,
              checkout_state: 'none',
              updated_at: at,
            })
          ) {
            newlyPaid = row;
          } else if (
            row.status === 'cancelled' ||
            ((row.status === 'paid' || row.status === 'refunded') && row.payment_intent_id !== event.paymentId)
          ) {
            // Paid on a payment page opened before the invoice was cancelled, or before it was paid
            // another way (a recorded transfer or cash, or by card on another payment page): give
            // this card payment back, so nobody pays twice.
            refundVoided = event.paymentId;
          } else {
            logger.warn({ invoiceId: row.id, status: row.status }, 'payment for an invoice that is not issued');
          }
        } else if (event.type === 'payment-failed') {
          if (row.status === 'issued' && row.checkout_session_id === event.checkoutId)
            await invoices.update(trx, row.id, { checkout_state: 'failed', updated_at: at });
        } else if (event.type === 'refund-confirmed') {
          if (refundsWholeInvoice(event, row)) {
            await invoices.transition(trx, row.id, ['paid'], {
              status: 'refunded',
              refunded_at: at,
              updated_at: at,
              ...(event.refundId ? { refund_id: event.refundId } : {}),
            });
          } else if (row.status === 'paid') {
            logger.warn({ invoiceId: row.id, eventId: received.id }, 'refund not confirmed for the whole invoice; left paid');
          }
        }
        return true;
      });
      if (!handled) return { duplicate: true };
      if (refundVoided) {
        const paymentId = refundVoided;
        await ctx
          .provider('refund an invoice that is no longer payable', () => p.refund(paymentId, `refund-void-${invoiceId}-${paymentId}`))
          .catch((err) =>
            logger.error(
              { err, invoiceId },
              'a cancelled or already paid invoice was paid by card and the refund failed; refund it by hand',
            ),
          );
      }
      const paid = newlyPaid as InvoiceRow | null;
      if (paid) await mail.cardPaymentReceived(paid);
      return { duplicate: false };
    },
  };
}
