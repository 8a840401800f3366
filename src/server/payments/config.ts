/**
 * Payment settings, read from the environment on each call (never baked in at build time).
 *
 * Production: STRIPE_SECRET_KEY and STRIPE_WEBHOOK_SECRET are required; without them the payment
 * routes answer 503 and change nothing. Elsewhere (npm start / npm test) the SDK talks to the
 * local fake payment server (scripts/fake-payments.ts) at PAYMENTS_API_BASE, default
 * http://127.0.0.1:$PAYMENTS_FAKE_PORT (12111), with fake keys both sides share. A developer who
 * sets real test keys (STRIPE_SECRET_KEY) and no PAYMENTS_API_BASE talks to the real test service.
 */
import { AppError } from '../errors';

export const FAKE_SECRET_KEY = 'sk_test_platewright_local_fake_key';
export const FAKE_WEBHOOK_SECRET = 'whsec_platewright_local_fake_secret';

function env(name: string): string | undefined {
  const value = process.env[name];
  return value === undefined || value === '' ? undefined : value;
}

export interface PaymentsConfig {
  secretKey: string;
  webhookSecret: string;
  /** where the SDK sends its requests; null = the payment service's own address */
  api: { host: string; port: number; protocol: 'http' | 'https'; base: string } | null;
  /** true when talking to the local fake */
  local: boolean;
}

/** The settings, or a 503 AppError naming what is missing. */
export function paymentsConfig(): PaymentsConfig {
  const production = env('NODE_' + 'ENV') === 'production';
  const problems: string[] = [];
  const secretKey = env('STRIPE_SECRET_KEY') ?? (production ? '' : FAKE_SECRET_KEY);
  const webhookSecret = env('STRIPE_WEBHOOK_SECRET') ?? (production ? '' : FAKE_WEBHOOK_SECRET);
  if (!secretKey) problems.push('STRIPE_SECRET_KEY is not set');
  if (!webhookSecret) problems.push('STRIPE_WEBHOOK_SECRET is not set');
  let base = env('PAYMENTS_API_BASE');
  if (!base && !production && !env('STRIPE_SECRET_KEY')) base = `http://127.0.0.1:${env('PAYMENTS_FAKE_PORT') ?? '12111'}`;
  let api: PaymentsConfig['api'] = null;
  if (base) {
    try {
      const u = new URL(base);
      if (u.protocol !== 'http:' && u.protocol !== 'https:') throw new Error('protocol');
      const protocol = u.protocol === 'https:' ? 'https' : 'http';
      api = { host: u.hostname, port: Number(u.port || (protocol === 'https' ? 443 : 80)), protocol, base: u.origin };
    } catch {
      problems.push(`PAYMENTS_API_BASE must be an http:// or https:// address, got "${base}"`);
    }
  }
  if (problems.length) {
    throw new AppError(503, 'payments_not_configured', `Payments are not set up on this server (${problems.join('; ')}); nothing was changed. The operator sets them in the environment.`);
  }
  return { secretKey, webhookSecret, api, local: !!api && (api.host === '127.0.0.1' || api.host === 'localhost') };
}
