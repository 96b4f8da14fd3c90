import { lineAmounts, type InvoiceWrite } from '../../src/contracts/billing';
import type { Db } from '../db/knex';
import { ConflictError, ValidationError } from '../errors';
import type { InvoiceLineRow, InvoiceRow } from './invoices-repository';
import { pricesRepository as prices } from './prices-repository';

/**
 * The athlete and assessment must be this clinic's (the assessment this athlete's), and every
 * price on a line must be on the list; `keptPriceIds` may be archived (lines that already had them).
 */
export async function checkReferences(trx: Db, clinicId: number, w: InvoiceWrite, keptPriceIds: Set<number>): Promise<void> {
  const athlete = await trx('athletes').where({ id: w.athleteId, clinic_id: clinicId }).whereNull('erased_at').first('id');
  if (!athlete)
    throw new ValidationError('athleteId: no such athlete in this clinic.', [
      { path: ['athleteId'], message: 'No such athlete in this clinic.' },
    ]);
  if (w.assessmentId !== null) {
    const a = await trx('assessments').where({ id: w.assessmentId, clinic_id: clinicId, athlete_id: w.athleteId }).first('id');
    if (!a)
      throw new ValidationError("assessmentId: not one of this athlete's assessments.", [
        { path: ['assessmentId'], message: "Not one of this athlete's assessments." },
      ]);
  }
  for (const [i, l] of w.lines.entries()) {
    if (l.priceId === null) continue;
    const p = await prices.find(trx, clinicId, l.priceId);
    if (!p || (p.archived_at && !keptPriceIds.has(l.priceId)))
      throw new ValidationError(`lines.${i}.priceId: no such price in the list.`, [
        { path: ['lines', i, 'priceId'], message: 'No such price in the list.' },
      ]);
  }
}

/** Line rows with their amounts computed (tax half-up per line), in the order given. */
export function lineRows(w: InvoiceWrite): Omit<InvoiceLineRow, 'id' | 'invoice_id'>[] {
  return w.lines.map((l, position) => {
    const a = lineAmounts(l);
    return {
      position,
      price_id: l.priceId,
      description: l.description,
      quantity: l.quantity,
      unit_amount_minor: l.unitAmountMinor,
      tax_rate_bp: l.taxRateBp,
      net_minor: a.netMinor,
      tax_minor: a.taxMinor,
      total_minor: a.totalMinor,
    };
  });
}

/** Only drafts change or go away; an issued invoice is cancelled instead. */
export function requireDraft(row: InvoiceRow, what: 'edited' | 'deleted'): void {
  if (row.status === 'draft') return;
  const which = row.number ? `invoice ${row.number} is ${row.status}` : `this invoice is ${row.status}`;
  const instead = row.status === 'issued' ? ' Cancel it and make a new one instead.' : '';
  throw new ConflictError(`Only a draft can be ${what}; ${which}.${instead}`, 'invoice_not_draft');
}

/** The draft was issued or cancelled between reading it and writing. */
export const notDraftAnymore = () => new ConflictError('The invoice was issued or cancelled meanwhile; reload it.', 'invoice_not_draft');

/** Something else changed the invoice's status between reading it and writing. */
export const changedMeanwhile = () => new ConflictError('The invoice changed meanwhile; reload it.', 'invalid_transition');
