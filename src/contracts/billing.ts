/**
 * Billing shapes shared by client and server: price list, invoices, checkout. Money is always an
 * integer number of minor units (cents) of the clinic's currency; totals are computed on the server
 * with {@link lineAmounts} / {@link invoiceTotals} (the client uses the same functions to preview).
 */
import type { AssessmentKind } from './assessment';

/** Lifecycle: draft → open (issued) → paid (webhook only) → refunded; draft/open → void. */
export type InvoiceStatus = 'draft' | 'open' | 'paid' | 'void' | 'refunded';
export const INVOICE_STATUSES: readonly InvoiceStatus[] = ['draft', 'open', 'paid', 'void', 'refunded'];

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
  voidedAt: string | null;
  refundedAt: string | null;
  checkoutState: CheckoutState;
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
  /** Sums of the listed invoices, minor units, by status group. */
  totals: { currency: string; count: number; totalMinor: number; openMinor: number; paidMinor: number; refundedMinor: number };
}

export interface CheckoutStart {
  /** The payment page to send the browser to. */
  url: string;
}

/** Net, tax and total of one line: tax rounded half-up per line (integer arithmetic). */
export function lineAmounts(line: Pick<InvoiceLineWrite, 'quantity' | 'unitAmountMinor' | 'taxRateBp'>): { netMinor: number; taxMinor: number; totalMinor: number } {
  const netMinor = line.quantity * line.unitAmountMinor;
  const bp = line.taxRateBp ?? 0;
  // Half-up on a non-negative amount: floor((net × bp + 5000) / 10000).
  const taxMinor = Math.floor((netMinor * bp + 5000) / 10_000);
  return { netMinor, taxMinor, totalMinor: netMinor + taxMinor };
}

/** Subtotal, tax and total of an invoice: sums of the per-line amounts. */
export function invoiceTotals(lines: Pick<InvoiceLineWrite, 'quantity' | 'unitAmountMinor' | 'taxRateBp'>[]): { subtotalMinor: number; taxMinor: number; totalMinor: number } {
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
  const whole = Math.floor(abs / 100).toString().replace(/\B(?=(\d{3})+(?!\d))/g, ',');
  return `${sign}${whole}.${String(abs % 100).padStart(2, '0')}`;
}
