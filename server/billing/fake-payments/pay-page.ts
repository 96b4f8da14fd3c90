/** HTML of the fake payment page: our own plain look, three buttons, no script. */

const esc = (s: string) => s.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);

const STYLE = `body{font:16px/1.5 system-ui,sans-serif;margin:0;padding:0 12px;background:#eef2f0;color:#1d2b26}
main{max-width:26rem;margin:10vh auto;background:#fff;border:1px solid #c9d4cf;border-radius:8px;padding:1.5rem}
h1{font-size:1.25rem;margin:0 0 .25rem}.amount{font-size:2rem;font-weight:600;margin:.5rem 0 1rem}
.note{color:#56645e;font-size:.875rem}form{display:inline}button{font:inherit;padding:.5rem 1.25rem;margin:.25rem .5rem .25rem 0;border-radius:6px;border:1px solid #1f5a4a;cursor:pointer;min-height:44px;min-width:44px}
.pay{background:#1f5a4a;color:#fff}.other{background:#fff;color:#1f5a4a}`;

function page(title: string, body: string): string {
  return `<!doctype html><html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width,initial-scale=1"><link rel="icon" href="data:,"><title>${esc(title)}</title><style>${STYLE}</style></head><body><main>${body}</main></body></html>`;
}

/** The page for an open session. */
export function payPage(s: { id: string; amount_total: number; currency: string; description: string }): string {
  const amount = `${(s.amount_total / 100).toFixed(2)} ${s.currency.toUpperCase()}`;
  const action = (a: string) => `/pay/${encodeURIComponent(s.id)}/${a}`;
  return page(
    'Payment page (test)',
    `<p class="note">Test payment page — no real money moves.</p>
<h1 dir="auto">${esc(s.description)}</h1>
<p class="amount" data-testid="amount">${esc(amount)}</p>
<form method="post" action="${action('pay')}"><button class="pay" type="submit">Pay</button></form>
<form method="post" action="${action('cancel')}"><button class="other" type="submit">Cancel</button></form>
<form method="post" action="${action('decline')}"><button class="other" type="submit">Decline (test a failed payment)</button></form>`,
  );
}

/** A page after the session is used up, or for an unknown one. */
export function donePage(title: string, text: string): string {
  return page(title, `<h1>${esc(title)}</h1><p>${esc(text)}</p>`);
}
