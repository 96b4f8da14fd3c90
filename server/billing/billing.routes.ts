import express, { Router } from 'express';
import { currentUser } from '../http/access';
import { permit } from '../policy/enforce';
import { idParam as id, parse } from '../http/validate';
import {
  IdempotencyKey,
  InvoiceBody,
  InvoiceQueryParams,
  ManualPaymentBody,
  PriceBody,
  PricePatchBody,
  PriceQuery,
  RefundBody,
  SettingsBody,
} from './billing-schemas';
import type { BillingService } from './billing-service';
import type { InvoiceQuery } from '../../src/contracts/billing';
import { contentDisposition } from '../http/file-names';

/**
 * The provider's webhook: RAW body (the signature covers the exact bytes), no session, no CSRF.
 * Mount it before the JSON parser and CSRF protection.
 */
export function billingWebhookRoutes(billing: BillingService): Router {
  const router = Router();
  router.post('/billing/webhook', express.raw({ type: () => true, limit: '512kb' }), async (req, res) => {
    const body = Buffer.isBuffer(req.body) ? req.body : Buffer.alloc(0);
    const result = await billing.webhook(body, req.header('stripe-signature'));
    res.json({ received: true, duplicate: result.duplicate });
  });
  return router;
}

/** Price list, invoices, card and recorded payments, receipts. Thin: parse, call, answer. */
export function billingRoutes(billing: BillingService): Router {
  const router = Router();

  router.get('/billing/settings', permit('billing-settings:read'), async (req, res) => {
    res.json(await billing.settings(currentUser(req)));
  });
  router.put('/billing/settings', permit('billing-settings:update'), async (req, res) => {
    res.json(await billing.putSettings(currentUser(req), parse(SettingsBody, req.body)));
  });

  router.get('/prices', permit('price:list'), async (req, res) => {
    const q = parse(PriceQuery, req.query, 'Query');
    res.json({ prices: await billing.listPrices(currentUser(req), q.archived === 'true') });
  });
  router.post('/prices', permit('price:create'), async (req, res) => {
    const key = parse(IdempotencyKey, req.get('idempotency-key'), 'Header');
    res.status(201).json(await billing.createPrice(currentUser(req), parse(PriceBody, req.body), key));
  });
  router.patch('/prices/:id', permit('price:update'), async (req, res) => {
    const priceId = id(req.params, 'Price');
    res.json(await billing.updatePrice(currentUser(req), priceId, parse(PricePatchBody, req.body)));
  });
  router.delete('/prices/:id', permit('price:archive'), async (req, res) => {
    await billing.archivePrice(currentUser(req), id(req.params, 'Price'));
    res.status(204).end();
  });

  router.get('/invoices', permit('invoice:list'), async (req, res) => {
    const q = parse(InvoiceQueryParams, req.query, 'Query') as InvoiceQuery;
    res.json(await billing.list(currentUser(req), q));
  });
  router.post('/invoices', permit('invoice:create'), async (req, res) => {
    const key = parse(IdempotencyKey, req.get('idempotency-key'), 'Header');
    res.status(201).json(await billing.create(currentUser(req), parse(InvoiceBody, req.body), key));
  });
  router.get('/invoices/:id', permit('invoice:read'), async (req, res) => {
    res.json(await billing.get(currentUser(req), id(req.params, 'Invoice')));
  });
  router.put('/invoices/:id', permit('invoice:update'), async (req, res) => {
    const invoiceId = id(req.params, 'Invoice');
    res.json(await billing.update(currentUser(req), invoiceId, parse(InvoiceBody, req.body)));
  });
  router.delete('/invoices/:id', permit('invoice:delete'), async (req, res) => {
    await billing.remove(currentUser(req), id(req.params, 'Invoice'));
    res.status(204).end();
  });
  router.post('/invoices/:id/issue', permit('invoice:issue'), async (req, res) => {
    const invoiceId = id(req.params, 'Invoice');
    res.json(await billing.issue(currentUser(req), invoiceId, parse(IdempotencyKey, req.get('idempotency-key'), 'Header')));
  });
  router.post('/invoices/:id/cancel', permit('invoice:cancel'), async (req, res) => {
    const invoiceId = id(req.params, 'Invoice');
    res.json(await billing.cancel(currentUser(req), invoiceId, parse(IdempotencyKey, req.get('idempotency-key'), 'Header')));
  });
  router.post('/invoices/:id/payments', permit('invoice:record-payment'), async (req, res) => {
    const invoiceId = id(req.params, 'Invoice');
    const key = parse(IdempotencyKey, req.get('idempotency-key'), 'Header');
    res.json(await billing.recordPayment(currentUser(req), invoiceId, parse(ManualPaymentBody, req.body), key));
  });
  router.post('/invoices/:id/refund', permit('invoice:refund'), async (req, res) => {
    const invoiceId = id(req.params, 'Invoice');
    const key = parse(IdempotencyKey, req.get('idempotency-key'), 'Header');
    res.json(await billing.refund(currentUser(req), invoiceId, parse(RefundBody, req.body ?? {}).note, key));
  });
  router.post('/invoices/:id/checkout', permit('invoice:pay'), async (req, res) => {
    res.json(await billing.startCheckout(currentUser(req), id(req.params, 'Invoice')));
  });
  router.get('/invoices/:id/receipt', permit('invoice:read-receipt'), async (req, res) => {
    const { pdf, filename } = await billing.receipt(currentUser(req), id(req.params, 'Invoice'));
    res.setHeader('Content-Type', 'application/pdf');
    res.setHeader('Content-Disposition', contentDisposition(filename));
    res.setHeader('Cache-Control', 'private, no-store');
    res.send(pdf);
  });
  return router;
}
