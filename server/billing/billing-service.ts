import type { Logger } from 'pino';
import type { SessionUser } from '../../src/contracts/api';
import {
  formatMinor,
  invoiceTotals,
  lineAmounts,
  type BillingSettings,
  type CheckoutStart,
  type Currency,
  type InvoiceDetail,
  type InvoiceList,
  type InvoiceQuery,
  type InvoiceWrite,
  type ManualPaymentWrite,
  type PaymentMethod,
  type Price,
  type PriceWrite,
} from '../../src/contracts/billing';
import type { Config } from '../config';
import type { Db } from '../db/knex';
import { AppError, BadRequestError, ConflictError, ForbiddenError, NotFoundError, ValidationError } from '../errors';
import { clinicRepository } from '../clinic/clinic-repository';
import type { Mailer } from '../mail/mailer';
import { invoicesRepository as invoices, toDetail, toSummary, type InvoiceRow, type InvoiceScope } from './invoices-repository';
import type { Payments, PaymentEvent } from './payments';
import { pricesRepository as prices, toPrice } from './prices-repository';
import { renderReceipt } from './receipt-pdf';
import { confirmRefundEvent, REFUND_EVENTS, refundsWholeInvoice, type ConfirmedRefund } from './refund-events';

export interface BillingDeps {
  db: Db;
  mailer: Mailer;
  config: Pick<Config, 'publicUrl'>;
  logger: Logger;
  clock: () => Date;
  /** null when card payment is not configured. */
  payments: Payments | null;
}

export type BillingService = ReturnType<typeof billingService>;

/**
 * Price list, invoices and payment. Owners manage; athletes see and pay their own issued invoices
 * by card, and the provider's signed webhook is the only thing that marks a card payment paid; the
 * owner records a bank transfer or cash by hand (and its refund, without the provider).
 */
export function billingService({ db, mailer, config, logger, clock, payments }: BillingDeps) {
  const now = () => clock().toISOString();

  function requireOwner(user: SessionUser): void {
    if (user.role !== 'owner') throw new ForbiddenError();
  }

  /** Owner: the whole clinic; athlete: their own issued invoices; coach: none. */
  function scopeOf(user: SessionUser): InvoiceScope {
    if (user.role === 'owner') return { clinicId: user.clinicId };
    if (user.role === 'athlete') return { clinicId: user.clinicId, athleteUserId: user.id };
    throw new ForbiddenError('Invoices are for the clinic owner and the athlete billed.');
  }

  async function clinicOf(clinicId: number): Promise<{ name: string; currency: Currency }> {
    return db('clinics').where({ id: clinicId }).first('name', 'currency');
  }

  async function loadRow(user: SessionUser, id: number): Promise<InvoiceRow> {
    const row = await invoices.find(db, scopeOf(user), id);
    if (!row) throw new NotFoundError('Invoice');
    return row;
  }

  async function detail(row: InvoiceRow): Promise<InvoiceDetail> {
    const clinic = await clinicOf(row.clinic_id);
    return toDetail(row, await invoices.lines(db, row.id), clinic.name, await clinicRepository.legalDetails(db, row.clinic_id));
  }

  async function reload(user: SessionUser, id: number): Promise<InvoiceDetail> {
    return detail(await loadRow(user, id));
  }

  function needPayments(): Payments {
    if (!payments) throw new AppError(503, 'payments_unavailable', 'Card payment is not set up for this clinic yet.');
    return payments;
  }

  /** Runs a provider call; its failures become a 502 the page can show. */
  async function provider<T>(what: string, call: () => Promise<T>): Promise<T> {
    try {
      return await call();
    } catch (err) {
      logger.warn({ err: (err as Error).message }, `payment provider: ${what} failed`);
      throw new AppError(502, 'payment_provider_error', `The payment service refused or did not answer (${what}). Try again in a minute.`);
    }
  }

  async function mailSafely(to: string | null, subject: string, lines: string[]): Promise<void> {
    if (!to) return;
    try {
      await mailer.send({ to, subject, text: lines.join('\n') });
    } catch (err) {
      logger.warn({ err: (err as Error).message }, 'billing e-mail not sent');
    }
  }

  const portalLink = (id: number) => `${config.publicUrl}/portal/invoices/${id}`;

  /**
   * How the athlete reaches an invoice: the portal link when they can sign in; otherwise no link
   * they cannot use, but how to get access (and that the clinic also takes a transfer or cash).
   */
  function accessLines(row: InvoiceRow, clinicName: string, withAccount: string[]): string[] {
    if (row.athlete_user_id !== null) return withAccount;
    return [
      `You do not have a Trailframe account yet, so there is no link to follow here. To see your invoices and pay by card online, accept the invitation ${clinicName} sends to this address (or ask them for one), then sign in and open "My invoices".`,
      `You can also pay ${clinicName} by bank transfer or in cash; they record the payment.`,
    ];
  }

  /**
   * The athlete and assessment must be this clinic's (the assessment this athlete's), and every
   * price on a line must be on the list; `keptPriceIds` may be archived (lines that already had them).
   */
  async function checkReferences(trx: Db, clinicId: number, w: InvoiceWrite, keptPriceIds: Set<number>): Promise<void> {
    const athlete = await trx('athletes').where({ id: w.athleteId, clinic_id: clinicId }).first('id');
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
  function lineRows(w: InvoiceWrite) {
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
  function requireDraft(row: InvoiceRow, what: 'edited' | 'deleted'): void {
    if (row.status === 'draft') return;
    const which = row.number ? `invoice ${row.number} is ${row.status}` : `this invoice is ${row.status}`;
    const instead = row.status === 'issued' ? ' Cancel it and make a new one instead.' : '';
    throw new ConflictError(`Only a draft can be ${what}; ${which}.${instead}`, 'invoice_not_draft');
  }

  const notDraftAnymore = () => new ConflictError('The invoice was issued or cancelled meanwhile; reload it.', 'invoice_not_draft');

  /** "bank transfer", "cash", "card payment": how a receipt or e-mail says it. */
  const METHOD_WORDS: Record<PaymentMethod, string> = { card: 'card payment', bank_transfer: 'bank transfer', cash: 'cash' };

  return {
    async settings(user: SessionUser): Promise<BillingSettings> {
      requireOwner(user);
      return { currency: (await clinicOf(user.clinicId)).currency };
    },

    /** Changes the clinic's currency; refused once an invoice exists (its amounts are in the old one). */
    async putSettings(user: SessionUser, s: BillingSettings): Promise<BillingSettings> {
      requireOwner(user);
      await db.transaction(async (trx) => {
        const used = await trx('invoices').where({ clinic_id: user.clinicId }).whereNot({ currency: s.currency }).first('id');
        if (used)
          throw new ConflictError('Invoices already exist in the current currency; the currency cannot change now.', 'currency_in_use');
        await trx('clinics').where({ id: user.clinicId }).update({ currency: s.currency });
        await prices.setCurrency(trx, user.clinicId, s.currency);
      });
      return { currency: s.currency };
    },

    async listPrices(user: SessionUser, includeArchived: boolean): Promise<Price[]> {
      requireOwner(user);
      return (await prices.list(db, user.clinicId, includeArchived)).map(toPrice);
    },

    async createPrice(user: SessionUser, w: PriceWrite): Promise<Price> {
      requireOwner(user);
      const { currency } = await clinicOf(user.clinicId);
      const id = await prices.insert(db, user.clinicId, currency, w, now());
      return toPrice((await prices.find(db, user.clinicId, id))!);
    },

    async updatePrice(user: SessionUser, id: number, w: Partial<PriceWrite>): Promise<Price> {
      requireOwner(user);
      if (!(await prices.find(db, user.clinicId, id))) throw new NotFoundError('Price');
      await prices.update(db, user.clinicId, id, w, now());
      return toPrice((await prices.find(db, user.clinicId, id))!);
    },

    /** Removes a price from the list; invoices that used it keep their lines. */
    async archivePrice(user: SessionUser, id: number): Promise<void> {
      requireOwner(user);
      if (!(await prices.find(db, user.clinicId, id))) throw new NotFoundError('Price');
      await prices.archive(db, user.clinicId, id, now());
    },

    async list(user: SessionUser, query: InvoiceQuery): Promise<InvoiceList> {
      const rows = await invoices.list(db, scopeOf(user), query);
      const sum = (f: (r: InvoiceRow) => boolean) => rows.filter(f).reduce((s, r) => s + r.total_minor, 0);
      const { currency } = await clinicOf(user.clinicId);
      return {
        invoices: rows.map(toSummary),
        totals: {
          currency,
          count: rows.length,
          totalMinor: sum((r) => r.status !== 'cancelled'),
          outstandingMinor: sum((r) => r.status === 'issued'),
          paidMinor: sum((r) => r.status === 'paid'),
          refundedMinor: sum((r) => r.status === 'refunded'),
        },
      };
    },

    get: reload,

    /** A draft invoice; amounts, tax (half-up per line) and totals are computed here. */
    async create(user: SessionUser, w: InvoiceWrite): Promise<InvoiceDetail> {
      requireOwner(user);
      const at = now();
      const id = await db.transaction(async (trx) => {
        await checkReferences(trx, user.clinicId, w, new Set());
        const { currency } = await trx('clinics').where({ id: user.clinicId }).first('currency');
        const totals = invoiceTotals(w.lines);
        return invoices.insert(
          trx,
          {
            clinic_id: user.clinicId,
            athlete_id: w.athleteId,
            assessment_id: w.assessmentId,
            number: null,
            status: 'draft',
            currency,
            subtotal_minor: totals.subtotalMinor,
            tax_minor: totals.taxMinor,
            total_minor: totals.totalMinor,
            due_date: w.dueDate,
            note: w.note,
            checkout_session_id: null,
            checkout_state: 'none',
            payment_intent_id: null,
            refund_id: null,
            created_by: user.id,
            issued_at: null,
            paid_at: null,
            cancelled_at: null,
            refunded_at: null,
            created_at: at,
            updated_at: at,
            payment_method: null,
            paid_on: null,
            payment_note: null,
            refund_note: null,
            payment_recorded_by: null,
          },
          lineRows(w),
        );
      });
      return reload(user, id);
    },

    /**
     * Replaces a draft's athlete, assessment, due date, note and lines (validated as on create);
     * amounts and totals are computed again here. 409 `invoice_not_draft` once it was issued or cancelled.
     */
    async update(user: SessionUser, id: number, w: InvoiceWrite): Promise<InvoiceDetail> {
      requireOwner(user);
      const row = await loadRow(user, id);
      requireDraft(row, 'edited');
      await db.transaction(async (trx) => {
        // A price archived after the draft was made may stay on the lines that already use it.
        const kept = new Set((await invoices.lines(trx, id)).map((l) => l.price_id).filter((p): p is number => p !== null));
        await checkReferences(trx, user.clinicId, w, kept);
        const totals = invoiceTotals(w.lines);
        const patch = {
          athlete_id: w.athleteId,
          assessment_id: w.assessmentId,
          due_date: w.dueDate,
          note: w.note,
          subtotal_minor: totals.subtotalMinor,
          tax_minor: totals.taxMinor,
          total_minor: totals.totalMinor,
          updated_at: now(),
        };
        if (!(await invoices.replaceDraft(trx, id, patch, lineRows(w)))) throw notDraftAnymore();
      });
      return reload(user, id);
    },

    /** Deletes a draft and its lines (it never had a number). 409 `invoice_not_draft` otherwise: cancel it instead. */
    async remove(user: SessionUser, id: number): Promise<void> {
      requireOwner(user);
      const row = await loadRow(user, id);
      requireDraft(row, 'deleted');
      if (!(await db.transaction((trx) => invoices.deleteDraft(trx, id)))) throw notDraftAnymore();
    },

    /**
     * draft → issued: gives the invoice its number and e-mails the athlete a link to it — or, when
     * they have no account yet, how to get access instead of a link they cannot use.
     */
    async issue(user: SessionUser, id: number): Promise<InvoiceDetail> {
      requireOwner(user);
      const row = await loadRow(user, id);
      if (row.status !== 'draft')
        throw new ConflictError(`Only a draft can be issued; this invoice is ${row.status}.`, 'invalid_transition');
      const at = now();
      const number = await db.transaction(async (trx) => {
        const n = await invoices.nextNumber(trx, user.clinicId, clock().getUTCFullYear());
        if (!(await invoices.transition(trx, id, ['draft'], { status: 'issued', number: n, issued_at: at, updated_at: at }))) {
          throw new ConflictError('The invoice changed meanwhile; reload it.', 'invalid_transition');
        }
        return n;
      });
      const clinic = await clinicOf(user.clinicId);
      await mailSafely(row.athlete_email, `Invoice ${number} from ${clinic.name}`, [
        `Hello ${row.first_name},`,
        '',
        `${clinic.name} has sent you invoice ${number} for ${formatMinor(row.total_minor)} ${row.currency}, due ${row.due_date}.`,
        ...accessLines(row, clinic.name, ['See it and pay by card in your portal:', '', portalLink(id)]),
      ]);
      return reload(user, id);
    },

    /** draft/issued → cancelled. A paid invoice is refunded instead. */
    async cancel(user: SessionUser, id: number): Promise<InvoiceDetail> {
      requireOwner(user);
      const row = await loadRow(user, id);
      const at = now();
      if (!(await invoices.transition(db, row.id, ['draft', 'issued'], { status: 'cancelled', cancelled_at: at, updated_at: at }))) {
        throw new ConflictError(
          `Only a draft or issued invoice can be cancelled; this one is ${row.status}${row.status === 'paid' ? ' (refund it instead)' : ''}.`,
          'invalid_transition',
        );
      }
      return reload(user, id);
    },

    /**
     * issued → paid by a bank transfer or cash the clinic received, recorded by the owner (no
     * payment service): the day the money arrived (not in the future, not before the invoice was
     * issued) and a note. The athlete is e-mailed that it was received.
     */
    async recordPayment(user: SessionUser, id: number, w: ManualPaymentWrite): Promise<InvoiceDetail> {
      requireOwner(user);
      const row = await loadRow(user, id);
      if (row.status !== 'issued')
        throw new ConflictError(`Only an issued invoice can be marked paid; this one is ${row.status}.`, 'invalid_transition');
      const today = now().slice(0, 10);
      if (w.paidOn > today)
        throw new ValidationError('paidOn: the payment date cannot be in the future.', [
          { path: ['paidOn'], message: 'The payment date cannot be in the future.' },
        ]);
      if (row.issued_at && w.paidOn < row.issued_at.slice(0, 10)) {
        throw new ValidationError('paidOn: before the invoice was issued.', [
          { path: ['paidOn'], message: `The payment date cannot be before the invoice was issued (${row.issued_at.slice(0, 10)}).` },
        ]);
      }
      const at = now();
      const patch = {
        status: 'paid' as const,
        paid_at: at,
        paid_on: w.paidOn,
        payment_method: w.method,
        payment_note: w.note || null,
        payment_recorded_by: user.id,
        checkout_state: 'none' as const,
        updated_at: at,
      };
      // A card payment page opened earlier can no longer go through: only `issued` invoices are paid by the webhook.
      if (!(await invoices.transition(db, row.id, ['issued'], patch)))
        throw new ConflictError('The invoice changed meanwhile; reload it.', 'invalid_transition');
      const clinic = await clinicOf(user.clinicId);
      await mailSafely(row.athlete_email, `Payment received for invoice ${row.number}`, [
        `Hello ${row.first_name},`,
        '',
        `${clinic.name} has received your payment of ${formatMinor(row.total_minor)} ${row.currency} for invoice ${row.number} by ${METHOD_WORDS[w.method]}. Thank you.`,
        ...(row.athlete_user_id !== null
          ? ['Your receipt is in your portal:', '', portalLink(row.id)]
          : [
              `Ask ${clinic.name} for your receipt if you need one. To see your invoices online, accept the invitation they send to this address, then sign in and open "My invoices".`,
            ]),
      ]);
      return reload(user, id);
    },

    /**
     * paid → refunded. A card payment goes back through the provider (its `charge.refunded` event
     * then finds it done); a recorded bank transfer or cash payment is refunded by the clinic itself,
     * so the refund is only recorded here, with an optional note.
     */
    async refund(user: SessionUser, id: number, note?: string): Promise<InvoiceDetail> {
      requireOwner(user);
      const row = await loadRow(user, id);
      if (row.status !== 'paid')
        throw new ConflictError(`Only a paid invoice can be refunded; this one is ${row.status}.`, 'invalid_transition');
      const at = now();
      if (row.payment_method === 'bank_transfer' || row.payment_method === 'cash') {
        if (
          !(await invoices.transition(db, row.id, ['paid'], {
            status: 'refunded',
            refunded_at: at,
            refund_note: note || null,
            updated_at: at,
          }))
        ) {
          throw new ConflictError('The invoice changed meanwhile; reload it.', 'invalid_transition');
        }
        return reload(user, id);
      }
      if (!row.payment_intent_id) throw new ConflictError('This payment has no card payment to refund.', 'invalid_transition');
      const p = needPayments();
      const pi = row.payment_intent_id;
      const result = await provider('refund', () => p.refund(pi, `refund-invoice-${row.id}`));
      if (result.succeeded)
        await invoices.transition(db, row.id, ['paid'], {
          status: 'refunded',
          refunded_at: at,
          refund_id: result.id,
          refund_note: note || null,
          updated_at: at,
        });
      else await invoices.update(db, row.id, { refund_id: result.id, updated_at: at });
      return reload(user, id);
    },

    /** The athlete's own issued invoice → a payment page URL. Anything but `issued` is refused. */
    async startCheckout(user: SessionUser, id: number): Promise<CheckoutStart> {
      if (user.role !== 'athlete') throw new ForbiddenError('Athletes pay their own invoices.');
      const row = await loadRow(user, id);
      if (row.status !== 'issued') throw new ConflictError(`This invoice is ${row.status} and cannot be paid.`, 'invoice_not_payable');
      const p = needPayments();
      const url = portalLink(id);
      const session = await provider('start payment', () =>
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
      if (!session.url) throw new AppError(502, 'payment_provider_error', 'The payment service gave no payment page.');
      await invoices.update(db, row.id, { checkout_session_id: session.id, checkout_state: 'pending', updated_at: now() });
      return { url: session.url };
    },

    /** The receipt PDF of a paid (or since refunded) invoice. */
    async receipt(user: SessionUser, id: number): Promise<{ pdf: Buffer; filename: string }> {
      const d = await reload(user, id);
      if (d.status !== 'paid' && d.status !== 'refunded')
        throw new ConflictError('A receipt exists once the invoice is paid.', 'receipt_not_available');
      return { pdf: await renderReceipt(d), filename: `receipt-${d.number}.pdf` };
    },

    /**
     * A provider webhook: the signature is checked over the raw body, then each event id is handled
     * once (recorded in the same transaction as its effect). Answers whether it was a repeat.
     */
    async webhook(rawBody: Buffer, signature: string | undefined): Promise<{ duplicate: boolean }> {
      const p = needPayments();
      let event: PaymentEvent;
      try {
        event = p.verifyWebhook(rawBody, signature);
      } catch {
        throw new BadRequestError('The webhook signature is missing or does not match.', 'invalid_signature');
      }
      const seen = await db('payment_events').where({ id: event.id }).first('id');
      if (seen) return { duplicate: true };

      const o = event.object;
      let invoiceId: number | null = null;
      let confirmed: Awaited<ReturnType<Payments['retrieveCheckout']>> | null = null;
      let refund: ConfirmedRefund | null = null;
      if (event.type === 'checkout.session.completed') {
        // Ask the provider again rather than trusting any copy of the session.
        confirmed = await provider('confirm payment', () => p.retrieveCheckout(String(o['id'])));
        invoiceId = confirmed.invoiceId;
      } else if (event.type === 'checkout.session.async_payment_failed') {
        invoiceId = Number((o['metadata'] as Record<string, string> | undefined)?.['invoice_id']) || null;
      } else if (REFUND_EVENTS.has(event.type)) {
        // Ask the provider about the charge or refund; the event's own copy (payment, amount) is not used.
        refund = await provider('confirm refund', () => confirmRefundEvent(p, event));
        const pi = refund?.paymentIntentId;
        invoiceId = pi ? ((await invoices.findByPaymentIntent(db, pi))?.id ?? null) : null;
        if (!refund) logger.warn({ eventId: event.id, type: event.type }, 'refund event the payment service does not confirm; ignored');
      }

      const at = now();
      let newlyPaid: InvoiceRow | null = null;
      let refundVoided: string | null = null;
      const handled = await db.transaction(async (trx) => {
        if (!(await invoices.recordEvent(trx, event.id, event.type, invoiceId, at))) return false;
        const row = invoiceId ? await invoices.findById(trx, invoiceId) : undefined;
        if (!row) return true;
        if (confirmed) {
          const matches =
            confirmed.paid &&
            confirmed.amountMinor === row.total_minor &&
            confirmed.currency === row.currency &&
            !!confirmed.paymentIntentId;
          if (!matches) {
            logger.warn({ invoiceId: row.id, session: confirmed.id }, 'payment event does not match the invoice; not marked paid');
          } else if (
            await invoices.transition(trx, row.id, ['issued'], {
              status: 'paid',
              paid_at: at,
              paid_on: at.slice(0, 10),
              payment_method: 'card',
              payment_intent_id: confirmed.paymentIntentId,
              checkout_session_id: confirmed.id,
              checkout_state: 'none',
              updated_at: at,
            })
          ) {
            newlyPaid = row;
          } else if (row.status === 'cancelled' || (row.status === 'paid' && row.payment_method !== 'card')) {
            // Paid on a payment page opened before the invoice was cancelled, or before the owner
            // recorded a transfer or cash payment: give the card payment back.
            refundVoided = confirmed.paymentIntentId;
          } else {
            logger.warn({ invoiceId: row.id, status: row.status }, 'payment for an invoice that is not issued');
          }
        } else if (event.type === 'checkout.session.async_payment_failed') {
          if (row.status === 'issued' && row.checkout_session_id === o['id'])
            await invoices.update(trx, row.id, { checkout_state: 'failed', updated_at: at });
        } else if (refund) {
          if (refundsWholeInvoice(refund, row)) {
            await invoices.transition(trx, row.id, ['paid'], {
              status: 'refunded',
              refunded_at: at,
              updated_at: at,
              ...(refund.refundId ? { refund_id: refund.refundId } : {}),
            });
          } else if (row.status === 'paid') {
            logger.warn({ invoiceId: row.id, eventId: event.id }, 'refund not confirmed for the whole invoice; left paid');
          }
        }
        return true;
      });
      if (!handled) return { duplicate: true };
      if (refundVoided) {
        const pi = refundVoided;
        await provider('refund an invoice that is no longer payable', () => p.refund(pi, `refund-void-${invoiceId}-${pi}`)).catch((err) =>
          logger.error({ err, invoiceId }, 'a cancelled or already paid invoice was paid by card and the refund failed; refund it by hand'),
        );
      }
      const paid = newlyPaid as InvoiceRow | null;
      if (paid) {
        const clinic = await clinicOf(paid.clinic_id);
        await mailSafely(paid.athlete_email, `Payment received for invoice ${paid.number}`, [
          `Hello ${paid.first_name},`,
          '',
          `${clinic.name} has received your payment of ${formatMinor(paid.total_minor)} ${paid.currency} for invoice ${paid.number}. Thank you.`,
          'Your receipt is in your portal:',
          '',
          portalLink(paid.id),
        ]);
      }
      return { duplicate: false };
    },
  };
}
