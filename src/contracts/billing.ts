/**
 * Billing shapes shared by client and server: price list, invoices, checkout. Money is always an
 * integer number of minor units (cents) of the clinic's currency; totals are computed on the server
 * with {@link lineAmounts} / {@link invoiceTotals} (the client uses the same functions to preview).
 */
import type { AssessmentKind } from './assessment';

/**
 * Lifecycle in our own words: draft → issued → paid (card payment confirmed by the payment
 * service's webhook, or a bank transfer or cash recorded by the owner) → refunded; a draft or
 * issued invoice can be cancelled.
 */
export type InvoiceStatus = 'draft' | 'issued' | 'paid' | 'cancelled' | 'refunded';
export const INVOICE_STATUSES: readonly InvoiceStatus[] = ['draft', 'issued', 'paid', 'cancelled', 'refunded'];

/** How an invoice was paid: by card online, or recorded by the owner. */
export type PaymentMethod = 'card' | 'bank_transfer' | 'cash';
/** The ways of payment the owner records by hand (no payment service involved). */
export const MANUAL_PAYMENT_METHODS = ['bank_transfer', 'cash'] as const;
export type ManualPaymentMethod = (typeof MANUAL_PAYMENT_METHODS)[number];
/** Longest note on a recorded payment or refund. */
export const PAYMENT_NOTE_MAX = 300;

/** Body of POST /api/invoices/:id/payments: a bank transfer or cash the clinic received. */
export interface ManualPaymentWrite {
  method: ManualPaymentMethod;
  /** ISO date (yyyy-mm-dd) the money arrived; not in the future, not before the invoice was issued. */
  paidOn: string;
  /** E.g. the transfer's reference; may be empty. */
  note: string;
}

/** Body of POST /api/invoices/:id/refund (optional): a note, recorded with a refund of a manual payment. */
export interface RefundWrite {
  note?: string;
}

/**
 * The clinic's legal details that invoices and receipts carry (most countries require the
 * seller's legal name, address and tax number on an invoice). Empty strings when not set.
 */
export interface ClinicLegalDetails {
  legalName: string;
  /** Postal address, several lines. */
  address: string;
  /** VAT / tax registration number. */
  taxNumber: string;
  /** E-mail, phone or web address on one line. */
  contactLine: string;
}

/** Field lengths of {@link ClinicLegalDetails}. */
export const LEGAL_LIMITS = { legalName: 160, address: 400, addressLines: 6, taxNumber: 40, contactLine: 160 } as const;

/** Largest amount of one price or line, minor units (1,000,000.00). */
export const MAX_AMOUNT_MINOR = 100_000_000;
/** Largest quantity on one line. */
export const MAX_QUANTITY = 1000;
/** Tax rates are basis points: 2000 = 20 %. */
export const MAX_TAX_RATE_BP = 10_000;
/** Currencies a clinic may bill in (ISO 4217, two-decimal ones only). */
export const CURRENCIES = ['EUR', 'GBP', 'USD', 'CHF', 'SEK', 'NOK', 'DKK', 'CAD', 'AUD', 'NZD'] as const;
export type Currency = (typeof CURRENCIES)[number];

export interface BillingSettings {
  currency: Currency;
}

/** One entry of the clinic's price list. */
export interface Price {
  id: number;
  item: string;
  description: string;
  amountMinor: number;
  currency: string;
  /** Basis points, or null for no tax. */
  taxRateBp: number | null;
  /** Whether it was removed from the list (kept for invoices that use it). */
  archived: boolean;
}

export interface PriceWrite {
  item: string;
  description: string;
  amountMinor: number;
  taxRateBp: number | null;
}

export interface InvoiceLineWrite {
  /** The price it came from, or null for a custom line. */
  priceId: number | null;
  description: string;
  quantity: number;
  unitAmountMinor: number;
  taxRateBp: number | null;
}

export interface InvoiceLine extends InvoiceLineWrite {
  id: number;
  netMinor: number;
  taxMinor: number;
  totalMinor: number;
}

export interface InvoiceWrite {
  athleteId: number;
  /** The assessment it bills for, or null for a hand-made invoice. */
  assessmentId: number | null;
  /** ISO date (yyyy-mm-dd). */
  dueDate: string;
  note: string | null;
  lines: InvoiceLineWrite[];
}

/** What the athlete last did on the payment page (the invoice status is the truth). */
export type CheckoutState = 'none' | 'pending' | 'failed';

export interface InvoiceSummary {
  id: number;
  /** Assigned at issue, e.g. TF-2026-0001; null for drafts. */
  number: string | null;
  status: InvoiceStatus;
  athleteId: number;
  athleteName: string;
  currency: string;
  totalMinor: number;
  dueDate: string;
  issuedAt: string | null;
  paidAt: string | null;
  createdAt: string;
}

/** The visit an invoice bills for, as the invoice page names it. */
export interface InvoiceAssessment {
  id: number;
  kind: AssessmentKind;
  /** ISO date (yyyy-mm-dd). */
  date: string;
}

export interface InvoiceDetail extends InvoiceSummary {
  assessmentId: number | null;
  /** The assessment it bills for (kind and date), or null for a hand-made invoice. */
  assessment: InvoiceAssessment | null;
  note: string | null;
  clinicName: string;
  subtotalMinor: number;
  taxMinor: number;
  lines: InvoiceLine[];
  cancelledAt: string | null;
  refundedAt: string | null;
  checkoutState: CheckoutState;
  /** How it was paid (null until paid). */
  paymentMethod: PaymentMethod | null;
  /** ISO date the money arrived (null until paid). */
  paidOn: string | null;
  /** The owner's note on a recorded payment (null for card payments). */
  paymentNote: string | null;
  /** The owner's note on a recorded refund. */
  refundNote: string | null;
  /** What the invoice and receipt say about the clinic. */
  clinicLegal: ClinicLegalDetails;
  /** The clinic's logo (versioned URL), or null when it has none. */
  clinicLogoUrl: string | null;
}

export interface InvoiceQuery {
  status?: InvoiceStatus;
  athleteId?: number;
  /** ISO dates on the invoice's creation date, inclusive. */
  from?: string;
  to?: string;
}

export interface InvoiceList {
  invoices: InvoiceSummary[];
  /** Sums of the listed invoices, minor units: billed (not cancelled), outstanding (issued), paid, refunded. */
  totals: { currency: string; count: number; totalMinor: number; outstandingMinor: number; paidMinor: number; refundedMinor: number };
}

export interface CheckoutStart {
  /** The payment page to send the browser to. */
  url: string;
}

/** Net, tax and total of one line: tax rounded half-up per line (integer arithmetic). */
export function lineAmounts(line: Pick<InvoiceLineWrite, 'quantity' | 'unitAmountMinor' | 'taxRateBp'>): {
  netMinor: number;
  taxMinor: number;
  totalMinor: number;
} {
  const netMinor = line.quantity * line.unitAmountMinor;
  const bp = line.taxRateBp ?? 0;
  // Half-up on a non-negative amount: floor((net × bp + 5000) / 10000).
  const taxMinor = Math.floor((netMinor * bp + 5000) / 10_000);
  return { netMinor, taxMinor, totalMinor: netMinor + taxMinor };
}

/** Subtotal, tax and total of an invoice: sums of the per-line amounts. */
export function invoiceTotals(lines: Pick<InvoiceLineWrite, 'quantity' | 'unitAmountMinor' | 'taxRateBp'>[]): {
  subtotalMinor: number;
  taxMinor: number;
  totalMinor: number;
} {
  let subtotalMinor = 0;
  let taxMinor = 0;
  for (const l of lines) {
    const a = lineAmounts(l);
    subtotalMinor += a.netMinor;
    taxMinor += a.taxMinor;
  }
  return { subtotalMinor, taxMinor, totalMinor: subtotalMinor + taxMinor };
}

/** "162.00" for 16200 minor units (two-decimal currencies). */
export function formatMinor(minor: number): string {
  const sign = minor < 0 ? '-' : '';
  const abs = Math.abs(minor);
  const whole = Math.floor(abs / 100)
    .toString()
    .replace(/\B(?=(\d{3})+(?!\d))/g, ',');
  return `${sign}${whole}.${String(abs % 100).padStart(2, '0')}`;
}
