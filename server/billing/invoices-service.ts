import type { SessionUser } from '../../src/contracts/api';
import { invoiceTotals, type InvoiceDetail, type InvoiceList, type InvoiceQuery, type InvoiceWrite } from '../../src/contracts/billing';
import { lockedForUpdate } from '../db/dialect';
import { AppError, ConflictError } from '../errors';
import { assertRole } from '../policy/enforce';
import type { BillingContext } from './billing-context';
import type { BillingMail } from './billing-mail';
import { doneWithKey } from './invoice-act-keys';
import { changedMeanwhile, checkReferences, lineRows, notDraftAnymore, requireDraft } from './invoice-drafts';
import { invoicesRepository as invoices, toSummary, type InvoiceRow } from './invoices-repository';
import { renderReceipt } from './receipt-pdf';

/** Invoices from draft to issued or cancelled, the list with its totals, and the receipt. */
export interface InvoicesService {
  /** The owner the clinic's invoices, an athlete their own (no drafts); coaches 403. */
  list(user: SessionUser, query: InvoiceQuery): Promise<InvoiceList>;
  get(user: SessionUser, id: number): Promise<InvoiceDetail>;
  /** A draft invoice; amounts, tax (half-up per line) and totals are computed here. */
  /**
   * A new draft. With `key` (the client's `Idempotency-Key`), the same key again answers the draft
   * it made (a retry after a lost answer makes no second invoice); 422 `idempotency_key_reused`
   * when that draft is for another athlete.
   */
  create(user: SessionUser, w: InvoiceWrite, key?: string): Promise<InvoiceDetail>;
  /**
   * Replaces a draft's athlete, assessment, due date, note and lines (validated as on create);
   * amounts and totals are computed again here. 409 `invoice_not_draft` once it was issued or cancelled.
   */
  update(user: SessionUser, id: number, w: InvoiceWrite): Promise<InvoiceDetail>;
  /** Deletes a draft and its lines (it never had a number). 409 `invoice_not_draft` otherwise: cancel it instead. */
  remove(user: SessionUser, id: number): Promise<void>;
  /**
   * draft → issued: gives the invoice its number and e-mails the athlete a link to it — or, when
   * they have no account yet, how to get access instead of a link they cannot use. With `key` (the
   * client's `Idempotency-Key`), the same act sent again answers the invoice (no second number or e-mail).
   */
  issue(user: SessionUser, id: number, key?: string): Promise<InvoiceDetail>;
  /** draft/issued → cancelled. A paid invoice is refunded instead. */
  cancel(user: SessionUser, id: number, key?: string): Promise<InvoiceDetail>;
  /** The receipt PDF of a paid (or since refunded) invoice. */
  receipt(user: SessionUser, id: number): Promise<{ pdf: Buffer; filename: string }>;
}

export function invoicesService(ctx: BillingContext, mail: BillingMail): InvoicesService {
  const { db } = ctx;
  return {
    async list(user, query) {
      const rows = await invoices.list(db, ctx.listScope(user), query);
      const sum = (f: (r: InvoiceRow) => boolean) => rows.filter(f).reduce((s, r) => s + r.total_minor, 0);
      const { currency } = await ctx.clinicOf(user.clinicId);
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

    get: (user, id) => ctx.reload(user, id, 'invoice:read'),

    async create(user, w, key) {
      assertRole(user, 'invoice:create');
      const at = ctx.now();
      const id = await db.transaction(async (trx) => {
        if (key) {
          // One create with a key at a time per clinic (PostgreSQL; SQLite has one writer): a retry
          // sent while the first is still saving finds its draft.
          await lockedForUpdate(trx, trx('clinics').where({ id: user.clinicId }).select('id'));
          const made = await trx<InvoiceRow>('invoices').where({ clinic_id: user.clinicId, create_key: key }).first('id', 'athlete_id');
          if (made && made.athlete_id !== w.athleteId)
            throw new AppError(422, 'idempotency_key_reused', 'This key was used for another invoice. Reload the page and save again.');
          if (made) return made.id;
        }
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
            create_key: key ?? null,
          },
          lineRows(w),
        );
      });
      return ctx.reload(user, id, 'invoice:read');
    },

    async update(user, id, w) {
      const row = await ctx.loadRow(user, id, 'invoice:update');
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
          updated_at: ctx.now(),
        };
        if (!(await invoices.replaceDraft(trx, id, patch, lineRows(w)))) throw notDraftAnymore();
      });
      return ctx.reload(user, id, 'invoice:read');
    },

    async remove(user, id) {
      const row = await ctx.loadRow(user, id, 'invoice:delete');
      requireDraft(row, 'deleted');
      if (!(await db.transaction((trx) => invoices.deleteDraft(trx, id)))) throw notDraftAnymore();
    },

    async issue(user, id, key) {
      const row = await ctx.loadRow(user, id, 'invoice:issue');
      if (doneWithKey(row, 'issue', key)) return ctx.reload(user, id, 'invoice:read');
      if (row.status !== 'draft')
        throw new ConflictError(`Only a draft can be issued; this invoice is ${row.status}.`, 'invalid_transition');
      const at = ctx.now();
      const number = await db.transaction(async (trx) => {
        const n = await invoices.nextNumber(trx, user.clinicId, ctx.clock().getUTCFullYear());
        const patch = { status: 'issued' as const, number: n, issued_at: at, updated_at: at, issue_key: key ?? null };
        if (!(await invoices.transition(trx, id, ['draft'], patch))) return null;
        return n;
      });
      // Issued meanwhile: by this same act sent twice at once (its answer), or by another (409).
      if (number === null) return ctx.sameActOr(user, id, 'issue', key, changedMeanwhile());
      await mail.invoiceIssued(row, number);
      return ctx.reload(user, id, 'invoice:read');
    },

    async cancel(user, id, key) {
      const row = await ctx.loadRow(user, id, 'invoice:cancel');
      if (doneWithKey(row, 'cancel', key)) return ctx.reload(user, id, 'invoice:read');
      const at = ctx.now();
      const patch = { status: 'cancelled' as const, cancelled_at: at, updated_at: at, cancel_key: key ?? null };
      if (!(await invoices.transition(db, row.id, ['draft', 'issued'], patch))) {
        return ctx.sameActOr(
          user,
          id,
          'cancel',
          key,
          new ConflictError(
            `Only a draft or issued invoice can be cancelled; this one is ${row.status}${row.status === 'paid' ? ' (refund it instead)' : ''}.`,
            'invalid_transition',
          ),
        );
      }
      return ctx.reload(user, id, 'invoice:read');
    },

    async receipt(user, id) {
      const d = await ctx.reload(user, id, 'invoice:read-receipt');
      if (d.status !== 'paid' && d.status !== 'refunded')
        throw new ConflictError('A receipt exists once the invoice is paid.', 'receipt_not_available');
      const { logo } = await ctx.brands.forDocuments(user.clinicId);
      return { pdf: await renderReceipt(d, logo), filename: `receipt-${d.number}.pdf` };
    },
  };
}
