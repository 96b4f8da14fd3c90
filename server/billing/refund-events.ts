import { PaymentObjectMissing, type PaymentEvent, type Payments } from './payments';

/** Provider events that say money went back; none is trusted before the provider confirms it. */
export const REFUND_EVENTS: ReadonlySet<string> = new Set(['charge.refunded', 'charge.refund.updated', 'refund.created', 'refund.updated']);

/** A refund as the provider reports it when asked, whatever the event's copy said. */
export interface ConfirmedRefund {
  paymentIntentId: string | null;
  refundedMinor: number;
  /** ISO 4217, upper case. */
  currency: string | null;
  /** Whether the provider says the money went back (charge refunded, or refund succeeded). */
  done: boolean;
  /** The refund's id when the event was about a refund (not a charge). */
  refundId: string | null;
}

/**
 * Asks the provider about the charge or refund a refund event names: `charge.refunded` by the
 * charge, the `refund.*` and `charge.refund.updated` events by the refund. Answers null when the
 * provider knows no such object (a forged event, or one from another account).
 */
export async function confirmRefundEvent(payments: Payments, event: PaymentEvent): Promise<ConfirmedRefund | null> {
  const id = event.object['id'];
  if (typeof id !== 'string' || !/^[A-Za-z0-9_]{3,255}$/.test(id)) return null;
  try {
    if (event.type === 'charge.refunded') {
      const c = await payments.retrieveCharge(id);
      return {
        paymentIntentId: c.paymentIntentId,
        refundedMinor: c.amountRefundedMinor,
        currency: c.currency,
        done: c.refunded,
        refundId: null,
      };
    }
    const r = await payments.retrieveRefund(id);
    return { paymentIntentId: r.paymentIntentId, refundedMinor: r.amountMinor, currency: r.currency, done: r.succeeded, refundId: r.id };
  } catch (err) {
    if (err instanceof PaymentObjectMissing) return null;
    throw err;
  }
}

/** Whether a confirmed refund gives back the whole invoice, in its currency (partial refunds are not supported). */
export function refundsWholeInvoice(refund: ConfirmedRefund, invoice: { total_minor: number; currency: string }): boolean {
  return refund.done && refund.refundedMinor === invoice.total_minor && refund.currency === invoice.currency;
}
