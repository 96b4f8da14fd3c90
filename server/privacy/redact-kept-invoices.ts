import type { Knex } from 'knex';
import { identifyingPattern, type IdentifyingTerms } from './redact-terms';

/** The free-text fields staff type on an invoice (the rest are numbers, dates, states and provider ids). */
const INVOICE_TEXT = ['note', 'payment_note', 'refund_note'] as const;

/**
 * In the invoices an erasure keeps (as the law requires), rewrites the athlete's name, e-mail and
 * phone wherever staff typed them — the invoice's note, payment and refund notes, and its lines'
 * descriptions — to the erasure reference. Runs inside the erasure's transaction. Answers how many
 * rows changed.
 */
export async function redactKeptInvoices(trx: Knex, athleteId: number, terms: IdentifyingTerms, reference: string): Promise<number> {
  const pattern = identifyingPattern(terms);
  if (!pattern) return 0;
  const rewrite = (text: string | null) => (text === null ? null : text.replace(pattern, reference));
  let changed = 0;
  const invoices = await trx('invoices')
    .where({ athlete_id: athleteId })
    .select<({ id: number } & Record<(typeof INVOICE_TEXT)[number], string | null>)[]>('id', ...INVOICE_TEXT);
  for (const row of invoices) {
    const update: Record<string, string | null> = {};
    for (const field of INVOICE_TEXT) if (rewrite(row[field]) !== row[field]) update[field] = rewrite(row[field]);
    if (Object.keys(update).length) changed += await trx('invoices').where({ id: row.id }).update(update);
  }
  const lines = await trx('invoice_lines')
    .whereIn(
      'invoice_id',
      invoices.map((i) => i.id),
    )
    .select<{ id: number; description: string }[]>('id', 'description');
  for (const line of lines) {
    const description = rewrite(line.description)!;
    if (description !== line.description) changed += await trx('invoice_lines').where({ id: line.id }).update({ description });
  }
  return changed;
}
