import { billingContext, type BillingDeps } from './billing-context';
import { billingMail } from './billing-mail';
import { invoicePaymentsService, type InvoicePaymentsService } from './invoice-payments-service';
import { invoicesService, type InvoicesService } from './invoices-service';
import { paymentWebhook, type PaymentWebhook } from './payment-webhook';
import { priceListService, type PriceListService } from './price-list-service';

export type { BillingDeps };

/**
 * Price list, invoices and payment. Owners manage; athletes see and pay their own issued invoices
 * by card, and the provider's signed webhook is the only thing that marks a card payment paid; the
 * owner records a bank transfer or cash by hand (and its refund, without the provider). Each
 * concern lives in its own file; who may do what is the policy's (`server/policy/access-table.ts`).
 */
export interface BillingService extends PriceListService, InvoicesService, InvoicePaymentsService, PaymentWebhook {}

export function billingService(deps: BillingDeps): BillingService {
  const ctx = billingContext(deps);
  const mail = billingMail(ctx);
  return {
    ...priceListService(ctx),
    ...invoicesService(ctx, mail),
    ...invoicePaymentsService(ctx, mail),
    ...paymentWebhook(ctx, mail),
  };
}
