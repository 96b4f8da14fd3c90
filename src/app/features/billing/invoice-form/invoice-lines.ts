import { invoiceTotals, type InvoiceDetail, type InvoiceLine, type InvoiceLineWrite, type Price } from '../../../../contracts/billing';
import { amountText, parseAmount, parseTaxPercent } from '../../../shared/billing-words';

/** One line as the form holds it (amounts as typed). */
export interface LineDraft {
  priceId: number | null;
  description: string;
  quantity: number | null;
  amount: string;
  tax: string;
}

/** A line filled from a price of the list. */
export function lineFromPrice(p: Price): LineDraft {
  return {
    priceId: p.id,
    description: p.item,
    quantity: 1,
    amount: (p.amountMinor / 100).toFixed(2),
    tax: p.taxRateBp === null ? '' : String(p.taxRateBp / 100),
  };
}

/** The line to send, or null while something in it cannot be read yet. */
export function toLineWrite(d: LineDraft): InvoiceLineWrite | null {
  const unit = parseAmount(d.amount);
  const tax = parseTaxPercent(d.tax);
  if (unit === null || tax === undefined || !d.quantity || d.quantity < 1 || !Number.isInteger(d.quantity)) return null;
  return { priceId: d.priceId, description: d.description.trim(), quantity: d.quantity, unitAmountMinor: unit, taxRateBp: tax };
}

/** Preview of the totals (the server computes the real ones the same way); null while a line is unreadable. */
export function previewTotals(lines: LineDraft[]): ReturnType<typeof invoiceTotals> | null {
  const written = lines.map(toLineWrite);
  if (written.some((l) => l === null)) return null;
  return invoiceTotals(written as InvoiceLineWrite[]);
}

/** The price an assessment of this kind is usually billed with: Baseline → "Gait assessment", Re-test → "Re-test". */
export function priceForAssessment(kind: 'baseline' | 'retest', prices: Price[]): Price | null {
  const want = kind === 'retest' ? /re-?test/i : /gait assessment|assessment/i;
  return prices.find((p) => want.test(p.item)) ?? null;
}

/** A saved line as the form holds it: "65.00", tax "20" (or "" for none). */
export function lineFromInvoiceLine(
  l: Pick<InvoiceLine, 'priceId' | 'description' | 'quantity' | 'unitAmountMinor' | 'taxRateBp'>,
): LineDraft {
  return {
    priceId: l.priceId,
    description: l.description,
    quantity: l.quantity,
    amount: amountText(l.unitAmountMinor),
    tax: l.taxRateBp === null ? '' : String(l.taxRateBp / 100),
  };
}

/** Everything the form shows of a saved draft, to edit it. */
export function formFromInvoice(inv: InvoiceDetail): {
  athleteId: number;
  assessmentId: number | null;
  dueDate: string;
  note: string;
  lines: LineDraft[];
} {
  return {
    athleteId: inv.athleteId,
    assessmentId: inv.assessmentId,
    dueDate: inv.dueDate,
    note: inv.note ?? '',
    lines: inv.lines.map(lineFromInvoiceLine),
  };
}

/**
 * What `?athlete=:id&assessment=:id` preselect: positive whole ids only; an assessment only with
 * its athlete.
 */
export function presetFromQuery(
  athlete: string | null,
  assessment: string | null,
): { athleteId: number | null; assessmentId: number | null } {
  const id = (v: string | null) => (v !== null && /^[1-9]\d{0,15}$/.test(v) ? Number(v) : null);
  const athleteId = id(athlete);
  return { athleteId, assessmentId: athleteId === null ? null : id(assessment) };
}
