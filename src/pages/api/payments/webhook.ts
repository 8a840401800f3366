import type { APIRoute } from 'astro';
import { getDb } from '~/server/db/client';
import { handle } from '~/server/errors';
import { json, jsonError } from '~/server/http';
import { paymentsConfig } from '~/server/payments/config';
import { paymentsClient, type PaymentEvent } from '~/server/payments/client';
import { applyPaymentEvent, orderById } from '~/server/repos/orders';
import { mailPaymentReceived } from '~/server/orderMail';
import { appBase } from '~/server/appBase';

/**
 * Payment events from the payment service. The signature is checked by the SDK on the raw body
 * (never on re-serialised JSON); a bad one answers 400 and nothing is recorded. Each event is
 * taken in once (see applyPaymentEvent): replays answer 200 and change nothing.
 */
export const POST: APIRoute = ({ request }) =>
  handle(async () => {
    const cfg = paymentsConfig();
    const raw = await request.text();
    if (raw.length > 1_000_000) return jsonError(413, 'too_large', 'A payment event is never this large.');
    const signature = request.headers.get('stripe-signature');
    if (!signature) return jsonError(400, 'bad_signature', 'The Stripe-Signature header is missing; nothing was changed.');
    let event: PaymentEvent;
    try {
      event = paymentsClient(cfg).webhooks.constructEvent(raw, signature, cfg.webhookSecret);
    } catch (e) {
      return jsonError(400, 'bad_signature', `The event's signature does not verify (${e instanceof Error ? e.message.split('\n')[0] : 'invalid'}); nothing was changed.`);
    }
    const result = await applyPaymentEvent(getDb(), event);
    if (result.paid && result.orderId) {
      const order = await orderById(getDb(), result.orderId);
      await mailPaymentReceived(order, appBase(request));
    }
    return json({ received: true, eventId: event.id, outcome: result.outcome, detail: result.detail });
  });
