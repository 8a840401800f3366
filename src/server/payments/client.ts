/** The payment SDK, configured from paymentsConfig(): one client per settings. */
import Stripe from 'stripe';
import { paymentsConfig, type PaymentsConfig } from './config';

let cached: { key: string; client: Stripe } | undefined;

export function paymentsClient(cfg: PaymentsConfig = paymentsConfig()): Stripe {
  const key = `${cfg.secretKey}|${cfg.api?.base ?? ''}`;
  if (!cached || cached.key !== key) {
    cached = {
      key,
      client: new Stripe(cfg.secretKey, {
        ...(cfg.api ? { host: cfg.api.host, port: cfg.api.port, protocol: cfg.api.protocol } : {}),
        maxNetworkRetries: 1,
        timeout: 15_000,
        telemetry: false,
      }),
    };
  }
  return cached.client;
}

export type PaymentEvent = Stripe.Event;
export type CheckoutSession = Stripe.Checkout.Session;
