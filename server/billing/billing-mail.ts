import { formatMinor, type PaymentMethod } from '../../src/contracts/billing';
import type { BillingContext } from './billing-context';
import type { InvoiceRow } from './invoices-repository';

/** "bank transfer", "cash", "card payment": how a receipt or e-mail says it. */
const METHOD_WORDS: Record<PaymentMethod, string> = { card: 'card payment', bank_transfer: 'bank transfer', cash: 'cash' };

/** The e-mails billing sends the athlete. A message that cannot be sent is logged; the change it tells of stands. */
export interface BillingMail {
  /** "Invoice TF-… from <clinic>": with a portal link, or how to get access without an account. */
  invoiceIssued(row: InvoiceRow, number: string): Promise<void>;
  /** A recorded bank transfer or cash payment arrived. */
  paymentRecorded(row: InvoiceRow, method: PaymentMethod): Promise<void>;
  /** The provider confirmed a card payment. */
  cardPaymentReceived(row: InvoiceRow): Promise<void>;
}

export function billingMail(ctx: BillingContext): BillingMail {
  async function send(row: InvoiceRow, subject: string, lines: string[]): Promise<void> {
    const to = row.athlete_email;
    if (!to) return;
    try {
      await ctx.mailer.send({ to, subject, text: lines.join('\n'), clinicId: row.clinic_id });
    } catch (err) {
      ctx.logger.warn({ err: (err as Error).message }, 'billing e-mail not sent');
    }
  }

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

  return {
    async invoiceIssued(row, number) {
      const clinic = await ctx.clinicOf(row.clinic_id);
      await send(row, `Invoice ${number} from ${clinic.name}`, [
        `Hello ${row.first_name},`,
        '',
        `${clinic.name} has sent you invoice ${number} for ${formatMinor(row.total_minor)} ${row.currency}, due ${row.due_date}.`,
        ...accessLines(row, clinic.name, ['See it and pay by card in your portal:', '', ctx.portalLink(row.id)]),
      ]);
    },

    async paymentRecorded(row, method) {
      const clinic = await ctx.clinicOf(row.clinic_id);
      await send(row, `Payment received for invoice ${row.number}`, [
        `Hello ${row.first_name},`,
        '',
        `${clinic.name} has received your payment of ${formatMinor(row.total_minor)} ${row.currency} for invoice ${row.number} by ${METHOD_WORDS[method]}. Thank you.`,
        ...(row.athlete_user_id !== null
          ? ['Your receipt is in your portal:', '', ctx.portalLink(row.id)]
          : [
              `Ask ${clinic.name} for your receipt if you need one. To see your invoices online, accept the invitation they send to this address, then sign in and open "My invoices".`,
            ]),
      ]);
    },

    async cardPaymentReceived(row) {
      const clinic = await ctx.clinicOf(row.clinic_id);
      await send(row, `Payment received for invoice ${row.number}`, [
        `Hello ${row.first_name},`,
        '',
        `${clinic.name} has received your payment of ${formatMinor(row.total_minor)} ${row.currency} for invoice ${row.number}. Thank you.`,
        'Your receipt is in your portal:',
        '',
        ctx.portalLink(row.id),
      ]);
    },
  };
}
