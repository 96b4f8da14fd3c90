import http from 'node:http';
import type { AddressInfo } from 'node:net';
import type { Db } from '../db/knex';
import type { MailboxRow } from '../db/rows';

/** A running demo inbox. */
export interface DemoInbox {
  port: number;
  /** e.g. `http://127.0.0.1:2580` */
  url: string;
  close(): Promise<void>;
}

const HOST = '127.0.0.1';

/**
 * The developer's view of what the demo's fake SMTP receiver caught: a tiny read-only web page
 * on 127.0.0.1 only, outside the app and its sign-in. Whoever can open it sits at the machine
 * running the demo, and sees every message of every clinic there — which is why it is never part
 * of the app, never reachable from another machine, and only started in demo mode with the fake
 * receiver. Requests naming any other host (a DNS-rebinding page) are refused.
 */
export async function startDemoInbox(db: Db, port: number): Promise<DemoInbox> {
  let actualPort = port;
  const server = http.createServer((req, res) => {
    void handle(db, req, res, actualPort).catch(() => {
      if (!res.headersSent) send(res, 500, page('Demo inbox', '<p>The inbox could not be read.</p>'));
      else res.end();
    });
  });
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(port, HOST, () => resolve());
  });
  actualPort = (server.address() as AddressInfo).port;
  return {
    port: actualPort,
    url: `http://${HOST}:${actualPort}`,
    close: () =>
      new Promise<void>((resolve) => {
        server.close(() => resolve());
        server.closeAllConnections();
      }),
  };
}

async function handle(db: Db, req: http.IncomingMessage, res: http.ServerResponse, port: number): Promise<void> {
  if (!isLoopbackHost(req.headers.host, port)) {
    return send(res, 421, page('Demo inbox', '<p>Open the demo inbox at its own address on this machine.</p>'));
  }
  if (req.method !== 'GET' && req.method !== 'HEAD') {
    res.setHeader('Allow', 'GET, HEAD');
    return send(res, 405, page('Demo inbox', '<p>The demo inbox is read-only.</p>'));
  }
  const path = (req.url ?? '/').split('?')[0];
  if (path === '/') {
    const rows = await db<MailboxRow>('mailbox_messages').orderBy('id', 'desc').limit(200);
    return send(res, 200, page('Demo inbox', listHtml(rows)));
  }
  const m = /^\/messages\/([1-9]\d{0,9})$/.exec(path ?? '');
  const row = m
    ? await db<MailboxRow>('mailbox_messages')
        .where({ id: Number(m[1]) })
        .first()
    : undefined;
  if (!row) return send(res, 404, page('Not found', '<p>No such message. <a href="/">Back to the inbox</a></p>'));
  return send(res, 200, page(row.subject, messageHtml(row)));
}

/** Whether the Host header names this listener on the loopback address (not a rebound domain). */
export function isLoopbackHost(host: string | undefined, port: number): boolean {
  return host === `${HOST}:${port}` || host === `localhost:${port}`;
}

function send(res: http.ServerResponse, status: number, html: string): void {
  res.writeHead(status, {
    'Content-Type': 'text/html; charset=utf-8',
    'Cache-Control': 'no-store',
    'Content-Security-Policy': "default-src 'none'; style-src 'unsafe-inline'; base-uri 'none'; form-action 'none'; frame-ancestors 'none'",
    'Referrer-Policy': 'no-referrer',
    'X-Content-Type-Options': 'nosniff',
    'X-Frame-Options': 'DENY',
  });
  res.end(html);
}

const escapeHtml = (s: string) => s.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);

/** Escaped text with its http(s) links clickable. */
export function linkifyEscaped(text: string): string {
  return text
    .split(/(https?:\/\/[^\s<>"']+)/)
    .map((part, i) => (i % 2 ? `<a href="${escapeHtml(part)}">${escapeHtml(part)}</a>` : escapeHtml(part)))
    .join('');
}

function listHtml(rows: MailboxRow[]): string {
  if (!rows.length) return '<p class="muted">No e-mail yet. Invitations and password-reset links sent by the demo appear here.</p>';
  const items = rows
    .map(
      (r) =>
        `<li><a href="/messages/${r.id}"><strong>${escapeHtml(r.subject)}</strong></a><span>To ${escapeHtml(r.to_address)} · ${escapeHtml(r.received_at.replace('T', ' ').slice(0, 16))} UTC</span></li>`,
    )
    .join('');
  return `<ul class="list">${items}</ul>`;
}

function messageHtml(r: MailboxRow): string {
  return `<p><a href="/">← All messages</a></p>
<h2>${escapeHtml(r.subject)}</h2>
<dl><dt>To</dt><dd>${escapeHtml(r.to_address)}</dd><dt>From</dt><dd>${escapeHtml(r.from_address)}</dd><dt>Received</dt><dd>${escapeHtml(r.received_at)}</dd></dl>
<pre>${linkifyEscaped(r.text)}</pre>`;
}

function page(title: string, body: string): string {
  return `<!doctype html>
<html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1">
<title>${escapeHtml(title)} · Trailframe demo inbox</title>
<style>
body{font:16px/1.5 system-ui,sans-serif;margin:0 auto;max-width:760px;padding:16px;color:#1d2b26}
header{border-bottom:1px solid #c8d3cf;margin-bottom:16px}
.note{background:#eef3f1;border-radius:8px;padding:8px 12px;font-size:14px}
.list{list-style:none;padding:0}.list li{padding:10px 0;border-bottom:1px solid #e3e9e6;display:flex;flex-direction:column}
.list span,.muted{color:#52605b;font-size:14px}
pre{white-space:pre-wrap;word-break:break-word;background:#f6f8f7;padding:12px;border-radius:8px}
dl{display:grid;grid-template-columns:auto 1fr;gap:2px 12px}dt{color:#52605b}dd{margin:0}
a{color:#1f5c4a}
</style></head>
<body><header><h1>Trailframe demo inbox</h1>
<p class="note">Demo mode only. Every e-mail the demo sent, for every clinic, caught on this machine; it is not part of the app and no account can open it.</p></header>
${body}
</body></html>`;
}
