import type { Knex } from 'knex';
import { invoiceTotals, lineAmounts } from '../src/contracts/billing';

/**
 * Invented demo billing history for the demo athlete (Ada Kestrel): her Baseline visit billed and
 * paid by card, her Re-test billed and still to pay (issued). Numbers continue per clinic (TF-2026-0001, -0002),
 * so the next invoice issued in 2026 is TF-2026-0003.
 */
export const DEMO_INVOICES = [
  {
    number: 'TF-2026-0001',
    kind: 'baseline',
    item: 'Gait assessment',
    status: 'paid',
    createdAt: '2026-10-06T15:40:00.000Z',
    issuedAt: '2026-10-06T15:45:00.000Z',
    dueDate: '2026-10-20',
    paidAt: '2026-10-08T18:12:00.000Z',
  },
  {
    number: 'TF-2026-0002',
    kind: 'retest',
    item: 'Re-test',
    status: 'issued',
    createdAt: '2026-11-24T16:50:00.000Z',
    issuedAt: '2026-11-24T16:55:00.000Z',
    dueDate: '2026-12-08',
    paidAt: null,
  },
] as const;

/**
 * Inserts {@link DEMO_INVOICES} (inside the seed's transaction, after the athletes, assessments and
 * prices). The paid one looks as the payment webhook leaves an invoice: status paid, paid_at, the
 * checkout session and payment references, and its `checkout.session.completed` event recorded.
 * The references are invented (`demo_…`); a real payment service does not know them, the local
 * fake accepts a refund of `pi_demo_…` so the demo's refund works on this invoice too.
 */
export async function seedDemoInvoices(trx: Knex, clinicId: number, ownerId: number): Promise<void> {
  const ada = await trx('athletes').where({ clinic_id: clinicId, last_name: 'Kestrel' }).first<{ id: number }>('id');
  if (!ada) return;
  const visits = await trx('assessments').where({ athlete_id: ada.id }).select<{ id: number; kind: string }[]>('id', 'kind');
  const prices = await trx('prices')
    .where({ clinic_id: clinicId })
    .select<{ id: number; item: string; amount_minor: number; tax_rate_bp: number | null; currency: string }[]>(
      'id',
      'item',
      'amount_minor',
      'tax_rate_bp',
      'currency',
    );
  for (const inv of DEMO_INVOICES) {
    const visit = visits.find((v) => v.kind === inv.kind);
    const price = prices.find((p) => p.item === inv.item);
    if (!visit || !price) continue;
    const line = { quantity: 1, unitAmountMinor: price.amount_minor, taxRateBp: price.tax_rate_bp };
    const totals = invoiceTotals([line]);
    const amounts = lineAmounts(line);
    const paid = inv.status === 'paid';
    const ref = `demo_${inv.number.toLowerCase().replaceAll('-', '_')}`;
    const [row] = await trx('invoices')
      .insert({
        clinic_id: clinicId,
        athlete_id: ada.id,
        assessment_id: visit.id,
        number: inv.number,
        status: inv.status,
        currency: price.currency,
        subtotal_minor: totals.subtotalMinor,
        tax_minor: totals.taxMinor,
        total_minor: totals.totalMinor,
        due_date: inv.dueDate,
        note: null,
        checkout_session_id: paid ? `cs_${ref}` : null,
        checkout_state: 'none',
        payment_intent_id: paid ? `pi_${ref}` : null,
        refund_id: null,
        created_by: ownerId,
        issued_at: inv.issuedAt,
        paid_at: inv.paidAt,
        cancelled_at: null,
        refunded_at: null,
        payment_method: paid ? 'card' : null,
        paid_on: inv.paidAt?.slice(0, 10) ?? null,
        created_at: inv.createdAt,
        updated_at: inv.paidAt ?? inv.issuedAt,
      })
      .returning('id');
    const invoiceId = (row as { id: number }).id;
    await trx('invoice_lines').insert({
      invoice_id: invoiceId,
      position: 0,
      price_id: price.id,
      description: price.item,
      quantity: 1,
      unit_amount_minor: price.amount_minor,
      tax_rate_bp: price.tax_rate_bp,
      net_minor: amounts.netMinor,
      tax_minor: amounts.taxMinor,
      total_minor: amounts.totalMinor,
    });
    if (paid)
      await trx('payment_events').insert({
        id: `evt_${ref}`,
        type: 'checkout.session.completed',
        invoice_id: invoiceId,
        received_at: inv.paidAt,
      });
  }
}
