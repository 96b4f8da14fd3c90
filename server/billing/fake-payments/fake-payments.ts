import crypto from 'node:crypto';
import type { Server } from 'node:http';
import express, { type Response } from 'express';
import { createRequire } from 'node:module';
import type Stripe from 'stripe';
import { payPage, donePage } from './pay-page';

/**
 * A local stand-in for the payment provider, for demo mode and tests. It answers the few API calls
 * Trailframe makes through the provider's SDK (checkout session create/retrieve, refund create and
 * retrieve, charge retrieve),
 * serves a plain payment page at `/pay/:sessionId` with Pay / Decline / Cancel, and posts signed
 * webhook events (`checkout.session.completed`, `checkout.session.async_payment_failed`,
 * `charge.refunded`) back to the app. State lives in memory; nothing is charged.
 */
export interface FakePayments {
  port: number;
  /** Base URL, e.g. `http://127.0.0.1:12111`. */
  url: string;
  /** Where webhook events go (set once the app listens). */
  setWebhookUrl(url: string): void;
  /** Every event sent (newest last). */
  readonly events: FakeEvent[];
  /** Delivers an already-sent event again, as the provider does on retries. */
  redeliver(eventId: string): Promise<number>;
  /** Resolves when no webhook delivery is in flight. */
  idle(): Promise<void>;
  close(): Promise<void>;
}

export interface FakePaymentsOptions {
  port: number;
  /** The API key the SDK must send (Bearer). */
  secretKey: string;
  /** Shared secret for the webhook signature. */
  webhookSecret: string;
  webhookUrl?: string;
}

export interface FakeEvent {
  id: string;
  type: string;
  payload: string;
}

/** A checkout-session request as its form body decodes: every leaf a string, any of them missing. */
interface CheckoutBody {
  line_items?: { quantity?: string; price_data?: { unit_amount?: string; currency?: string; product_data?: { name?: string } } }[];
  success_url?: string;
  cancel_url?: string;
  customer_email?: string;
  client_reference_id?: string;
  metadata?: Record<string, string>;
}

interface Session {
  id: string;
  object: 'checkout.session';
  mode: 'payment';
  status: 'open' | 'complete' | 'expired';
  payment_status: 'unpaid' | 'paid';
  amount_total: number;
  currency: string;
  customer_email: string | null;
  client_reference_id: string | null;
  metadata: Record<string, string>;
  payment_intent: string | null;
  success_url: string;
  cancel_url: string;
  url: string | null;
  created: number;
  livemode: false;
  description: string;
  refunded: boolean;
}

/** Payment references the demo seed invents for its paid invoice (`pi_demo_…`). */
export const DEMO_PAYMENT_PREFIX = 'pi_demo_';

const rid = (prefix: string) => `${prefix}_fake_${crypto.randomBytes(12).toString('hex')}`;
const now = () => Math.floor(Date.now() / 1000);

/** Starts the fake payment service on 127.0.0.1 (`port` 0 = any free port). */
export async function startFakePayments(options: FakePaymentsOptions): Promise<FakePayments> {
  // The SDK only signs webhooks here: loaded at the first one, so an idle demo server does not hold it.
  let signerSdk: Stripe | undefined;
  const signer = (): Stripe => (signerSdk ??= new (createRequire(import.meta.url)('stripe') as typeof Stripe)('sk_fake_signer'));
  const sessions = new Map<string, Session>();
  /** Charges and refunds the fake has made (what a refund event is confirmed against). */
  const charges = new Map<string, object>();
  const refunds = new Map<string, object>();
  const idempotent = new Map<string, { status: number; body: unknown }>();
  const events: FakeEvent[] = [];
  const inFlight = new Set<Promise<unknown>>();
  let webhookUrl = options.webhookUrl ?? null;
  let base = '';

  const app = express();
  app.disable('x-powered-by');
  app.use(express.urlencoded({ extended: true, limit: '100kb' }));

  const apiError = (res: Response, status: number, message: string, code?: string) =>
    res.status(status).json({ error: { type: 'invalid_request_error', message, ...(code ? { code } : {}) } });

  // ── API (what the SDK calls) ──
  app.use('/v1', (req, res, next) => {
    if (req.headers.authorization !== `Bearer ${options.secretKey}`) return void apiError(res, 401, 'Invalid API key provided.');
    const key = req.method === 'POST' ? req.header('idempotency-key') : undefined;
    if (key) {
      const seen = idempotent.get(key);
      if (seen) return void res.status(seen.status).json(seen.body);
      const json = res.json.bind(res);
      res.json = (body: unknown) => {
        idempotent.set(key, { status: res.statusCode, body });
        return json(body);
      };
    }
    next();
  });

  app.post('/v1/checkout/sessions', (req, res) => {
    const b = req.body as CheckoutBody;
    const item = b['line_items']?.[0];
    const amount = Number(item?.price_data?.unit_amount) * Number(item?.quantity ?? 1);
    const currency = String(item?.price_data?.currency ?? '');
    if (!Number.isSafeInteger(amount) || amount <= 0) return void apiError(res, 400, 'Invalid amount.', 'parameter_invalid_integer');
    if (!/^[a-z]{3}$/.test(currency)) return void apiError(res, 400, 'Invalid currency.');
    if (!b['success_url'] || !b['cancel_url']) return void apiError(res, 400, 'Missing success_url or cancel_url.');
    const id = rid('cs');
    const session: Session = {
      id,
      object: 'checkout.session',
      mode: 'payment',
      status: 'open',
      payment_status: 'unpaid',
      amount_total: amount,
      currency,
      customer_email: b['customer_email'] ?? null,
      client_reference_id: b['client_reference_id'] ?? null,
      metadata: b['metadata'] ?? {},
      payment_intent: null,
      success_url: String(b['success_url']).replace('{CHECKOUT_SESSION_ID}', id),
      cancel_url: String(b['cancel_url']).replace('{CHECKOUT_SESSION_ID}', id),
      url: `${base}/pay/${id}`,
      created: now(),
      livemode: false,
      description: String(item?.price_data?.product_data?.name ?? 'Payment'),
      refunded: false,
    };
    sessions.set(id, session);
    res.json(publicSession(session));
  });

  app.get('/v1/checkout/sessions/:id', (req, res) => {
    const s = sessions.get(String(req.params['id']));
    if (!s) return void apiError(res, 404, `No such checkout.session: '${req.params['id']}'`, 'resource_missing');
    res.json(publicSession(s));
  });

  app.post('/v1/refunds', (req, res) => {
    const pi = String((req.body as Record<string, unknown>)['payment_intent'] ?? '');
    const s = [...sessions.values()].find((x) => x.payment_intent === pi);
    if (!s && pi.startsWith(DEMO_PAYMENT_PREFIX)) {
      // A payment the demo seed records as already made (never through this fake): refundable, so
      // the demo owner can try a refund on the seeded paid invoice too. Its amount is unknown here.
      const made = refundMade(pi, 0, 'eur', {});
      res.json(made.refund);
      return void send('charge.refunded', made.charge);
    }
    if (!s) return void apiError(res, 404, `No such payment_intent: '${pi}'`, 'resource_missing');
    if (s.refunded) return void apiError(res, 400, 'This payment has already been refunded.', 'charge_already_refunded');
    s.refunded = true;
    const made = refundMade(pi, s.amount_total, s.currency, s.metadata);
    res.json(made.refund);
    send('charge.refunded', made.charge);
  });

  app.get('/v1/charges/:id', (req, res) => {
    const c = charges.get(String(req.params['id']));
    if (!c) return void apiError(res, 404, `No such charge: '${req.params['id']}'`, 'resource_missing');
    res.json(c);
  });

  app.get('/v1/refunds/:id', (req, res) => {
    const r = refunds.get(String(req.params['id']));
    if (!r) return void apiError(res, 404, `No such refund: '${req.params['id']}'`, 'resource_missing');
    res.json(r);
  });

  /** Records a full refund of a payment: its charge and the refund (the caller answers, then sends the event). */
  function refundMade(pi: string, amount: number, currency: string, metadata: Record<string, string>) {
    const charge = {
      id: rid('ch'),
      object: 'charge',
      amount,
      amount_refunded: amount,
      currency,
      payment_intent: pi,
      refunded: true,
      status: 'succeeded',
      metadata,
    };
    const refund = {
      id: rid('re'),
      object: 'refund',
      status: 'succeeded',
      amount,
      currency,
      payment_intent: pi,
      charge: charge.id,
      created: now(),
      metadata: {},
    };
    charges.set(charge.id, charge);
    refunds.set(refund.id, refund);
    return { charge, refund };
  }

  // ── The payment page (what the payer's browser sees) ──
  app.get('/pay/:id', (req, res) => {
    const s = sessions.get(String(req.params['id']));
    if (!s) return void res.status(404).type('html').send(donePage('Payment page not found', 'This payment link is not known.'));
    if (s.status !== 'open') return void res.type('html').send(donePage('Already finished', 'This payment page was already used.'));
    res.type('html').send(payPage(s));
  });
  app.post('/pay/:id/:action', (req, res) => {
    const s = sessions.get(String(req.params['id']));
    if (!s || s.status !== 'open')
      return void res.status(409).type('html').send(donePage('Already finished', 'This payment page was already used.'));
    switch (req.params['action']) {
      case 'pay':
        s.status = 'complete';
        s.payment_status = 'paid';
        s.payment_intent = rid('pi');
        s.url = null;
        send('checkout.session.completed', publicSession(s));
        return void res.redirect(303, s.success_url);
      case 'decline':
        // An async failure: the page returns to success_url and the event says it failed.
        send('checkout.session.async_payment_failed', publicSession(s));
        return void res.redirect(303, s.success_url);
      case 'cancel':
        return void res.redirect(303, s.cancel_url);
      default:
        return void res.status(404).type('html').send(donePage('Unknown action', 'Go back and choose Pay or Cancel.'));
    }
  });

  function publicSession(s: Session) {
    const { description: _d, refunded: _r, ...rest } = s;
    return rest;
  }

  function send(type: string, object: unknown): void {
    const event = {
      id: rid('evt'),
      object: 'event',
      api_version: null,
      created: now(),
      type,
      livemode: false,
      pending_webhooks: 1,
      request: { id: null, idempotency_key: null },
      data: { object },
    };
    const payload = JSON.stringify(event);
    events.push({ id: event.id, type, payload });
    track(deliver(payload, [0, 300, 1500]));
  }

  function track(p: Promise<unknown>): void {
    inFlight.add(p);
    void p.finally(() => inFlight.delete(p));
  }

  /** Posts a signed event; retries on network errors and 5xx, as a provider would. */
  async function deliver(payload: string, delays: number[]): Promise<number> {
    let status = 0;
    for (const delay of delays) {
      if (delay) await new Promise((r) => setTimeout(r, delay));
      if (!webhookUrl) return 0;
      const signature = signer().webhooks.generateTestHeaderString({ payload, secret: options.webhookSecret });
      try {
        const res = await fetch(webhookUrl, {
          method: 'POST',
          headers: { 'content-type': 'application/json', 'stripe-signature': signature },
          body: payload,
        });
        status = res.status;
        await res.arrayBuffer();
        if (res.status < 500) return status;
      } catch {
        status = 0;
      }
    }
    return status;
  }

  const server: Server = await new Promise((resolve, reject) => {
    const s = app.listen(options.port, '127.0.0.1', (err?: Error) => (err ? reject(err) : resolve(s)));
  });
  const address = server.address();
  const port = typeof address === 'object' && address ? address.port : options.port;
  base = `http://127.0.0.1:${port}`;
  return {
    port,
    url: base,
    events,
    setWebhookUrl(url) {
      webhookUrl = url;
    },
    async redeliver(eventId) {
      const e = events.find((x) => x.id === eventId);
      if (!e) throw new Error(`no event ${eventId}`);
      return deliver(e.payload, [0]);
    },
    async idle() {
      while (inFlight.size) await Promise.allSettled([...inFlight]);
    },
    close: () =>
      new Promise<void>((resolve) => {
        server.close(() => resolve());
        server.closeAllConnections();
      }),
  };
}
