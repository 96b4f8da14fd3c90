/**
 * The Payments seam: what billing asks of a card-payment provider and what it hears back, in our
 * own words. The provider's event names and fields stay in the implementation
 * (`stripe-payments.ts`, over the provider's SDK); tests and demo mode point it at the local fake
 * payment service.
 */

/** What we ask the payment provider to collect. */
export interface CheckoutRequest {
  invoiceId: number;
  /** Shown on the payment page, e.g. "Invoice TF-2026-0001". */
  description: string;
  amountMinor: number;
  /** ISO 4217, upper case. */
  currency: string;
  customerEmail: string | null;
  successUrl: string;
  cancelUrl: string;
}

/** A payment page we opened. */
export interface CheckoutStarted {
  id: string;
  /** The hosted payment page. */
  url: string | null;
}

export interface RefundResult {
  id: string;
  /** Whether the provider completed the refund at once. */
  succeeded: boolean;
}

/**
 * A webhook whose signature matched, before the provider is asked about it: the event id (each is
 * handled once), what it is about, and the provider's own name for it (stored as received).
 */
export interface WebhookEvent {
  id: string;
  /** The provider's name of the event, kept only to record what arrived. */
  providerType: string;
  about: 'checkout-completed' | 'checkout-failed' | 'refund' | 'other';
  /** The provider's id of what the event is about (payment page, payment or refund), as the event says. */
  subjectId: string | null;
  /** The invoice the event names in its own copy (trusted only where nothing is paid or refunded by it). */
  invoiceId: number | null;
}

/** A payment page was paid: confirmed by asking the provider, never from the event's own copy. */
export interface PaymentConfirmed {
  type: 'payment-confirmed';
  checkoutId: string;
  invoiceId: number | null;
  /** Whether the provider says the money was collected. */
  paid: boolean;
  amountMinor: number | null;
  /** ISO 4217, upper case. */
  currency: string | null;
  /** The provider's id of the payment (what a refund names). */
  paymentId: string | null;
}

/** A delayed payment on a payment page failed. */
export interface PaymentFailed {
  type: 'payment-failed';
  checkoutId: string;
  invoiceId: number | null;
}

/** Money went back (or a refund changed): confirmed by asking the provider about the refund or payment. */
export interface RefundConfirmed {
  type: 'refund-confirmed';
  /** The payment refunded. */
  paymentId: string | null;
  refundedMinor: number;
  /** ISO 4217, upper case. */
  currency: string | null;
  /** Whether the provider says the money went back (pending, failed or cancelled refunds are not). */
  done: boolean;
  /** The refund's id when the event was about one refund. */
  refundId: string | null;
}

/** A refund event about something the provider does not know (forged, or another account's). */
export interface RefundUnknown {
  type: 'refund-unknown';
}

/** An event billing does not act on (recorded once, nothing changes). */
export interface OtherPaymentEvent {
  type: 'other';
}

/** What a webhook event means once confirmed with the provider. */
export type PaymentEvent = PaymentConfirmed | PaymentFailed | RefundConfirmed | RefundUnknown | OtherPaymentEvent;

/** The seam to the payment provider; `stripePayments` is the implementation, tests may swap it. */
export interface Payments {
  /** Opens a payment page for an invoice. */
  createCheckout(request: CheckoutRequest): Promise<CheckoutStarted>;
  /** Gives a payment back in full; the same key twice refunds once. */
  refund(paymentId: string, idempotencyKey: string): Promise<RefundResult>;
  /** Verifies the signature over the RAW body and reads the event; throws when it does not match. */
  readWebhook(rawBody: Buffer, signatureHeader: string | undefined): WebhookEvent;
  /** Asks the provider what a verified event is about (payment page, payment, refund) and answers it in our words. */
  confirm(event: WebhookEvent): Promise<PaymentEvent>;
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

export { stripePayments } from './stripe-payments';
