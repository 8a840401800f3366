import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import Stripe from 'stripe';
import { eq } from 'drizzle-orm';
import { closeDb, getDb } from '../../src/server/db/client';
import { inspections, orders, paymentEvents } from '../../src/server/db/schema';
import { startServer, testAppPort, type RunningServer } from '../support/server';
import { ApiClient } from '../support/auth';
import { makeUser, TEST_PASSWORD } from '../support/users';
import { waitForMail } from '../support/mail';
import type { SessionUser } from '../../src/server/auth/types';

const demoSpec = JSON.parse(readFileSync(new URL('../../templates/plates/demo.json', import.meta.url), 'utf8'));
const WEBHOOK_SECRET = process.env.STRIPE_WEBHOOK_SECRET ?? '';
const FAKE_BASE = process.env.PAYMENTS_API_BASE ?? '';
// the SDK's own helper makes the header the way the payment service does: t=…,v1=HMAC-SHA256(secret, t.payload)
const sdk = new Stripe('sk_test_unused_for_signing');

let server: RunningServer;
const people: Record<string, SessionUser> = {};
const c: Record<string, ApiClient> = {};
let approvedRev = 0;
let draftRev = 0;

async function approvedRevision(designer: ApiClient, engineer: ApiClient): Promise<{ approved: number; draft: number }> {
  const p = await designer.post('/api/projects', { name: 'Payments swap', swapDescription: 'invented test swap' });
  const pl = await designer.post(`/api/projects/${p.body.project.id}/plates`, { title: 'Paid plate' });
  const r1 = await designer.post(`/api/plates/${pl.body.plate.id}/revisions`, { spec: demoSpec, message: 'first', parentRevisionId: null });
  expect((await designer.post(`/api/revisions/${r1.body.revision.id}/submit`, {})).status).toBe(200);
  const ok = await engineer.post(`/api/revisions/${r1.body.revision.id}/approve`, { comment: 'released for the payment tests' });
  expect(ok.status, JSON.stringify(ok.body)).toBe(200);
  const r2 = await designer.post(`/api/plates/${pl.body.plate.id}/revisions`, { spec: { ...demoSpec, outline: { ...demoSpec.outline, edgeMarginMm: 14 } }, message: 'draft', parentRevisionId: r1.body.revision.id });
  return { approved: r1.body.revision.id, draft: r2.body.revision.id };
}

function signed(event: object, secret = WEBHOOK_SECRET) {
  const payload = JSON.stringify(event);
  return { payload, header: sdk.webhooks.generateTestHeaderString({ payload, secret }) };
}

async function postEvent(event: object, opts: { secret?: string; header?: string } = {}) {
  const s = signed(event, opts.secret);
  // no Origin header, like the payment service: the origin check only guards form posts
  const r = await fetch(`${server.baseUrl}/api/payments/webhook`, { method: 'POST', headers: { 'content-type': 'application/json', 'stripe-signature': opts.header ?? s.header }, body: s.payload });
  return { status: r.status, body: await r.json() };
}

async function orderRow(id: number) {
  const [o] = await getDb().select().from(orders).where(eq(orders.id, id));
  return o!;
}
const eventCount = async () => (await getDb().select({ id: paymentEvents.id }).from(paymentEvents)).length;

async function quoteAndAccept(quantity = 1) {
  const q = await c.designer.post(`/api/revisions/${approvedRev}/quotes`, { quantity });
  expect(q.status, JSON.stringify(q.body)).toBe(201);
  const a = await c.designer.post(`/api/quotes/${q.body.quote.id}/accept`, {});
  expect(a.status, JSON.stringify(a.body)).toBe(200);
  return { quote: q.body.quote, orderId: a.body.orderId as number, checkoutUrl: a.body.checkoutUrl as string };
}

function completedEvent(id: string, session: { id: string; amount: number; currency: string }) {
  return {
    id,
    object: 'event',
    type: 'checkout.session.completed',
    created: Math.floor(Date.now() / 1000),
    livemode: false,
    data: { object: { id: session.id, object: 'checkout.session', payment_status: 'paid', status: 'complete', amount_total: session.amount, currency: session.currency.toLowerCase(), payment_intent: `pi_test_${id}` } },
  };
}

beforeAll(async () => {
  expect(WEBHOOK_SECRET, 'npm test exports STRIPE_WEBHOOK_SECRET').not.toBe('');
  server = await startServer(testAppPort(20));
  const db = getDb();
  for (const [k, role] of [['designer', 'designer'], ['outsider', 'designer'], ['engineer', 'engineer'], ['machinist', 'machinist'], ['admin', 'admin']] as const) {
    people[k] = await makeUser(db, role, k);
    c[k] = new ApiClient(server.baseUrl);
    expect((await c[k].signIn(people[k].email, TEST_PASSWORD)).status).toBe(200);
  }
  c.anonymous = new ApiClient(server.baseUrl);
  const revs = await approvedRevision(c.designer, c.engineer);
  approvedRev = revs.approved;
  draftRev = revs.draft;
}, 180_000);

afterAll(async () => {
  await server?.stop();
  await closeDb();
});

describe('quotes', () => {
  it('quotes approved revisions only, for the project’s designer, engineers and admins', async () => {
    expect((await c.anonymous.post(`/api/revisions/${approvedRev}/quotes`, { quantity: 1 })).status).toBe(401);
    expect((await c.machinist.post(`/api/revisions/${approvedRev}/quotes`, { quantity: 1 })).status).toBe(403);
    expect((await c.outsider.post(`/api/revisions/${approvedRev}/quotes`, { quantity: 1 })).status).toBe(404);
    const draft = await c.designer.post(`/api/revisions/${draftRev}/quotes`, { quantity: 1 });
    expect(draft.status).toBe(409);
    expect(draft.body.error.code).toBe('not_approved');
    const zero = await c.designer.post(`/api/revisions/${approvedRev}/quotes`, { quantity: 0 });
    expect(zero.status).toBe(400);
    expect(zero.body.error.fields).toHaveProperty('quantity');

    const q = await c.designer.post(`/api/revisions/${approvedRev}/quotes`, { quantity: 3 });
    expect(q.status).toBe(201);
    const quote = q.body.quote;
    expect(quote.state).toBe('open');
    expect(quote.lines.length).toBeGreaterThan(4);
    for (const l of quote.lines) {
      expect(Number.isInteger(l.amountMinor), l.code).toBe(true);
      expect(l.basis.length, l.code).toBeGreaterThan(3);
    }
    // the order lines add up to the total exactly (each line rounded on its own)
    const orderLines = quote.lines.filter((l: { per: string }) => l.per === 'order');
    expect(orderLines.reduce((s: number, l: { amountMinor: number }) => s + l.amountMinor, 0)).toBe(quote.totals.totalMinor);
    const plateLines = quote.lines.filter((l: { per: string }) => l.per === 'plate');
    expect(plateLines.reduce((s: number, l: { amountMinor: number }) => s + l.amountMinor, 0)).toBe(quote.totals.perPlateMinor);
    expect(quote.totals.partsMinor).toBe(quote.totals.perPlateMinor * 3);
    expect(new Date(quote.validUntil).getTime()).toBeGreaterThan(Date.now() + 29 * 86_400_000); // 30 days by default

    const mail = await waitForMail(people.designer.email, /Quote Q-\d+ ready/);
    expect(mail.text).toContain('half-up');
    expect(mail.text).toMatch(/dial indicator/);
    expect((await c.engineer.post(`/api/revisions/${approvedRev}/quotes`, { quantity: 1 })).status).toBe(201);
  });
});

describe('orders and payment', () => {
  it('accepting gives a checkout page on the local payment fake; the order awaits payment', async () => {
    const { orderId, checkoutUrl, quote } = await quoteAndAccept();
    expect(checkoutUrl.startsWith(`${FAKE_BASE}/pay/`)).toBe(true);
    expect((await c.outsider.post(`/api/quotes/${quote.id}/accept`, {})).status).toBe(404);
    expect((await c.machinist.post(`/api/quotes/${quote.id}/accept`, {})).status).toBe(403);
    // accepting again while unpaid answers the same open page, not a second order
    const again = await c.designer.post(`/api/quotes/${quote.id}/accept`, {});
    expect(again.body).toEqual({ orderId, checkoutUrl });

    expect((await orderRow(orderId)).state).toBe('awaiting_payment');
    const mine = await c.designer.get('/api/orders');
    expect(mine.body.orders.map((o: { id: number }) => o.id)).toContain(orderId);
    expect((await c.outsider.get('/api/orders')).body.orders.map((o: { id: number }) => o.id)).not.toContain(orderId);
    expect((await c.machinist.get('/api/orders')).body.orders.map((o: { id: number }) => o.id)).toContain(orderId);
    expect((await c.outsider.get(`/api/orders/${orderId}`)).status).toBe(404);
    // nobody marks it paid by hand
    expect((await c.designer.patch(`/api/orders/${orderId}`, { state: 'in_production' })).status).toBe(403);
    expect((await c.machinist.patch(`/api/orders/${orderId}`, { state: 'paid' })).status).toBe(400);
    const early = await c.machinist.patch(`/api/orders/${orderId}`, { state: 'in_production' });
    expect(early.status).toBe(409);
    expect(early.body.error.code).toBe('awaiting_payment');
  });

  it('a bad signature answers 400 and changes nothing', async () => {
    const { orderId } = await quoteAndAccept();
    const o = await orderRow(orderId);
    const before = await eventCount();
    const ev = completedEvent('evt_test_badsig', { id: o.checkoutSessionId, amount: o.amountMinor, currency: o.currency });
    const wrong = await postEvent(ev, { secret: 'whsec_someone_else' });
    expect(wrong.status).toBe(400);
    expect(wrong.body.error.code).toBe('bad_signature');
    const missing = await fetch(`${server.baseUrl}/api/payments/webhook`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify(ev) });
    expect(missing.status).toBe(400);
    // a valid signature over a different body does not verify either
    const s = signed(ev);
    const tampered = await fetch(`${server.baseUrl}/api/payments/webhook`, { method: 'POST', headers: { 'content-type': 'application/json', 'stripe-signature': s.header }, body: s.payload.replace(String(o.amountMinor), '1') });
    expect(tampered.status).toBe(400);
    expect((await orderRow(orderId)).state).toBe('awaiting_payment');
    expect(await eventCount()).toBe(before);
    // and the same event, rightly signed and without an Origin header, is taken in
    const good = await postEvent(ev);
    expect(good.status, JSON.stringify(good.body)).toBe(200);
    expect(good.body.outcome).toBe('applied');
    expect((await orderRow(orderId)).state).toBe('paid');
  });

  it('decline on the fake checkout page leaves the order awaiting payment; pay marks it paid and mails the designer', async () => {
    const { orderId, checkoutUrl } = await quoteAndAccept(2);
    const page = await fetch(checkoutUrl);
    expect(page.status).toBe(200);
    expect(await page.text()).toContain('Decline');
    const declined = await fetch(`${checkoutUrl}/decline`, { method: 'POST', redirect: 'manual' });
    expect(declined.status).toBe(402);
    const afterDecline = await orderRow(orderId);
    expect(afterDecline.state).toBe('awaiting_payment');
    expect(afterDecline.lastPaymentProblem).toMatch(/declined/);
    expect(afterDecline.paidAt).toBeNull();

    const paid = await fetch(`${checkoutUrl}/pay`, { method: 'POST', redirect: 'manual' });
    expect(paid.status).toBe(303);
    expect(paid.headers.get('location')).toMatch(new RegExp(`^${server.baseUrl}/orders\\?paid=Q-`));
    const o = await orderRow(orderId);
    expect(o.state).toBe('paid');
    expect(o.lastPaymentProblem).toBeNull();
    expect(o.paymentReference).toMatch(/^pi_/);
    const mail = await waitForMail(people.designer.email, new RegExp(`Payment received: order O-${String(orderId).padStart(5, '0')}`));
    expect(mail.text).toContain('/orders');
    // the paid quote cannot be accepted again
    const [row] = await getDb().select({ quoteId: orders.quoteId }).from(orders).where(eq(orders.id, orderId));
    expect((await c.designer.post(`/api/quotes/${row!.quoteId}/accept`, {})).status).toBe(409);
  });

  it('a replayed or late event changes nothing twice', async () => {
    const { orderId } = await quoteAndAccept();
    const o = await orderRow(orderId);
    const ev = completedEvent(`evt_test_replay_${orderId}`, { id: o.checkoutSessionId, amount: o.amountMinor, currency: o.currency });
    expect((await postEvent(ev)).body.outcome).toBe('applied');
    const paidAt = (await orderRow(orderId)).paidAt;
    expect((await c.machinist.patch(`/api/orders/${orderId}`, { state: 'in_production' })).status).toBe(200);

    // the same event again: answered 200 (so the service stops retrying), nothing changes —
    // a handler that simply "sets paid" would move the order back from in production
    const replay = await postEvent(ev);
    expect(replay.status).toBe(200);
    expect(replay.body.outcome).toBe('duplicate');
    const afterReplay = await orderRow(orderId);
    expect(afterReplay.state).toBe('in_production');
    expect(afterReplay.paidAt?.getTime()).toBe(paidAt?.getTime());
    const rows = await getDb().select().from(paymentEvents).where(eq(paymentEvents.eventId, ev.id));
    expect(rows).toHaveLength(1);

    // out of order: another "completed" and a late failure for the same checkout are recorded and ignored
    expect((await postEvent({ ...ev, id: `${ev.id}_second` })).body.outcome).toBe('ignored');
    const late = await postEvent({ id: `evt_test_late_fail_${orderId}`, object: 'event', type: 'checkout.session.expired', data: { object: { id: o.checkoutSessionId, object: 'checkout.session' } } });
    expect(late.body.outcome).toBe('ignored');
    expect((await orderRow(orderId)).state).toBe('in_production');
  });

  it('an event whose amount differs from the order does not mark it paid', async () => {
    const { orderId } = await quoteAndAccept();
    const o = await orderRow(orderId);
    const r = await postEvent(completedEvent(`evt_test_amount_${orderId}`, { id: o.checkoutSessionId, amount: o.amountMinor - 1, currency: o.currency }));
    expect(r.body.outcome).toBe('ignored');
    expect((await orderRow(orderId)).state).toBe('awaiting_payment');
  });

  it('the shop moves a paid order one step at a time; inspected needs a passed inspection; shipped mails the designer', async () => {
    const { orderId } = await quoteAndAccept();
    const o = await orderRow(orderId);
    await postEvent(completedEvent(`evt_test_ship_${orderId}`, { id: o.checkoutSessionId, amount: o.amountMinor, currency: o.currency }));
    const skip = await c.machinist.patch(`/api/orders/${orderId}`, { state: 'shipped' });
    expect(skip.status).toBe(409);
    expect(skip.body.error.message).toMatch(/next step is in production/);
    expect((await c.machinist.patch(`/api/orders/${orderId}`, { state: 'in_production' })).status).toBe(200);
    // no inspection yet → refused; a failed one → refused; a passed one after payment → allowed
    const none = await c.machinist.patch(`/api/orders/${orderId}`, { state: 'inspected' });
    expect(none.status).toBe(409);
    expect(none.body.error.code).toBe('not_inspected');
    const rev = (await c.designer.get(`/api/revisions/${approvedRev}`)).body.revision;
    const inspection = (state: 'failed' | 'passed') => ({ revisionId: approvedRev, plateId: rev.plateId, machinistId: people.machinist.id, state, specSha256: rev.specSha256, artifactHashes: [], measurements: [], completedAt: new Date(Date.now() + 1000) });
    await getDb().insert(inspections).values(inspection('failed'));
    const failed = await c.machinist.patch(`/api/orders/${orderId}`, { state: 'inspected' });
    expect(failed.status).toBe(409);
    expect(failed.body.error.code).toBe('inspection_failed');
    expect((await orderRow(orderId)).state).toBe('in_production');
    const [passed] = await getDb().insert(inspections).values(inspection('passed')).$returningId();
    expect((await c.machinist.patch(`/api/orders/${orderId}`, { state: 'inspected' })).status).toBe(200);
    expect((await orderRow(orderId)).inspectionId).toBe(passed.id);

    // a second order of the same revision is another part: the inspection already used does not count again
    const second = await quoteAndAccept();
    const o2 = await orderRow(second.orderId);
    await postEvent(completedEvent(`evt_test_second_${second.orderId}`, { id: o2.checkoutSessionId, amount: o2.amountMinor, currency: o2.currency }));
    expect((await c.machinist.patch(`/api/orders/${second.orderId}`, { state: 'in_production' })).status).toBe(200);
    const reused = await c.machinist.patch(`/api/orders/${second.orderId}`, { state: 'inspected' });
    expect(reused.status).toBe(409);
    expect(reused.body.error.code).toBe('not_inspected');
    expect((await orderRow(second.orderId)).state).toBe('in_production');
    const [own] = await getDb().insert(inspections).values(inspection('passed')).$returningId();
    expect((await c.machinist.patch(`/api/orders/${second.orderId}`, { state: 'inspected' })).status).toBe(200);
    expect((await orderRow(second.orderId)).inspectionId).toBe(own.id);
    const shipped = await c.engineer.patch(`/api/orders/${orderId}`, { state: 'shipped', note: 'Parcel 4411-TEST, invented carrier' });
    expect(shipped.status).toBe(200);
    expect(shipped.body.order.state).toBe('shipped');
    const mail = await waitForMail(people.designer.email, new RegExp(`Shipped: order O-${String(orderId).padStart(5, '0')}`));
    expect(mail.text).toContain('Parcel 4411-TEST');
    expect(mail.text).toMatch(/thread locking/);
  });
});

describe('shop settings', () => {
  it('admins read and change the rates; a bad document changes nothing', async () => {
    expect((await c.designer.get('/api/admin/shop-settings')).status).toBe(403);
    expect((await c.engineer.patch('/api/admin/shop-settings', {})).status).toBe(403);
    const got = await c.admin.get('/api/admin/shop-settings');
    expect(got.status).toBe(200);
    const rates = got.body.rates;
    const bad = await c.admin.patch('/api/admin/shop-settings', { ...rates, currency: 'euro', taxRateBp: 12.5 });
    expect(bad.status).toBe(400);
    expect(Object.keys(bad.body.error.fields)).toEqual(expect.arrayContaining(['currency', 'taxRateBp']));
    expect((await c.admin.get('/api/admin/shop-settings')).body.rates).toEqual(rates);

    const changed = await c.admin.patch('/api/admin/shop-settings', { ...rates, taxRateBp: 2000, setupFeeMinor: 0 });
    expect(changed.status).toBe(200);
    const q = await c.designer.post(`/api/revisions/${approvedRev}/quotes`, { quantity: 1 });
    const t = q.body.quote.totals;
    // 20 % of the net = net / 5, half-up in whole cents: floor((2·net + 5) / 10)
    const net = t.partsMinor - t.discountMinor;
    expect(t.taxMinor).toBe(Math.floor((2 * net + 5) / 10));
    expect(t.setupMinor).toBe(0);
    expect((await c.admin.patch('/api/admin/shop-settings', rates)).status).toBe(200);
  });
});
