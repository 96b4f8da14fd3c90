import type { SessionUser } from '../../src/contracts/api';
import type { CheckoutStart, InvoiceDetail, ManualPaymentWrite } from '../../src/contracts/billing';
import { AppError, ConflictError, ValidationError } from '../errors';
import type { BillingContext } from './billing-context';
import type { BillingMail } from './billing-mail';
import { doneWithKey } from './invoice-act-keys';
import { changedMeanwhile } from './invoice-drafts';
import { invoicesRepository as invoices } from './invoices-repository';

/** Getting paid: the athlete's card payment page, the owner's recorded transfer or cash, refunds. */
export interface InvoicePaymentsService {
  /**
   * issued → paid by a bank transfer or cash the clinic received, recorded by the owner (no
   * payment service): the day the money arrived (not in the future, not before the invoice was
   * issued) and a note. The athlete is e-mailed that it was received. With `key` (the client's
   * `Idempotency-Key`), the same payment sent again answers the invoice; the same key with other details 422.
   */
  recordPayment(user: SessionUser, id: number, w: ManualPaymentWrite, key?: string): Promise<InvoiceDetail>;
  /**
   * paid → refunded. A card payment goes back through the provider (its refund event then finds
   * it done); a recorded bank transfer or cash payment is refunded by the clinic itself, so the
   * refund is only recorded here, with an optional note.
   */
  refund(user: SessionUser, id: number, note?: string, key?: string): Promise<InvoiceDetail>;
  /** The athlete's own issued invoice → a payment page URL. Anything but `issued` is refused. */
  startCheckout(user: SessionUser, id: number): Promise<CheckoutStart>;
}

export function invoicePaymentsService(ctx: BillingContext, mail: BillingMail): InvoicePaymentsService {
  const { db } = ctx;
  return {
    async recordPayment(user, id, w, key) {
      const row = await ctx.loadRow(user, id, 'invoice:record-payment');
      if (doneWithKey(row, 'payment', key, w)) return ctx.reload(user, id, 'invoice:read');
      if (row.status !== 'issued')
        throw new ConflictError(`Only an issued invoice can be marked paid; this one is ${row.status}.`, 'invalid_transition');
      const today = ctx.now().slice(0, 10);
      if (w.paidOn > today)
        throw new ValidationError('paidOn: the payment date cannot be in the future.', [
          { path: ['paidOn'], message: 'The payment date cannot be in the future.' },
        ]);
      if (row.issued_at && w.paidOn < row.issued_at.slice(0, 10)) {
        throw new ValidationError('paidOn: before the invoice was issued.', [
          { path: ['paidOn'], message: `The payment date cannot be before the invoice was issued (${row.issued_at.slice(0, 10)}).` },
        ]);
      }
      const at = ctx.now();
      const patch = {
        status: 'paid' as const,
        paid_at: at,
        paid_on: w.paidOn,
        payment_method: w.method,
        payment_note: w.note || null,
        payment_recorded_by: user.id,
        checkout_state: 'none' as const,
        updated_at: at,
        payment_key: key ?? null,
      };
      // A card payment page opened earlier can no longer go through: only `issued` invoices are paid by the webhook.
      if (!(await invoices.transition(db, row.id, ['issued'], patch)))
        return ctx.sameActOr(user, id, 'payment', key, changedMeanwhile(), w);
      await mail.paymentRecorded(row, w.method);
      return ctx.reload(user, id, 'invoice:read');
    },

    async refund(user, id, note, key) {
      const row = await ctx.loadRow(user, id, 'invoice:refund');
      if (doneWithKey(row, 'refund', key)) return ctx.reload(user, id, 'invoice:read');
      if (row.status !== 'paid')
        throw new ConflictError(`Only a paid invoice can be refunded; this one is ${row.status}.`, 'invalid_transition');
      const at = ctx.now();
      if (row.payment_method === 'bank_transfer' || row.payment_method === 'cash') {
        const refunded = await invoices.transition(db, row.id, ['paid'], {
          status: 'refunded',
          refunded_at: at,
          refund_note: note || null,
          updated_at: at,
          refund_key: key ?? null,
        });
        if (!refunded) return ctx.sameActOr(user, id, 'refund', key, changedMeanwhile());
        return ctx.reload(user, id, 'invoice:read');
      }
      if (!row.payment_intent_id) throw new ConflictError('This payment has no card payment to refund.', 'invalid_transition');
      const p = ctx.needPayments();
      const paymentId = row.payment_intent_id;
      const result = await ctx.provider('refund', () => p.refund(paymentId, `refund-invoice-${row.id}`));
      if (result.succeeded)
        await invoices.transition(db, row.id, ['paid'], {
          status: 'refunded',
          refunded_at: at,
          refund_id: result.id,
          refund_note: note || null,
          updated_at: at,
          refund_key: key ?? null,
        });
      // Pending at the provider: the key is kept so a retry answers this refund (the provider's own key already keeps it one).
      else await invoices.update(db, row.id, { refund_id: result.id, updated_at: at, refund_key: key ?? null });
      return ctx.reload(user, id, 'invoice:read');
    },

    async startCheckout(user, id) {
      const row = await ctx.loadRow(user, id, 'invoice:pay');
      if (row.status !== 'issued') throw new ConflictError(`This invoice is ${row.status} and cannot be paid.`, 'invoice_not_payable');
      const p = ctx.needPayments();
      const url = ctx.portalLink(id);
      const page = await ctx.provider('start payment', () =>
        p.createCheckout({
          invoiceId: row.id,
          description: `Invoice ${row.number}`,
          amountMinor: row.total_minor,
          currency: row.currency,
          customerEmail: row.athlete_email,
          successUrl: `${url}?checkout=success`,
          cancelUrl: `${url}?checkout=cancel`,
        }),
      );
      if (!page.url) throw new AppError(502, 'payment_provider_error', 'The payment service gave no payment page.');
      await invoices.update(db, row.id, { checkout_session_id: page.id, checkout_state: 'pending', updated_at: ctx.now() });
      return { url: page.url };
    },
  };
}
