import Stripe from 'stripe';

/** What we ask the payment provider to collect. */
export interface CheckoutRequest {
  invoiceId: number;
  /** Shown on the payment page, e.g. "Invoice TF-2026-0001". */
  description: string;
  amountMinor: number;
  /** ISO 4217, upper case (sent lower case to the provider). */
  currency: string;
  customerEmail: string | null;
  successUrl: string;
  cancelUrl: string;
}

/** A payment-page session as the provider reports it. */
export interface CheckoutSession {
  id: string;
  /** The hosted payment page (only while open). */
  url: string | null;
  /** Whether the provider says the money was collected. */
  paid: boolean;
  amountMinor: number | null;
  currency: string | null;
  paymentIntentId: string | null;
  invoiceId: number | null;
}

export interface RefundResult {
  id: string;
  /** Whether the provider completed the refund at once. */
  succeeded: boolean;
}

/** A charge as the provider reports it (to confirm a refund event). */
export interface ChargeState {
  id: string;
  paymentIntentId: string | null;
  /** Whether the provider says the whole charge was refunded. */
  refunded: boolean;
  amountRefundedMinor: number;
  /** ISO 4217, upper case. */
  currency: string | null;
}

/** A refund as the provider reports it (to confirm a refund event). */
export interface RefundState {
  id: string;
  paymentIntentId: string | null;
  /** Whether the money went back (`succeeded`); pending, failed or cancelled refunds are not. */
  succeeded: boolean;
  amountMinor: number;
  currency: string | null;
}

/** Thrown by `retrieve…` when the provider knows no such object (a forged or foreign id). */
export class PaymentObjectMissing extends Error {}

/** A webhook event after its signature was checked. */
export interface PaymentEvent {
  id: string;
  type: string;
  /** `data.object` of the event. */
  object: Record<string, unknown>;
}

/** The seam to the payment provider; the stripe SDK implementation is below, tests may swap it. */
export interface Payments {
  createCheckout(request: CheckoutRequest): Promise<CheckoutSession>;
  retrieveCheckout(sessionId: string): Promise<CheckoutSession>;
  refund(paymentIntentId: string, idempotencyKey: string): Promise<RefundResult>;
  /** The charge with this id; throws {@link PaymentObjectMissing} when the provider has none. */
  retrieveCharge(chargeId: string): Promise<ChargeState>;
  /** The refund with this id; throws {@link PaymentObjectMissing} when the provider has none. */
  retrieveRefund(refundId: string): Promise<RefundState>;
  /** Verifies the signature over the RAW body and parses the event; throws when it does not match. */
  verifyWebhook(rawBody: Buffer, signatureHeader: string | undefined): PaymentEvent;
}

/** How to reach the provider: real keys and endpoint, or the local fake (see README). */
export interface PaymentsConfig {
  secretKey: string;
  webhookSecret: string;
  /** null = the provider's default endpoint. */
  apiHost: string | null;
  apiPort: number | null;
  apiProtocol: 'http' | 'https' | null;
}

/** Payments through the provider's official Node SDK (`stripe`), pointed by host/port/protocol. */
export function stripePayments(config: PaymentsConfig): Payments {
  const stripe = new Stripe(config.secretKey, {
    ...(config.apiHost ? { host: config.apiHost } : {}),
    ...(config.apiPort ? { port: config.apiPort } : {}),
    ...(config.apiProtocol ? { protocol: config.apiProtocol } : {}),
    maxNetworkRetries: 1,
    timeout: 20_000,
    telemetry: false,
  });
  const toSession = (s: Stripe.Checkout.Session): CheckoutSession => ({
    id: s.id,
    url: s.url ?? null,
    paid: s.payment_status === 'paid',
    amountMinor: s.amount_total ?? null,
    currency: s.currency ? s.currency.toUpperCase() : null,
    paymentIntentId: typeof s.payment_intent === 'string' ? s.payment_intent : (s.payment_intent?.id ?? null),
    invoiceId: s.metadata?.['invoice_id'] ? Number(s.metadata['invoice_id']) : null,
  });
  return {
    async createCheckout(r) {
      const session = await stripe.checkout.sessions.create(
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
      return toSession(session);
    },
    async retrieveCheckout(id) {
      return toSession(await stripe.checkout.sessions.retrieve(id));
    },
    async refund(paymentIntentId, idempotencyKey) {
      const refund = await stripe.refunds.create({ payment_intent: paymentIntentId }, { idempotencyKey });
      return { id: refund.id, succeeded: refund.status === 'succeeded' };
    },
    async retrieveCharge(id) {
      const c = await retrieveOrMissing(() => stripe.charges.retrieve(id));
      return {
        id: c.id,
        paymentIntentId: idOf(c.payment_intent),
        refunded: c.refunded,
        amountRefundedMinor: c.amount_refunded,
        currency: c.currency ? c.currency.toUpperCase() : null,
      };
    },
    async retrieveRefund(id) {
      const r = await retrieveOrMissing(() => stripe.refunds.retrieve(id));
      return {
        id: r.id,
        paymentIntentId: idOf(r.payment_intent),
        succeeded: r.status === 'succeeded',
        amountMinor: r.amount,
        currency: r.currency ? r.currency.toUpperCase() : null,
      };
    },
    verifyWebhook(rawBody, header) {
      const event = stripe.webhooks.constructEvent(rawBody, header ?? '', config.webhookSecret);
      return { id: event.id, type: event.type, object: event.data.object as unknown as Record<string, unknown> };
    },
  };
}

const idOf = (x: string | { id: string } | null | undefined): string | null => (typeof x === 'string' ? x : (x?.id ?? null));

/** Runs a retrieve; the provider's "no such object" becomes {@link PaymentObjectMissing}. */
async function retrieveOrMissing<T>(call: () => Promise<T>): Promise<T> {
  try {
    return await call();
  } catch (err) {
    const e = err as { code?: string; statusCode?: number };
    if (e.code === 'resource_missing' || e.statusCode === 404) throw new PaymentObjectMissing((err as Error).message);
    throw err;
  }
}
