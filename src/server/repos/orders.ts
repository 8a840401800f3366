import { and, desc, eq, inArray } from 'drizzle-orm';
import type { Db, Tx } from '../db/client';
import { orders, paymentEvents, plates, projects, quotes, revisions, users, type OrderState } from '../db/schema';
import type { SessionUser } from '../auth/types';
import { AppError, forbidden, notFound } from '../errors';
import { audit } from './audit';
import { assertProject, projectAccess } from './projects';
import { getShopRates } from './shopSettings';
import { inspectionResultForOrder } from './orderInspection';
import { validateSpec } from '../plateEngine';
import { isDomainError } from '~/domain';
import { quoteGeometry, quotePlate, type QuoteLine } from '~/domain/quote';
import { paymentsClient, type CheckoutSession, type PaymentEvent } from '../payments/client';

const isDuplicate = (e: unknown) => {
  const code = (e as { code?: string }).code ?? (e as { cause?: { code?: string } }).cause?.code;
  return code === 'ER_DUP_ENTRY';
};

const DAY_MS = 86_400_000;

export const ORDER_STATE_LABEL: Record<OrderState, string> = {
  awaiting_payment: 'Awaiting payment',
  paid: 'Paid',
  in_production: 'In production',
  inspected: 'Inspected',
  shipped: 'Shipped',
};

/** The shop's steps, in order; payment is never set by hand. */
const NEXT_SHOP_STATE: Partial<Record<OrderState, OrderState>> = { paid: 'in_production', in_production: 'inspected', inspected: 'shipped' };

async function revisionWithPlate(db: Db | Tx, revisionId: number) {
  const [r] = await db
    .select({ id: revisions.id, number: revisions.number, status: revisions.status, spec: revisions.spec, specSha256: revisions.specSha256, plateId: plates.id, partNumber: plates.partNumber, title: plates.title, projectId: plates.projectId, ownerId: projects.ownerId })
    .from(revisions)
    .innerJoin(plates, eq(plates.id, revisions.plateId))
    .innerJoin(projects, eq(projects.id, plates.projectId))
    .where(eq(revisions.id, revisionId))
    .limit(1);
  return r;
}

/** Designers of the project, engineers and admins may quote and order; others see 404 (no leak). */
async function assertMayOrder(db: Db | Tx, user: SessionUser, projectId: number, what: string) {
  if (user.role === 'machinist') throw forbidden('Machinists make the plates; designers, engineers and admins request quotes.');
  const a = await projectAccess(db, user, projectId);
  if (!a.exists || !a.canView) throw notFound(what);
  if (!a.canEdit) throw forbidden('You may view this project but not order for it.');
}

export interface QuoteView {
  id: number;
  reference: string;
  revisionId: number;
  revisionNumber: number;
  plateId: number;
  partNumber: string;
  plateTitle: string;
  specSha256: string;
  quantity: number;
  currency: string;
  currencyMinorDigits: number;
  rounding: string;
  lines: QuoteLine[];
  totals: { perPlateMinor: number; partsMinor: number; discountMinor: number; setupMinor: number; taxMinor: number; totalMinor: number };
  validUntil: string;
  expired: boolean;
  state: 'open' | 'accepted';
  createdAt: string;
  order: { id: number; state: OrderState } | null;
}

export const quoteReference = (id: number) => `Q-${String(id).padStart(5, '0')}`;
export const orderReference = (id: number) => `O-${String(id).padStart(5, '0')}`;

type QuoteRow = typeof quotes.$inferSelect;

function toQuoteView(q: QuoteRow, r: { number: number; plateId: number; partNumber: string; title: string }, order: { id: number; state: OrderState } | null): QuoteView {
  return {
    id: q.id,
    reference: quoteReference(q.id),
    revisionId: q.revisionId,
    revisionNumber: r.number,
    plateId: r.plateId,
    partNumber: r.partNumber,
    plateTitle: r.title,
    specSha256: q.specSha256,
    quantity: q.quantity,
    currency: q.currency,
    currencyMinorDigits: q.currencyMinorDigits,
    rounding: 'half-up per line, whole minor units',
    lines: q.lines as QuoteLine[],
    totals: { perPlateMinor: q.perPlateMinor, partsMinor: q.partsMinor, discountMinor: q.discountMinor, setupMinor: q.setupMinor, taxMinor: q.taxMinor, totalMinor: q.totalMinor },
    validUntil: q.validUntil.toISOString(),
    expired: q.validUntil.getTime() <= Date.now(),
    state: q.state,
    createdAt: q.createdAt.toISOString(),
    order,
  };
}

/** A quote for an approved revision, from its geometry and the shop's current rates. */
export async function requestQuote(db: Db, user: SessionUser, revisionId: number, quantity: number): Promise<{ quote: QuoteView; recipients: { email: string; name: string }[]; shopName: string; taxLabel: string }> {
  const r = await revisionWithPlate(db, revisionId);
  if (!r) throw notFound('Revision');
  await assertMayOrder(db, user, r.projectId, 'Revision');
  if (r.status !== 'approved') {
    throw new AppError(409, 'not_approved', `Revision ${r.number} of ${r.partNumber} is ${r.status.replace('_', ' ')}; only an approved (released) revision can be quoted and made.`, { status: r.status });
  }
  const { rates } = await getShopRates(db);
  const spec = validateSpec(r.spec);
  let q;
  try {
    q = quotePlate(quoteGeometry(spec, rates.sawAllowanceMm), rates, quantity);
  } catch (e) {
    if (isDomainError(e)) {
      if (e.code === 'quote.quantity') throw new AppError(400, 'invalid_input', e.message, { fields: { quantity: e.message } });
      throw new AppError(409, e.code.replace('quote.', ''), e.message);
    }
    throw e;
  }
  const validUntil = new Date(Date.now() + rates.quoteValidDays * DAY_MS);
  const id = await db.transaction(async (tx) => {
    const [row] = await tx
      .insert(quotes)
      .values({
        revisionId,
        specSha256: r.specSha256,
        requestedById: user.id,
        quantity,
        currency: q.currency,
        currencyMinorDigits: q.currencyMinorDigits,
        lines: q.lines,
        rates,
        perPlateMinor: q.totals.perPlateMinor,
        partsMinor: q.totals.partsMinor,
        discountMinor: q.totals.discountMinor,
        setupMinor: q.totals.setupMinor,
        taxMinor: q.totals.taxMinor,
        totalMinor: q.totals.totalMinor,
        validUntil,
      })
      .$returningId();
    await audit(tx, user.id, 'quote.created', { type: 'quote', id: row.id }, { revisionId, quantity, totalMinor: q.totals.totalMinor, currency: q.currency });
    return row.id;
  });
  const quote = await getQuote(db, user, id);
  const people = await db.select({ email: users.email, name: users.name, active: users.active }).from(users).where(inArray(users.id, [...new Set([user.id, r.ownerId])]));
  return { quote, recipients: people.filter((p) => p.active), shopName: rates.shopName, taxLabel: rates.taxLabel };
}

async function loadQuote(db: Db | Tx, user: SessionUser, quoteId: number) {
  const [q] = await db.select().from(quotes).where(eq(quotes.id, quoteId)).limit(1);
  if (!q) throw notFound('Quote');
  const r = await revisionWithPlate(db, q.revisionId);
  if (!r) throw notFound('Quote');
  if (user.role === 'machinist') throw notFound('Quote');
  await assertProject(db, user, r.projectId, 'view').catch(() => {
    throw notFound('Quote');
  });
  return { q, r };
}

export async function getQuote(db: Db | Tx, user: SessionUser, quoteId: number): Promise<QuoteView> {
  const { q, r } = await loadQuote(db, user, quoteId);
  const [o] = await db.select({ id: orders.id, state: orders.state }).from(orders).where(eq(orders.quoteId, q.id)).limit(1);
  return toQuoteView(q, r, o ?? null);
}

/** Quotes of one revision, newest first (for the plate page). */
export async function listRevisionQuotes(db: Db, user: SessionUser, revisionId: number): Promise<QuoteView[]> {
  const r = await revisionWithPlate(db, revisionId);
  if (!r || user.role === 'machinist') throw notFound('Revision');
  await assertProject(db, user, r.projectId, 'view').catch(() => {
    throw notFound('Revision');
  });
  const rows = await db.select().from(quotes).where(eq(quotes.revisionId, revisionId)).orderBy(desc(quotes.id)).limit(20);
  const os = rows.length ? await db.select({ id: orders.id, state: orders.state, quoteId: orders.quoteId }).from(orders).where(inArray(orders.quoteId, rows.map((x) => x.id))) : [];
  return rows.map((q) => toQuoteView(q, r, os.find((o) => o.quoteId === q.id) ?? null));
}

async function createCheckout(user: SessionUser, q: QuoteRow, r: { number: number; plateId: number; partNumber: string; title: string; id: number }, appBase: string, idempotencyKey: string): Promise<CheckoutSession> {
  const ref = quoteReference(q.id);
  try {
    return await paymentsClient().checkout.sessions.create(
      {
        mode: 'payment',
        line_items: [
          {
            quantity: 1,
            price_data: {
              currency: q.currency.toLowerCase(),
              unit_amount: q.totalMinor,
              product_data: { name: `${r.partNumber} rev ${r.number} adapter plate × ${q.quantity}`, description: `Quote ${ref}, tax included` },
            },
          },
        ],
        client_reference_id: ref,
        metadata: { quoteId: String(q.id), revisionId: String(r.id) },
        payment_intent_data: { metadata: { quoteId: String(q.id) } },
        customer_email: user.email,
        success_url: `${appBase}/orders?paid=${ref}`,
        cancel_url: `${appBase}/plates/${r.plateId}?rev=${r.id}#quote`,
      },
      { idempotencyKey },
    );
  } catch (e) {
    if (e instanceof AppError) throw e;
    const msg = e instanceof Error ? e.message : String(e);
    console.error(`[platewright] checkout session for ${ref} failed: ${msg}`);
    throw new AppError(502, 'payment_unavailable', `The payment service did not answer (${msg}); the quote is still open and nothing was charged. Try again in a moment.`);
  }
}

/** Accept a quote: an order awaiting payment and a checkout page to pay it on. */
export async function acceptQuote(db: Db, user: SessionUser, quoteId: number, appBase: string): Promise<{ orderId: number; checkoutUrl: string }> {
  const { q, r } = await loadQuote(db, user, quoteId);
  await assertMayOrder(db, user, r.projectId, 'Quote');
  const [existing] = await db.select().from(orders).where(eq(orders.quoteId, q.id)).limit(1);
  if (existing) {
    if (existing.state !== 'awaiting_payment') throw new AppError(409, 'already_paid', `Quote ${quoteReference(q.id)} is already ordered and paid (order ${orderReference(existing.id)}, ${ORDER_STATE_LABEL[existing.state].toLowerCase()}).`, { orderId: existing.id });
    // paying again after leaving the checkout page: the same page while it is open, else a new one
    const session = await paymentsClient().checkout.sessions.retrieve(existing.checkoutSessionId).catch(() => null);
    if (session?.status === 'open' && session.url) return { orderId: existing.id, checkoutUrl: session.url };
    const fresh = await createCheckout(user, q, { ...r, id: q.revisionId }, appBase, `platewright-quote-${q.id}-renew-${Date.now()}`);
    await db.transaction(async (tx) => {
      await tx.update(orders).set({ checkoutSessionId: fresh.id, updatedAt: new Date() }).where(and(eq(orders.id, existing.id), eq(orders.state, 'awaiting_payment')));
      await audit(tx, user.id, 'order.checkout_renewed', { type: 'order', id: existing.id }, { checkoutSessionId: fresh.id });
    });
    return { orderId: existing.id, checkoutUrl: fresh.url! };
  }
  if (q.state !== 'open') throw new AppError(409, 'quote_closed', `Quote ${quoteReference(q.id)} is ${q.state}.`);
  if (q.validUntil.getTime() <= Date.now()) throw new AppError(409, 'quote_expired', `Quote ${quoteReference(q.id)} expired on ${q.validUntil.toISOString().slice(0, 10)}; request a new quote (rates may have changed).`);
  if (r.status !== 'approved' || r.specSha256 !== q.specSha256) throw new AppError(409, 'revision_changed', `Revision ${r.number} is no longer the released revision it was quoted as (${r.status.replace('_', ' ')}); request a quote for the current release.`);
  // the checkout session first: if the payment service is down nothing is saved
  const session = await createCheckout(user, q, { ...r, id: q.revisionId }, appBase, `platewright-quote-${q.id}-${q.createdAt.getTime()}-accept`);
  try {
    const orderId = await db.transaction(async (tx) => {
      const [locked] = await tx.select({ state: quotes.state }).from(quotes).where(eq(quotes.id, q.id)).for('update');
      if (locked?.state !== 'open') throw new AppError(409, 'quote_closed', `Quote ${quoteReference(q.id)} was accepted a moment ago.`);
      const [o] = await tx
        .insert(orders)
        .values({ quoteId: q.id, revisionId: q.revisionId, customerId: user.id, quantity: q.quantity, amountMinor: q.totalMinor, currency: q.currency, checkoutSessionId: session.id })
        .$returningId();
      await tx.update(quotes).set({ state: 'accepted' }).where(eq(quotes.id, q.id));
      await audit(tx, user.id, 'quote.accepted', { type: 'quote', id: q.id }, { orderId: o.id });
      await audit(tx, user.id, 'order.created', { type: 'order', id: o.id }, { quoteId: q.id, amountMinor: q.totalMinor, currency: q.currency, checkoutSessionId: session.id });
      return o.id;
    });
    return { orderId, checkoutUrl: session.url! };
  } catch (e) {
    if (isDuplicate(e) || (e instanceof AppError && e.code === 'quote_closed')) {
      // accepted twice at once: the first one's order and page
      const [o] = await db.select().from(orders).where(eq(orders.quoteId, q.id)).limit(1);
      if (o) {
        const s = await paymentsClient().checkout.sessions.retrieve(o.checkoutSessionId).catch(() => null);
        if (s?.url) return { orderId: o.id, checkoutUrl: s.url };
      }
    }
    throw e;
  }
}

export interface OrderView {
  id: number;
  reference: string;
  quoteId: number;
  quoteReference: string;
  revisionId: number;
  revisionNumber: number;
  plateId: number;
  partNumber: string;
  plateTitle: string;
  customer: { id: string; name: string; email: string };
  state: OrderState;
  stateLabel: string;
  nextState: OrderState | null;
  quantity: number;
  amountMinor: number;
  currency: string;
  currencyMinorDigits: number;
  lastPaymentProblem: string | null;
  paidAt: string | null;
  shippedAt: string | null;
  trackingNote: string | null;
  createdAt: string;
  updatedAt: string;
}

function orderSelect(db: Db | Tx) {
  return db
    .select({ o: orders, revisionNumber: revisions.number, plateId: plates.id, partNumber: plates.partNumber, plateTitle: plates.title, customerName: users.name, customerEmail: users.email, digits: quotes.currencyMinorDigits })
    .from(orders)
    .innerJoin(quotes, eq(quotes.id, orders.quoteId))
    .innerJoin(revisions, eq(revisions.id, orders.revisionId))
    .innerJoin(plates, eq(plates.id, revisions.plateId))
    .innerJoin(users, eq(users.id, orders.customerId));
}

type OrderJoined = Awaited<ReturnType<ReturnType<typeof orderSelect>['where']>>[number];

function toOrderView(x: OrderJoined): OrderView {
  const o = x.o;
  return {
    id: o.id,
    reference: orderReference(o.id),
    quoteId: o.quoteId,
    quoteReference: quoteReference(o.quoteId),
    revisionId: o.revisionId,
    revisionNumber: x.revisionNumber,
    plateId: x.plateId,
    partNumber: x.partNumber,
    plateTitle: x.plateTitle,
    customer: { id: o.customerId, name: x.customerName, email: x.customerEmail },
    state: o.state,
    stateLabel: ORDER_STATE_LABEL[o.state],
    nextState: NEXT_SHOP_STATE[o.state] ?? null,
    quantity: o.quantity,
    amountMinor: o.amountMinor,
    currency: o.currency,
    currencyMinorDigits: x.digits,
    lastPaymentProblem: o.lastPaymentProblem,
    paidAt: o.paidAt?.toISOString() ?? null,
    shippedAt: o.shippedAt?.toISOString() ?? null,
    trackingNote: o.trackingNote,
    createdAt: o.createdAt.toISOString(),
    updatedAt: o.updatedAt.toISOString(),
  };
}

/** Designers: their own orders. Machinists, engineers, admins: every order. */
export async function listOrders(db: Db, user: SessionUser, opts: { state?: OrderState[] } = {}): Promise<OrderView[]> {
  const cond = [];
  if (user.role === 'designer') cond.push(eq(orders.customerId, user.id));
  if (opts.state?.length) cond.push(inArray(orders.state, opts.state));
  const rows = await orderSelect(db).where(cond.length ? and(...cond) : undefined).orderBy(desc(orders.id)).limit(500);
  return rows.map(toOrderView);
}

export async function getOrder(db: Db | Tx, user: SessionUser, orderId: number): Promise<OrderView> {
  const [x] = await orderSelect(db).where(eq(orders.id, orderId)).limit(1);
  if (!x || (user.role === 'designer' && x.o.customerId !== user.id)) throw notFound('Order');
  return toOrderView(x);
}

/** One order for server-side use (mail after a payment event): no access rule, never answer it to a caller as is. */
export async function orderById(db: Db | Tx, orderId: number): Promise<OrderView> {
  const [x] = await orderSelect(db).where(eq(orders.id, orderId)).limit(1);
  if (!x) throw notFound('Order');
  return toOrderView(x);
}

/** The shop moves a paid order along: paid → in production → inspected → shipped, one step at a time. */
export async function advanceOrder(db: Db, user: SessionUser, orderId: number, input: { state: OrderState; note?: string }): Promise<OrderView> {
  if (!['machinist', 'engineer', 'admin'].includes(user.role)) throw forbidden('Only the shop (machinist, engineer or admin) moves an order along.');
  try {
    await advanceInTransaction(db, user, orderId, input);
  } catch (e) {
    // another order took the same inspection at the same moment (unique inspection per order)
    if (isDuplicate(e)) throw new AppError(409, 'inspection_used', `That inspection has just been used for another order; inspect this order's part (Shop → Inspections) and try again.`);
    throw e;
  }
  return getOrder(db, user, orderId);
}

async function advanceInTransaction(db: Db, user: SessionUser, orderId: number, input: { state: OrderState; note?: string }): Promise<void> {
  await db.transaction(async (tx) => {
    const [o] = await tx.select().from(orders).where(eq(orders.id, orderId)).for('update');
    if (!o) throw notFound('Order');
    const ref = orderReference(o.id);
    if (o.state === 'awaiting_payment') throw new AppError(409, 'awaiting_payment', `Order ${ref} is awaiting payment; it becomes paid only when the payment service confirms it.`, { state: o.state });
    const next = NEXT_SHOP_STATE[o.state];
    if (input.state === o.state) throw new AppError(409, 'invalid_transition', `Order ${ref} is already ${ORDER_STATE_LABEL[o.state].toLowerCase()}.`, { state: o.state });
    if (input.state !== next) {
      throw new AppError(409, 'invalid_transition', next ? `Order ${ref} is ${ORDER_STATE_LABEL[o.state].toLowerCase()}; the next step is ${ORDER_STATE_LABEL[next].toLowerCase()}, not ${ORDER_STATE_LABEL[input.state].toLowerCase()}.` : `Order ${ref} is shipped; it has no further step.`, { state: o.state, nextState: next ?? null });
    }
    const details: Record<string, unknown> = { from: o.state, to: input.state };
    if (input.state === 'inspected') {
      const result = await inspectionResultForOrder(tx, o);
      if (result.status === 'failed') throw new AppError(409, 'inspection_failed', `The part of order ${ref} failed inspection (${result.detail}); record a passed inspection, or have an engineer accept the deviation, before marking it inspected.`, { inspectionId: result.inspectionId });
      if (result.status === 'none') throw new AppError(409, 'not_inspected', `Order ${ref} has no passed or accepted inspection since it was paid (each inspection serves one order); inspect this order's part against the approved revision first (Shop → Inspections).`);
      details.inspection = result;
    }
    const set: Partial<typeof orders.$inferInsert> = { state: input.state, updatedAt: new Date() };
    if (input.state === 'inspected') set.inspectionId = (details.inspection as { inspectionId?: number }).inspectionId ?? null;
    if (input.state === 'shipped') {
      set.shippedAt = new Date();
      if (input.note?.trim()) set.trackingNote = input.note.trim().slice(0, 500);
    }
    await tx.update(orders).set(set).where(eq(orders.id, orderId));
    if (input.note) details.note = input.note;
    await audit(tx, user.id, `order.${input.state}`, { type: 'order', id: orderId }, details);
  });
}

// ── Payment events ────────────────────────────────────────────────────────────────────────────

export type EventOutcome = 'applied' | 'declined' | 'ignored' | 'unmatched' | 'duplicate';

export interface EventResult {
  outcome: EventOutcome;
  detail: string;
  orderId: number | null;
  /** set when this event marked the order paid (so the caller e-mails the customer) */
  paid?: boolean;
}

type SessionLike = { id: string; payment_status?: string; amount_total?: number | null; currency?: string | null; payment_intent?: string | { id: string } | null; metadata?: Record<string, string> | null };
type IntentLike = { id: string; metadata?: Record<string, string> | null; last_payment_error?: { message?: string } | null };

/**
 * Take in one verified payment event, exactly once: the event id is stored in the same
 * transaction as the change it makes, so a replay (or a second delivery at the same moment)
 * finds the id taken and changes nothing. Events about an order that has moved on (out of
 * order) are recorded and ignored.
 */
export async function applyPaymentEvent(db: Db, event: PaymentEvent): Promise<EventResult> {
  try {
    return await db.transaction(async (tx) => {
      const [seen] = await tx.select({ id: paymentEvents.id }).from(paymentEvents).where(eq(paymentEvents.eventId, event.id)).limit(1);
      if (seen) return { outcome: 'duplicate', detail: 'this event was already taken in', orderId: null } satisfies EventResult;
      const result = await decide(tx, event);
      await tx.insert(paymentEvents).values({ eventId: event.id, type: event.type, orderId: result.orderId, outcome: result.outcome, detail: result.detail.slice(0, 500) });
      if (result.orderId && (result.outcome === 'applied' || result.outcome === 'declined')) {
        await audit(tx, null, result.outcome === 'applied' ? 'order.paid' : 'order.payment_declined', { type: 'order', id: result.orderId }, { eventId: event.id, eventType: event.type, detail: result.detail });
      }
      return result;
    });
  } catch (e) {
    if (isDuplicate(e)) return { outcome: 'duplicate', detail: 'this event was already taken in', orderId: null };
    throw e;
  }
}

async function lockOrderBy(tx: Tx, where: ReturnType<typeof eq>) {
  const [o] = await tx.select().from(orders).where(where).for('update');
  return o;
}

async function decide(tx: Tx, event: PaymentEvent): Promise<EventResult> {
  const obj = event.data.object as unknown;
  switch (event.type) {
    case 'checkout.session.completed':
    case 'checkout.session.async_payment_succeeded': {
      const s = obj as SessionLike;
      const o = await lockOrderBy(tx, eq(orders.checkoutSessionId, s.id));
      if (!o) return { outcome: 'unmatched', detail: `no order has checkout session ${s.id}`, orderId: null };
      if (o.state !== 'awaiting_payment') return { outcome: 'ignored', detail: `order is already ${o.state}`, orderId: o.id };
      if (s.payment_status !== 'paid') return { outcome: 'ignored', detail: `checkout finished with payment status ${s.payment_status ?? 'unknown'}; waiting for the payment`, orderId: o.id };
      if (s.amount_total !== o.amountMinor || (s.currency ?? '').toUpperCase() !== o.currency) {
        await tx.update(orders).set({ lastPaymentProblem: `paid amount ${s.amount_total} ${s.currency} does not match the order (${o.amountMinor} ${o.currency}); check with the payment service`, updatedAt: new Date() }).where(eq(orders.id, o.id));
        return { outcome: 'ignored', detail: `amount ${s.amount_total} ${s.currency} differs from the order's ${o.amountMinor} ${o.currency}`, orderId: o.id };
      }
      const pi = typeof s.payment_intent === 'string' ? s.payment_intent : (s.payment_intent?.id ?? null);
      await tx.update(orders).set({ state: 'paid', paidAt: new Date(), paymentReference: pi, lastPaymentProblem: null, updatedAt: new Date() }).where(eq(orders.id, o.id));
      return { outcome: 'applied', detail: `paid ${o.amountMinor} ${o.currency}`, orderId: o.id, paid: true };
    }
    case 'payment_intent.payment_failed':
    case 'checkout.session.async_payment_failed':
    case 'checkout.session.expired': {
      let o;
      let reason: string;
      if (event.type === 'payment_intent.payment_failed') {
        const pi = obj as IntentLike;
        const quoteId = Number(pi.metadata?.quoteId);
        o = Number.isSafeInteger(quoteId) && quoteId > 0 ? await lockOrderBy(tx, eq(orders.quoteId, quoteId)) : undefined;
        reason = pi.last_payment_error?.message ?? 'the payment was declined';
      } else {
        const s = obj as SessionLike;
        o = await lockOrderBy(tx, eq(orders.checkoutSessionId, s.id));
        reason = event.type === 'checkout.session.expired' ? 'the checkout page expired before payment' : 'the payment did not go through';
      }
      if (!o) return { outcome: 'unmatched', detail: 'no order for this payment', orderId: null };
      if (o.state !== 'awaiting_payment') return { outcome: 'ignored', detail: `order is already ${o.state}; a late failure changes nothing`, orderId: o.id };
      await tx.update(orders).set({ lastPaymentProblem: reason.slice(0, 500), updatedAt: new Date() }).where(eq(orders.id, o.id));
      return { outcome: 'declined', detail: reason, orderId: o.id };
    }
    default:
      return { outcome: 'ignored', detail: `Platewright does not act on ${event.type}`, orderId: null };
  }
}
