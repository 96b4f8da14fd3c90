import type { Knex } from 'knex';
import { lockedForUpdate } from '../db/dialect';
import type { AssessmentKind } from '../../src/contracts/assessment';
import type {
  CheckoutState,
  ClinicLegalDetails,
  InvoiceDetail,
  InvoiceLine,
  InvoiceQuery,
  InvoiceStatus,
  InvoiceSummary,
  PaymentMethod,
} from '../../src/contracts/billing';

/** An `invoices` row joined with the athlete's name. */
export interface InvoiceRow {
  id: number;
  clinic_id: number;
  /** The `Idempotency-Key` the invoice was made with (unique per clinic), or null. */
  create_key?: string | null;
  /** The `Idempotency-Key` of the act that issued, marked paid, cancelled or refunded it (see invoice-act-keys). */
  issue_key?: string | null;
  payment_key?: string | null;
  cancel_key?: string | null;
  refund_key?: string | null;
  athlete_id: number;
  assessment_id: number | null;
  number: string | null;
  status: InvoiceStatus;
  currency: string;
  subtotal_minor: number;
  tax_minor: number;
  total_minor: number;
  due_date: string;
  note: string | null;
  checkout_session_id: string | null;
  checkout_state: CheckoutState;
  payment_intent_id: string | null;
  refund_id: string | null;
  created_by: number | null;
  issued_at: string | null;
  paid_at: string | null;
  cancelled_at: string | null;
  refunded_at: string | null;
  payment_method: PaymentMethod | null;
  paid_on: string | null;
  payment_note: string | null;
  refund_note: string | null;
  payment_recorded_by: number | null;
  created_at: string;
  updated_at: string;
  /** From the join. */
  first_name: string;
  last_name: string;
  athlete_email: string | null;
  athlete_user_id: number | null;
  /** From the join with the billed assessment (null without one). */
  assessment_kind: AssessmentKind | null;
  assessment_date: string | null;
}

export interface InvoiceLineRow {
  id: number;
  invoice_id: number;
  position: number;
  price_id: number | null;
  description: string;
  quantity: number;
  unit_amount_minor: number;
  tax_rate_bp: number | null;
  net_minor: number;
  tax_minor: number;
  total_minor: number;
}

/** Which invoices a query reads (from the policy's `invoice:list` grant): a clinic's, or one athlete user's. */
export interface InvoiceScope {
  clinicId: number;
  /** Only invoices of the athlete record linked to this user. */
  athleteUserId?: number;
  /** Leave drafts out. */
  withoutDrafts?: boolean;
}

export const toSummary = (r: InvoiceRow): InvoiceSummary => ({
  id: r.id,
  number: r.number,
  status: r.status,
  athleteId: r.athlete_id,
  athleteName: `${r.first_name} ${r.last_name}`,
  currency: r.currency,
  totalMinor: r.total_minor,
  dueDate: r.due_date,
  issuedAt: r.issued_at,
  paidAt: r.paid_at,
  createdAt: r.created_at,
});

export const toLine = (l: InvoiceLineRow): InvoiceLine => ({
  id: l.id,
  priceId: l.price_id,
  description: l.description,
  quantity: l.quantity,
  unitAmountMinor: l.unit_amount_minor,
  taxRateBp: l.tax_rate_bp,
  netMinor: l.net_minor,
  taxMinor: l.tax_minor,
  totalMinor: l.total_minor,
});

export const toDetail = (
  r: InvoiceRow,
  lines: InvoiceLineRow[],
  clinicName: string,
  clinicLegal: ClinicLegalDetails,
  clinicLogoUrl: string | null = null,
): InvoiceDetail => ({
  ...toSummary(r),
  assessmentId: r.assessment_id,
  assessment:
    r.assessment_id !== null && r.assessment_kind && r.assessment_date
      ? { id: r.assessment_id, kind: r.assessment_kind, date: r.assessment_date }
      : null,
  note: r.note,
  clinicName,
  subtotalMinor: r.subtotal_minor,
  taxMinor: r.tax_minor,
  lines: lines.map(toLine),
  cancelledAt: r.cancelled_at,
  refundedAt: r.refunded_at,
  checkoutState: r.checkout_state,
  paymentMethod: r.payment_method,
  paidOn: r.paid_on,
  paymentNote: r.payment_note,
  refundNote: r.refund_note,
  clinicLegal,
  clinicLogoUrl,
});

/** Columns of an {@link InvoiceRow}: the invoice, its athlete's name and contact, the billed assessment. */
const COLUMNS = [
  'i.*',
  'a.first_name',
  'a.last_name',
  'a.email as athlete_email',
  'a.user_id as athlete_user_id',
  's.kind as assessment_kind',
  's.date as assessment_date',
];

function joined(db: Knex) {
  return db('invoices as i').join('athletes as a', 'a.id', 'i.athlete_id').leftJoin('assessments as s', 's.id', 'i.assessment_id');
}

function base(db: Knex, scope: InvoiceScope) {
  const q = joined(db).where('i.clinic_id', scope.clinicId).select(COLUMNS);
  if (scope.athleteUserId !== undefined) q.andWhere('a.user_id', scope.athleteUserId);
  if (scope.withoutDrafts) q.andWhereNot('i.status', 'draft');
  return q;
}

/** Knex access to invoices and their lines; reads are scoped by {@link InvoiceScope}. */
export const invoicesRepository = {
  list(db: Knex, scope: InvoiceScope, query: InvoiceQuery): Promise<InvoiceRow[]> {
    const q = base(db, scope);
    if (query.status) q.andWhere('i.status', query.status);
    if (query.athleteId) q.andWhere('i.athlete_id', query.athleteId);
    if (query.from) q.andWhere('i.created_at', '>=', query.from);
    if (query.to) q.andWhere('i.created_at', '<', `${query.to}T99`);
    return q.orderBy('i.id', 'desc');
  },
  find(db: Knex, scope: InvoiceScope, id: number): Promise<InvoiceRow | undefined> {
    return base(db, scope).andWhere('i.id', id).first();
  },
  /** Unscoped, for webhook events (the provider's signature is the authority there). */
  findById(db: Knex, id: number): Promise<InvoiceRow | undefined> {
    return joined(db).where('i.id', id).first(COLUMNS);
  },
  /** The invoice paid by card with this provider payment id. */
  findByPayment(db: Knex, paymentId: string): Promise<{ id: number } | undefined> {
    return db('invoices').where({ payment_intent_id: paymentId }).first('id');
  },
  lines(db: Knex, invoiceId: number): Promise<InvoiceLineRow[]> {
    return db<InvoiceLineRow>('invoice_lines').where({ invoice_id: invoiceId }).orderBy('position');
  },
  async insert(
    trx: Knex,
    row: Omit<InvoiceRow, 'id' | 'first_name' | 'last_name' | 'athlete_email' | 'athlete_user_id' | 'assessment_kind' | 'assessment_date'>,
    lines: Omit<InvoiceLineRow, 'id' | 'invoice_id'>[],
  ): Promise<number> {
    const [r] = await trx('invoices').insert(row).returning('id');
    const id = (r as { id: number }).id;
    await trx('invoice_lines').insert(lines.map((l) => ({ ...l, invoice_id: id })));
    return id;
  },
  /**
   * Updates only when the invoice is still in one of `from` (the guard of a status transition);
   * answers whether a row changed.
   */
  async transition(db: Knex, id: number, from: InvoiceStatus[], patch: Partial<InvoiceRow>): Promise<boolean> {
    const n = await db('invoices').where({ id }).whereIn('status', from).update(patch);
    return n > 0;
  },
  /**
   * Replaces a draft's fields and all its lines, only while it is still a draft; answers whether
   * it was (run inside a transaction).
   */
  async replaceDraft(
    trx: Knex,
    id: number,
    patch: Partial<InvoiceRow>,
    lines: Omit<InvoiceLineRow, 'id' | 'invoice_id'>[],
  ): Promise<boolean> {
    const n = await trx('invoices').where({ id, status: 'draft' }).update(patch);
    if (n === 0) return false;
    await trx('invoice_lines').where({ invoice_id: id }).delete();
    await trx('invoice_lines').insert(lines.map((l) => ({ ...l, invoice_id: id })));
    return true;
  },
  /** Deletes a draft with its lines; answers whether it was still a draft. */
  async deleteDraft(trx: Knex, id: number): Promise<boolean> {
    const draft = await trx('invoices').where({ id, status: 'draft' }).first('id');
    if (!draft) return false;
    await trx('invoice_lines').where({ invoice_id: id }).delete();
    await trx('invoices').where({ id, status: 'draft' }).delete();
    return true;
  },
  async update(db: Knex, id: number, patch: Partial<InvoiceRow>): Promise<void> {
    await db('invoices').where({ id }).update(patch);
  },
  /**
   * The next number of the clinic for the year: TF-2026-0001, TF-2026-0002, … TF-2026-9999,
   * TF-2026-10000 (the highest is the longest, then the greatest: as text "9999" sorts after
   * "10000"). Locks the clinic's row first on PostgreSQL, so concurrent issues wait for each other
   * instead of reading the same highest number.
   */
  async nextNumber(trx: Knex, clinicId: number, year: number): Promise<string> {
    const prefix = `TF-${year}-`;
    await lockedForUpdate(trx, trx('clinics').where({ id: clinicId }).select('id'));
    const row = await trx('invoices')
      .where({ clinic_id: clinicId })
      .andWhere('number', 'like', `${prefix}%`)
      .orderByRaw('length(number) desc, number desc')
      .first<{ number: string } | undefined>('number');
    const last = row ? Number(row.number.slice(prefix.length)) : 0;
    return `${prefix}${String(last + 1).padStart(4, '0')}`;
  },
  /** Records a webhook event id; false when it was already there (handled before). */
  async recordEvent(trx: Knex, id: string, type: string, invoiceId: number | null, at: string): Promise<boolean> {
    const rows = await trx('payment_events')
      .insert({ id, type, invoice_id: invoiceId, received_at: at })
      .onConflict('id')
      .ignore()
      .returning('id');
    return rows.length > 0;
  },
};
