import { createRequire } from 'node:module';
import type Stripe from 'stripe';
import type { CheckoutStarted, PaymentConfirmed, PaymentEvent, Payments, PaymentsConfig, RefundConfirmed, WebhookEvent } from './payments';

/** The provider's events that mean a payment page was paid or a delayed payment failed. */
const CHECKOUT_COMPLETED = 'checkout.session.completed';
const CHECKOUT_FAILED = 'checkout.session.async_payment_failed';
/** The provider's events that say money went back; none is trusted before the provider confirms it. */
const REFUND_EVENTS: ReadonlySet<string> = new Set(['charge.refunded', 'charge.refund.updated', 'refund.created', 'refund.updated']);

/** Thrown by a retrieve when the provider knows no such object (a forged or foreign id). */
class ObjectMissing extends Error {}

/**
 * Payments through the provider's official Node SDK (`stripe`), pointed by host/port/protocol.
 * Its event names and fields (`checkout.session.completed`, `payment_intent`, `charge.refunded`…)
 * are read here only; billing hears {@link PaymentEvent}s.
 */
export function stripePayments(config: PaymentsConfig): Payments {
  // The provider's SDK (several MB of code) loads at the first payment call, not in every web process
  // where card payment is merely configured.
  let client: Stripe | undefined;
  const stripe = (): Stripe => {
    if (client) return client;
    const StripeSdk = createRequire(import.meta.url)('stripe') as typeof Stripe;
    client = new StripeSdk(config.secretKey, {
      ...(config.apiHost ? { host: config.apiHost } : {}),
      ...(config.apiPort ? { port: config.apiPort } : {}),
      ...(config.apiProtocol ? { protocol: config.apiProtocol } : {}),
      maxNetworkRetries: 1,
      timeout: 20_000,
      telemetry: false,
    });
    return client;
  };

  /** A payment page as the provider reports it when asked. */
  const confirmedPayment = (s: Stripe.Checkout.Session): PaymentConfirmed => ({
    type: 'payment-confirmed',
    checkoutId: s.id,
    invoiceId: invoiceIdOf(s.metadata),
    paid: s.payment_status === 'paid',
    amountMinor: s.amount_total ?? null,
    currency: s.currency ? s.currency.toUpperCase() : null,
    paymentId: idOf(s.payment_intent),
  });

  /**
   * Asks the provider about the charge or refund a refund event names: `charge.refunded` by the
   * charge, the `refund.*` and `charge.refund.updated` events by the refund. Null when the provider
   * knows no such object (a forged event, or one from another account).
   */
  async function confirmRefund(event: WebhookEvent): Promise<RefundConfirmed | null> {
    const id = event.subjectId;
    if (!id || !/^[A-Za-z0-9_]{3,255}$/.test(id)) return null;
    try {
      if (event.providerType === 'charge.refunded') {
        const c = await retrieveOrMissing(() => stripe().charges.retrieve(id));
        return {
          type: 'refund-confirmed',
          paymentId: idOf(c.payment_intent),
          refundedMinor: c.amount_refunded,
          currency: c.currency ? c.currency.toUpperCase() : null,
          done: c.refunded,
          refundId: null,
        };
      }
      const r = await retrieveOrMissing(() => stripe().refunds.retrieve(id));
      return {
        type: 'refund-confirmed',
        paymentId: idOf(r.payment_intent),
        refundedMinor: r.amount,
        currency: r.currency ? r.currency.toUpperCase() : null,
        done: r.status === 'succeeded',
        refundId: r.id,
      };
    } catch (err) {
      if (err instanceof ObjectMissing) return null;
      throw err;
    }
  }

  return {
    async createCheckout(r): Promise<CheckoutStarted> {
      const session = await stripe().checkout.sessions.create(
        {
          mode: 'payment',
          line_items: [
            {
              quantity: 1,
              price_data: { currency: r.currency.toLowerCase(), unit_amount: r.amountMinor, product_data: { name: r.description } },
            },
          ],
          customer_email: r.customerEmail ?? undefined,
          client_reference_id: String(r.invoiceId),
          metadata: { invoice_id: String(r.invoiceId) },
          payment_intent_data: { metadata: { invoice_id: String(r.invoiceId) } },
          success_url: r.successUrl,
          cancel_url: r.cancelUrl,
        },
        // One attempt per click; a retry of the same HTTP call must not open a second page.
        { idempotencyKey: `checkout-${r.invoiceId}-${Date.now()}` },
      );
      return { id: session.id, url: session.url ?? null };
    },

    async refund(paymentId, idempotencyKey) {
      const refund = await stripe().refunds.create({ payment_intent: paymentId }, { idempotencyKey });
      return { id: refund.id, succeeded: refund.status === 'succeeded' };
    },

    readWebhook(rawBody, header): WebhookEvent {
      const event = stripe().webhooks.constructEvent(rawBody, header ?? '', config.webhookSecret);
      const object = event.data.object as unknown as Record<string, unknown>;
      const about: WebhookEvent['about'] =
        event.type === CHECKOUT_COMPLETED
          ? 'checkout-completed'
          : event.type === CHECKOUT_FAILED
            ? 'checkout-failed'
            : REFUND_EVENTS.has(event.type)
              ? 'refund'
              : 'other';
      return {
        id: event.id,
        providerType: event.type,
        about,
        subjectId: typeof object['id'] === 'string' ? object['id'] : null,
        invoiceId: invoiceIdOf(object['metadata'] as Record<string, string> | null | undefined),
      };
    },

    async confirm(event): Promise<PaymentEvent> {
      switch (event.about) {
        case 'checkout-completed':
          // Ask the provider again rather than trusting any copy of the session.
          return confirmedPayment(await stripe().checkout.sessions.retrieve(String(event.subjectId)));
        case 'checkout-failed':
          return { type: 'payment-failed', checkoutId: String(event.subjectId), invoiceId: event.invoiceId };
        case 'refund':
          // Ask the provider about the charge or refund; the event's own copy (payment, amount) is not used.
          return (await confirmRefund(event)) ?? { type: 'refund-unknown' };
        case 'other':
          return { type: 'other' };
      }
    },
  };
}

const idOf = (x: string | { id: string } | null | undefined): string | null => (typeof x === 'string' ? x : (x?.id ?? null));

const invoiceIdOf = (metadata: Record<string, string> | null | undefined): number | null => Number(metadata?.['invoice_id']) || null;

/** Runs a retrieve; the provider's "no such object" becomes {@link ObjectMissing}. */
async function retrieveOrMissing<T>(call: () => Promise<T>): Promise<T> {
  try {
    return await call();
  } catch (err) {
    const e = err as { code?: string; statusCode?: number };
    if (e.code === 'resource_missing' || e.statusCode === 404) throw new ObjectMissing((err as Error).message);
    throw err;
  }
}
