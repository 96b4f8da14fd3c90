import { formatMinor, type InvoiceStatus } from '../../../contracts/billing';

/** How each invoice status reads, with its icon. */
export const STATUS_WORDS: Record<InvoiceStatus, { label: string; icon: string }> = {
  draft: { label: 'Draft', icon: 'edit_note' },
  open: { label: 'Open', icon: 'schedule' },
  paid: { label: 'Paid', icon: 'check_circle' },
  void: { label: 'Void', icon: 'block' },
  refunded: { label: 'Refunded', icon: 'undo' },
};

/** "162.00 EUR" from minor units. */
export function money(minor: number, currency: string): string {
  return `${formatMinor(minor)} ${currency}`;
}

/**
 * Minor units from what a person types as an amount: "45", "45.5", "45.00", "1,250.00" → 4500,
 * 4550, 4500, 125000. Null when it is not an amount with at most two decimals.
 */
export function parseAmount(text: string): number | null {
  const t = text.trim().replace(/,/g, '');
  const m = /^(\d{1,9})(?:\.(\d{1,2}))?$/.exec(t);
  if (!m) return null;
  return Number(m[1]) * 100 + Number((m[2] ?? '').padEnd(2, '0'));
}

/** "45.00" for the amount field from minor units. */
export function amountText(minor: number): string {
  return formatMinor(minor).replace(/,/g, '');
}

/** Basis points from a percentage typed as "20", "7.5", "7.25"; "" → null (no tax). */
export function parseTaxPercent(text: string): number | null | undefined {
  const t = text.trim();
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
