import type { Logger } from 'pino';
import type { SessionUser } from '../../src/contracts/api';
import type { Currency, InvoiceDetail, ManualPaymentWrite } from '../../src/contracts/billing';
import type { Config } from '../config';
import type { Db } from '../db/knex';
import { AppError, NotFoundError } from '../errors';
import type { ClinicBrands } from '../clinic/clinic-brand';
import type { Mailer } from '../mail/mailer';
import type { Action } from '../policy/access-table';
import { assertAllowed, assertRole, listGrant } from '../policy/enforce';
import { invoicesRepository as invoices, toDetail, type InvoiceRow, type InvoiceScope } from './invoices-repository';
import type { Payments } from './payments';
import { doneWithKey, type InvoiceAct } from './invoice-act-keys';

export interface BillingDeps {
  db: Db;
  mailer: Mailer;
  config: Pick<Config, 'publicUrl'>;
  logger: Logger;
  clock: () => Date;
  /** null when card payment is not configured. */
  payments: Payments | null;
  /** The clinic's logo and legal details for receipts and e-mails. */
  brands: ClinicBrands;
}

/** What the billing services share: the clinic's currency, invoices as this user may reach them, the provider. */
export interface BillingContext extends BillingDeps {
  now(): string;
  clinicOf(clinicId: number): Promise<{ name: string; currency: Currency }>;
  /** The invoices a list shows this user (`invoice:list`: the owner the clinic's, an athlete their own but drafts). */
  listScope(user: SessionUser): InvoiceScope;
  /** The invoice this user may reach for `action`; 404 for another clinic's, another athlete's or (athletes) a draft. */
  loadRow(user: SessionUser, id: number, action: Action): Promise<InvoiceRow>;
  detail(row: InvoiceRow): Promise<InvoiceDetail>;
  /** The invoice as the API shows it, reached for `action`. */
  reload(user: SessionUser, id: number, action: Action): Promise<InvoiceDetail>;
  /**
   * After an act found the invoice moved on meanwhile: the invoice when it was this same act with
   * this key (sent twice at once), otherwise `refusal` is thrown.
   */
  sameActOr(
    user: SessionUser,
    id: number,
    act: InvoiceAct,
    key: string | undefined,
    refusal: Error,
    payment?: ManualPaymentWrite,
  ): Promise<InvoiceDetail>;
  /** The provider, or 503 `payments_unavailable`. */
  needPayments(): Payments;
  /** Runs a provider call; its failures become a 502 the page can show. */
  provider<T>(what: string, call: () => Promise<T>): Promise<T>;
  /** The athlete's portal page of an invoice. */
  portalLink(invoiceId: number): string;
}

export function billingContext(deps: BillingDeps): BillingContext {
  const { db, logger, clock, payments, config } = deps;

  async function clinicOf(clinicId: number): Promise<{ name: string; currency: Currency }> {
    return db('clinics').where({ id: clinicId }).first('name', 'currency');
  }

  async function loadRow(user: SessionUser, id: number, action: Action): Promise<InvoiceRow> {
    assertRole(user, action);
    const row = await invoices.find(db, { clinicId: user.clinicId }, id);
    if (!row) throw new NotFoundError('Invoice');
    assertAllowed(user, action, { clinicId: row.clinic_id, athleteUserId: row.athlete_user_id, draft: row.status === 'draft' }, 'Invoice');
    return row;
  }

  async function detail(row: InvoiceRow): Promise<InvoiceDetail> {
    const clinic = await clinicOf(row.clinic_id);
    const brand = await deps.brands.forApi(row.clinic_id);
    return toDetail(row, await invoices.lines(db, row.id), clinic.name, brand.legal, brand.logoUrl);
  }

  return {
    ...deps,
    now: () => clock().toISOString(),
    clinicOf,
    listScope(user) {
      const grant = listGrant(user, 'invoice:list');
      return {
        clinicId: user.clinicId,
        ...(grant.scope === 'self' ? { athleteUserId: user.id } : {}),
        withoutDrafts: grant.when.includes('not-draft'),
      };
    },
    loadRow,
    detail,
    reload: async (user, id, action) => detail(await loadRow(user, id, action)),
    async sameActOr(user, id, act, key, refusal, payment) {
      const row = await loadRow(user, id, 'invoice:read');
      if (doneWithKey(row, act, key, payment)) return detail(row);
      throw refusal;
    },
    needPayments() {
      if (!payments) throw new AppError(503, 'payments_unavailable', 'Card payment is not set up for this clinic yet.');
      return payments;
    },
    async provider(what, call) {
      try {
        return await call();
      } catch (err) {
        logger.warn({ err: (err as Error).message }, `payment provider: ${what} failed`);
        throw new AppError(
          502,
          'payment_provider_error',
          `The payment service refused or did not answer (${what}). Try again in a minute.`,
        );
      }
    },
    portalLink: (invoiceId) => `${config.publicUrl}/portal/invoices/${invoiceId}`,
  };
}
