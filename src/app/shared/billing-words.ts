import { formatMinor, type InvoiceStatus, type InvoiceSummary, type PaymentMethod } from '../../contracts/billing';

/** How each invoice status reads, with its icon (our own words: Draft → Issued → Paid, Cancelled, Refunded). */
export const STATUS_WORDS: Record<InvoiceStatus, { label: string; icon: string }> = {
  draft: { label: 'Draft', icon: 'edit_note' },
  issued: { label: 'Issued', icon: 'schedule' },
  paid: { label: 'Paid', icon: 'check_circle' },
  cancelled: { label: 'Cancelled', icon: 'block' },
  refunded: { label: 'Refunded', icon: 'undo' },
};

/** How a payment method reads: "Card payment", "Bank transfer", "Cash". */
export const PAYMENT_METHOD_WORDS: Record<PaymentMethod, string> = {
  card: 'Card payment',
  bank_transfer: 'Bank transfer',
  cash: 'Cash',
};

/** "162.00 EUR" from minor units. */
export function money(minor: number, currency: string): string {
  return `${formatMinor(minor)} ${currency}`;
}

/**
 * Minor units from what a person types as an amount: "45", "45.5", "45.00", "1,250.00" → 4500,
 * 4550, 4500, 125000; a decimal comma as written in much of Europe: "12,50", "12,5", "1.250,00" →
 * 1250, 1250, 125000 (a comma before one or two last digits is the decimal mark, never a
 * thousands separator). Null when it is not an amount with at most two decimals.
 */
export function parseAmount(text: string): number | null {
  const t = decimalPoint(text.trim());
  const m = /^(\d{1,9})(?:\.(\d{1,2}))?$/.exec(t);
  if (!m) return null;
  return Number(m[1]) * 100 + Number((m[2] ?? '').padEnd(2, '0'));
}

/**
 * Typed digits with the thousands separators taken out and a point as decimal mark: "1,250.00" →
 * "1250.00", "12,50" → "12.50", "1.250,00" → "1250.00". Anything else is returned as typed.
 */
function decimalPoint(t: string): string {
  if (/^\d{1,3}(,\d{3})+(\.\d+)?$/.test(t)) return t.replace(/,/g, '');
  if (/^\d{1,3}(\.\d{3})+,\d{1,2}$/.test(t)) return t.replace(/\./g, '').replace(',', '.');
  if (/^\d+,\d{1,2}$/.test(t)) return t.replace(',', '.');
  return t;
}

/** "45.00" for the amount field from minor units. */
export function amountText(minor: number): string {
  return formatMinor(minor).replace(/,/g, '');
}

/** Basis points from a percentage typed as "20", "7.5", "7.25" (or "7,5"); "" → null (no tax). */
export function parseTaxPercent(text: string): number | null | undefined {
  const t = text.trim().replace(/^(\d+),(\d{1,2})$/, '$1.$2');
  if (t === '') return null;
  const m = /^(\d{1,3})(?:\.(\d{1,2}))?$/.exec(t);
  if (!m) return undefined;
  const bp = Number(m[1]) * 100 + Number((m[2] ?? '').padEnd(2, '0'));
  return bp <= 10_000 ? bp : undefined;
}

/** "20 %" / "7.5 %" / "-" for a rate in basis points. */
export function taxText(bp: number | null): string {
  if (bp === null) return '-';
  return `${String(bp / 100)} %`;
}

/** One invoice line's quantity, unit price and tax in a few words: "2 × 65.00 EUR · 20 % tax", "1 × 12.34 EUR · no tax". */
export function lineDetail(line: { quantity: number; unitAmountMinor: number; taxRateBp: number | null }, currency: string): string {
  return `${line.quantity} × ${money(line.unitAmountMinor, currency)} · ${line.taxRateBp === null ? 'no tax' : `${taxText(line.taxRateBp)} tax`}`;
}

const MONTHS = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'];

/** "8 Dec 2026" from "2026-12-08" (the app's day-first date, without time zones). */
export function dayText(isoDate: string): string {
  const [y, m, d] = isoDate.split('-').map(Number);
  return `${d} ${MONTHS[m! - 1]} ${y}`;
}

/**
 * What an athlete has to pay, from their invoices: "Nothing to pay", "1 invoice to pay · 78.00 EUR
 * due 8 Dec 2026", or "2 invoices to pay · 222.00 EUR, the next due 8 Dec 2026". Only issued invoices
 * count (drafts never reach the athlete; paid, cancelled and refunded ones are settled).
 */
export function amountDueText(invoices: readonly Pick<InvoiceSummary, 'status' | 'totalMinor' | 'currency' | 'dueDate'>[]): string {
  const open = invoices.filter((i) => i.status === 'issued');
  if (open.length === 0) return 'Nothing to pay';
  const byCurrency = new Map<string, number>();
  for (const i of open) byCurrency.set(i.currency, (byCurrency.get(i.currency) ?? 0) + i.totalMinor);
  const amount = [...byCurrency].map(([currency, minor]) => money(minor, currency)).join(' + ');
  const next = open.map((i) => i.dueDate).sort()[0]!;
  return open.length === 1
    ? `1 invoice to pay · ${amount} due ${dayText(next)}`
    : `${open.length} invoices to pay · ${amount}, the next due ${dayText(next)}`;
}

/**
 * How an invoice was paid, in a sentence: "Paid by bank transfer on 3 Dec 2026.", "Paid by card
 * on 8 Oct 2026."; empty before it is paid.
 */
export function paidText(inv: { paymentMethod: PaymentMethod | null; paidOn: string | null; paidAt: string | null }): string {
  const day = inv.paidOn ?? inv.paidAt?.slice(0, 10) ?? null;
  if (!day) return '';
  const how = { card: 'by card', bank_transfer: 'by bank transfer', cash: 'in cash' }[inv.paymentMethod ?? 'card'];
  return `Paid ${how} on ${dayText(day)}.`;
}
