/**
 * Local fake of the payment service, for npm start and npm test (never production). It answers
 * the few API calls Platewright's SDK makes (create / retrieve a checkout session), shows a
 * simple "pay / decline" page at the session's URL, and sends webhook events signed the way the
 * real service signs them:
 *   Stripe-Signature: t=<unix seconds>,v1=<hex HMAC-SHA256(webhook secret, t + "." + raw body)>
 *
 * Environment:
 *   PAYMENTS_FAKE_PORT      port on 127.0.0.1 (default 12111)
 *   STRIPE_SECRET_KEY       the only API key it accepts (default: the app's local fake key)
 *   STRIPE_WEBHOOK_SECRET   signs the events (default: the app's local fake secret)
 *   PAYMENTS_FAKE_WEBHOOK_URL  where events go; default: the session's success_url origin +
 *                           /api/payments/webhook (so every app instance gets its own events)
 *   PAYMENTS_FAKE_PIDFILE   optional pid file, written once listening, removed on exit
 */
import { createHmac, randomBytes } from 'node:crypto';
import { createServer, type IncomingMessage, type ServerResponse } from 'node:http';
import { rmSync, writeFileSync } from 'node:fs';

const port = Number(process.env.PAYMENTS_FAKE_PORT ?? 12111);
const apiKey = process.env.STRIPE_SECRET_KEY || 'sk_test_platewright_local_fake_key';
const webhookSecret = process.env.STRIPE_WEBHOOK_SECRET || 'whsec_platewright_local_fake_secret';
const pidFile = process.env.PAYMENTS_FAKE_PIDFILE;
const base = `http://127.0.0.1:${port}`;

type Json = Record<string, unknown>;
interface Session extends Json {
  id: string;
  object: 'checkout.session';
  url: string | null;
  status: 'open' | 'complete' | 'expired';
  payment_status: 'unpaid' | 'paid';
  amount_total: number;
  amount_subtotal: number;
  currency: string;
  success_url: string;
  cancel_url: string;
  metadata: Record<string, string>;
  payment_intent: string | null;
  client_reference_id: string | null;
  customer_email: string | null;
  line_items_for_page: { name: string; description: string; quantity: number; unit_amount: number }[];
  intent_metadata: Record<string, string>;
  created: number;
  expires_at: number;
}

const sessions = new Map<string, Session>();
const byIdempotencyKey = new Map<string, { sessionId: string; body: string }>();
const delivered: { eventId: string; type: string; sessionId: string; status: number | string }[] = [];

const id = (prefix: string) => `${prefix}_fake_${randomBytes(12).toString('hex')}`;
const now = () => Math.floor(Date.now() / 1000);

/** Form body with bracket keys (a[b][0][c]=v), as the SDK sends it, into nested objects/arrays. */
function parseForm(body: string): Json {
  const out: Json = {};
  for (const [rawKey, value] of new URLSearchParams(body)) {
    const parts = rawKey.split(/\[|\]\[|\]/).filter((p) => p !== '');
    let cur: any = out;
    parts.forEach((p, i) => {
      const last = i === parts.length - 1;
      if (last) cur[p] = value;
      else {
        const nextIsIndex = /^\d+$/.test(parts[i + 1]!);
        cur[p] ??= nextIsIndex ? [] : {};
        cur = cur[p];
      }
    });
  }
  return out;
}

function send(res: ServerResponse, status: number, body: unknown, headers: Record<string, string> = {}) {
  const text = typeof body === 'string' ? body : JSON.stringify(body);
  res.writeHead(status, { 'content-type': typeof body === 'string' ? 'text/html; charset=utf-8' : 'application/json', ...headers });
  res.end(text);
}

const apiError = (res: ServerResponse, status: number, message: string, code?: string) =>
  send(res, status, { error: { type: status === 401 ? 'invalid_request_error' : 'invalid_request_error', message, ...(code ? { code } : {}) } }, { 'request-id': id('req') });

function readBody(req: IncomingMessage): Promise<string> {
  return new Promise((resolve, reject) => {
    let s = '';
    req.setEncoding('utf8');
    req.on('data', (c) => {
      s += c;
      if (s.length > 1_000_000) reject(new Error('body too large'));
    });
    req.on('end', () => resolve(s));
    req.on('error', reject);
  });
}

/** What the API returns: the session without the fake's page bookkeeping. */
function publicSession(s: Session): Json {
  const { line_items_for_page: _l, intent_metadata: _m, ...rest } = s;
  return { ...rest, mode: 'payment', livemode: false };
}

function createSession(form: Json): Session | string {
  const items = (form.line_items as Json[] | undefined) ?? [];
  if (form.mode !== 'payment') return 'mode must be "payment" (the only mode this fake knows)';
  if (!items.length) return 'line_items is required';
  if (typeof form.success_url !== 'string' || typeof form.cancel_url !== 'string') return 'success_url and cancel_url are required';
  let total = 0;
  let currency = '';
  const page: Session['line_items_for_page'] = [];
  for (const it of items) {
    const pd = it.price_data as Json | undefined;
    const unit = Number(pd?.unit_amount);
    const qty = Number(it.quantity ?? 1);
    if (!pd || !Number.isInteger(unit) || unit < 0 || !Number.isInteger(qty) || qty < 1) return 'each line item needs price_data.unit_amount (whole minor units) and a quantity';
    if (!/^[a-z]{3}$/.test(String(pd.currency))) return 'price_data.currency must be a three-letter lower-case code';
    if (currency && currency !== pd.currency) return 'all line items must share one currency';
    currency = String(pd.currency);
    total += unit * qty;
    const product = (pd.product_data as Json | undefined) ?? {};
    page.push({ name: String(product.name ?? 'item'), description: String(product.description ?? ''), quantity: qty, unit_amount: unit });
  }
  const sid = id('cs_test');
  const s: Session = {
    id: sid,
    object: 'checkout.session',
    url: `${base}/pay/${sid}`,
    status: 'open',
    payment_status: 'unpaid',
    amount_total: total,
    amount_subtotal: total,
    currency,
    success_url: form.success_url,
    cancel_url: form.cancel_url,
    metadata: (form.metadata as Record<string, string>) ?? {},
    payment_intent: null,
    client_reference_id: typeof form.client_reference_id === 'string' ? form.client_reference_id : null,
    customer_email: typeof form.customer_email === 'string' ? form.customer_email : null,
    line_items_for_page: page,
    intent_metadata: (((form.payment_intent_data as Json | undefined)?.metadata as Record<string, string>) ?? {}),
    created: now(),
    expires_at: now() + 24 * 3600,
  };
  sessions.set(sid, s);
  return s;
}

function webhookUrl(s: Session): string {
  return process.env.PAYMENTS_FAKE_WEBHOOK_URL || new URL('/api/payments/webhook', s.success_url).toString();
}

/** Sign and send one event; a few tries when the app does not answer 2xx. */
async function deliver(s: Session, type: string, object: Json): Promise<number | string> {
  const event = { id: id('evt'), object: 'event', api_version: '2026-10-28.endive', created: now(), type, livemode: false, pending_webhooks: 1, request: { id: null, idempotency_key: null }, data: { object } };
  const payload = JSON.stringify(event);
  let status: number | string = 'not sent';
  for (let attempt = 1; attempt <= 3; attempt++) {
    const t = now();
    const v1 = createHmac('sha256', webhookSecret).update(`${t}.${payload}`, 'utf8').digest('hex');
    try {
      const r = await fetch(webhookUrl(s), { method: 'POST', headers: { 'content-type': 'application/json; charset=utf-8', 'stripe-signature': `t=${t},v1=${v1}`, 'user-agent': 'platewright-fake-payments' }, body: payload });
      status = r.status;
      await r.text();
      if (r.ok) break;
    } catch (e) {
      status = e instanceof Error ? e.message : String(e);
    }
    await new Promise((r) => setTimeout(r, 300 * attempt));
  }
  delivered.push({ eventId: event.id, type, sessionId: s.id, status });
  console.log(`[fake-payments] ${type} ${event.id} for ${s.id} → ${webhookUrl(s)}: ${status}`);
  return status;
}

const esc = (v: unknown) => String(v).replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);
const money = (minor: number, currency: string) => {
  try {
    return new Intl.NumberFormat('en-GB', { style: 'currency', currency: currency.toUpperCase() }).format(minor / 100);
  } catch {
    return `${(minor / 100).toFixed(2)} ${currency.toUpperCase()}`;
  }
};

function page(title: string, body: string): string {
  return `<!doctype html><html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width,initial-scale=1"><title>${esc(title)}</title>
<style>
  body{margin:0;font-family:system-ui,Arial,sans-serif;background:#eef1f3;color:#14242c}
  .bar{background:#2c4a3e;color:#fff;padding:12px 20px;font-weight:700;letter-spacing:.02em}
  .bar small{font-weight:400;opacity:.8;margin-left:8px}
  main{max-width:520px;margin:32px auto;background:#fff;border:1px solid #cfd8dc;border-radius:10px;padding:24px}
  .note{background:#fff6db;border:1px solid #e0c36a;border-radius:6px;padding:8px 12px;font-size:14px}
  table{width:100%;border-collapse:collapse;margin:16px 0}td{padding:6px 0;border-top:1px solid #e3e8ea;vertical-align:top}
  td.r{text-align:right;white-space:nowrap}.total td{font-weight:700;border-top:2px solid #2c4a3e}
  .desc{color:#5e6f77;font-size:13px}
  .actions{display:flex;gap:12px;margin-top:20px}
  button,a.btn{font:inherit;font-weight:700;padding:10px 18px;border-radius:6px;border:0;cursor:pointer;text-decoration:none}
  .pay{background:#2c4a3e;color:#fff}.decline{background:#fff;color:#8a2b1f;border:1px solid #8a2b1f}
  .muted{color:#5e6f77;font-size:14px}
</style></head><body><div class="bar">Test checkout<small>local payment fake — no money moves</small></div><main>${body}</main></body></html>`;
}

function checkoutPage(s: Session): string {
  if (s.status === 'complete') {
    return page('Already paid', `<h1>Already paid</h1><p>This checkout was paid on ${new Date(s.created * 1000).toISOString().slice(0, 10)}.</p><p><a class="btn pay" href="${esc(s.success_url)}">Back to Platewright</a></p>`);
  }
  if (s.status === 'expired') return page('Expired', `<h1>This checkout has expired</h1><p><a href="${esc(s.cancel_url)}">Back to Platewright</a></p>`);
  const rows = s.line_items_for_page
    .map((l) => `<tr><td>${esc(l.name)}${l.description ? `<div class="desc">${esc(l.description)}</div>` : ''}</td><td class="r">${l.quantity} × ${esc(money(l.unit_amount, s.currency))}</td></tr>`)
    .join('');
  return page(
    `Pay ${money(s.amount_total, s.currency)}`,
    `<h1 style="margin:0 0 4px">Pay ${esc(money(s.amount_total, s.currency))}</h1>
     <p class="muted">${s.customer_email ? `for ${esc(s.customer_email)} · ` : ''}session ${esc(s.id)}</p>
     <p class="note">A stand-in for the real payment page, for local runs and tests. “Pay” marks the payment as made and tells the app; “Decline” reports a declined card.</p>
     <table>${rows}<tr class="total"><td>Total</td><td class="r" data-testid="fake-total">${esc(money(s.amount_total, s.currency))}</td></tr></table>
     <form method="post" class="actions">
       <button class="pay" type="submit" formaction="/pay/${esc(s.id)}/pay">Pay ${esc(money(s.amount_total, s.currency))}</button>
       <button class="decline" type="submit" formaction="/pay/${esc(s.id)}/decline">Decline</button>
     </form>
     <p class="muted" style="margin-top:16px"><a href="${esc(s.cancel_url)}">Cancel and go back</a></p>`,
  );
}

const server = createServer(async (req, res) => {
  try {
    const url = new URL(req.url ?? '/', base);
    const path = url.pathname;
    if (path === '/_fake/health') return send(res, 200, { ok: true, sessions: sessions.size });
    if (path === '/_fake/events') return send(res, 200, { delivered });

    if (path.startsWith('/v1/')) {
      const auth = req.headers.authorization ?? '';
      if (auth !== `Bearer ${apiKey}`) return apiError(res, 401, 'Invalid API Key provided (the local fake accepts only the configured test key).');
      if (req.method === 'POST' && path === '/v1/checkout/sessions') {
        const key = req.headers['idempotency-key'];
        const body = await readBody(req);
        const seen = typeof key === 'string' ? byIdempotencyKey.get(key) : undefined;
        if (seen) {
          // like the real service: a key reused with different parameters is an error, not a replay
          if (seen.body !== body) return send(res, 400, { error: { type: 'idempotency_error', message: `Keys for idempotent requests can only be used with the same parameters they were first used with (key ${key}).` } });
          return send(res, 200, publicSession(sessions.get(seen.sessionId)!));
        }
        const made = createSession(parseForm(body));
        if (typeof made === 'string') return apiError(res, 400, made, 'parameter_invalid');
        if (typeof key === 'string') byIdempotencyKey.set(key, { sessionId: made.id, body });
        return send(res, 200, publicSession(made));
      }
      const m = /^\/v1\/checkout\/sessions\/([\w-]+)$/.exec(path);
      if (req.method === 'GET' && m) {
        const s = sessions.get(m[1]!);
        if (!s) return apiError(res, 404, `No such checkout.session: '${m[1]}'`, 'resource_missing');
        if (s.status === 'open' && s.expires_at <= now()) s.status = 'expired';
        return send(res, 200, publicSession(s));
      }
      return apiError(res, 404, `Unrecognized request URL (${req.method}: ${path}); the local fake implements checkout sessions only.`);
    }

    const pay = /^\/pay\/([\w-]+)(?:\/(pay|decline))?$/.exec(path);
    if (pay) {
      const s = sessions.get(pay[1]!);
      if (!s) return send(res, 404, page('Not found', '<h1>No such checkout</h1><p>The local payment fake forgets sessions when it restarts; start again from Platewright.</p>'));
      if (req.method === 'GET' && !pay[2]) return send(res, 200, checkoutPage(s));
      if (req.method === 'POST' && pay[2] === 'pay') {
        await readBody(req);
        if (s.status === 'open') {
          s.status = 'complete';
          s.payment_status = 'paid';
          s.payment_intent = id('pi');
          s.url = null;
          await deliver(s, 'checkout.session.completed', publicSession(s));
        }
        res.writeHead(303, { location: s.success_url });
        return res.end();
      }
      if (req.method === 'POST' && pay[2] === 'decline') {
        await readBody(req);
        if (s.status !== 'open') return send(res, 409, checkoutPage(s));
        const intent = {
          id: id('pi'),
          object: 'payment_intent',
          amount: s.amount_total,
          currency: s.currency,
          status: 'requires_payment_method',
          metadata: s.intent_metadata,
          last_payment_error: { type: 'card_error', code: 'card_declined', decline_code: 'generic_decline', message: 'Your card was declined (test decline on the local payment page).' },
          livemode: false,
        };
        await deliver(s, 'payment_intent.payment_failed', intent);
        return send(res, 402, page('Declined', `<h1>Card declined</h1><p>Nothing was charged. The order stays awaiting payment.</p><div class="actions"><a class="btn pay" href="/pay/${esc(s.id)}">Try again</a><a class="btn decline" href="${esc(s.cancel_url)}">Back to Platewright</a></div>`));
      }
    }
    return send(res, 404, page('Not found', '<h1>Not found</h1>'));
  } catch (e) {
    console.error(`[fake-payments] ${e instanceof Error ? e.message : String(e)}`);
    if (!res.headersSent) send(res, 500, { error: { type: 'api_error', message: 'fake payment server failed' } });
  }
});

server.on('error', (err: NodeJS.ErrnoException) => {
  if (err.code === 'EADDRINUSE') {
    console.error(`[fake-payments] port ${port} on 127.0.0.1 is taken by another program — choose another with PAYMENTS_FAKE_PORT=…`);
    process.exit(2);
  }
  console.error(`[fake-payments] ${err.message}`);
});

server.listen(port, '127.0.0.1', () => {
  if (pidFile) writeFileSync(pidFile, String(process.pid));
  console.log(`[fake-payments] listening on ${base}`);
});

function stop() {
  server.close(() => {
    if (pidFile) rmSync(pidFile, { force: true });
    process.exit(0);
  });
  setTimeout(() => process.exit(0), 2000).unref();
}
process.on('SIGTERM', stop);
process.on('SIGINT', stop);
