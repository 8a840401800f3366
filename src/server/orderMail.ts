/**
 * Order e-mails: quote ready, payment received, order shipped. The change is committed before
 * these run; a mail server that refuses is logged and audited, it never undoes the change.
 */
import { eq } from 'drizzle-orm';
import { getDb } from './db/client';
import { users } from './db/schema';
import { sendTemplate } from './mail/mailer';
import type { TemplateName, TemplateVars } from './mail/templates';
import { audit } from './repos/audit';
import type { OrderView, QuoteView } from './repos/orders';
import { formatMoney } from '~/domain/quote';

const when = (iso: string) => new Date(iso).toLocaleDateString('en-GB', { day: 'numeric', month: 'long', year: 'numeric', timeZone: 'UTC' });

async function deliver<N extends TemplateName>(to: { email: string; name: string }[], name: N, vars: (r: { name: string }) => TemplateVars[N], target: { type: string; id: number }): Promise<{ sent: string[]; failed: string[] }> {
  const out = { sent: [] as string[], failed: [] as string[] };
  for (const r of to) {
    try {
      await sendTemplate(r.email, name, vars(r));
      out.sent.push(r.email);
    } catch (e) {
      out.failed.push(r.email);
      console.error(`[platewright] ${name} e-mail to ${r.email} failed: ${e instanceof Error ? e.message : String(e)}`);
    }
  }
  await audit(getDb(), null, `mail.${name}`, target, out).catch(() => {});
  return out;
}

export async function mailQuoteReady(q: QuoteView, to: { email: string; name: string }[], shopName: string, taxLabel: string, appBase: string) {
  const m = (minor: number) => formatMoney(minor, q.currency, q.currencyMinorDigits);
  return deliver(
    to,
    'quote-ready',
    (r) => ({
      name: r.name,
      reference: q.reference,
      shopName,
      partNumber: q.partNumber,
      revision: q.revisionNumber,
      plateTitle: q.plateTitle,
      quantity: q.quantity,
      lines: q.lines.map((l) => ({ label: l.label, basis: l.basis, amount: m(l.amountMinor) })),
      total: m(q.totals.totalMinor),
      taxLabel,
      validUntil: when(q.validUntil),
      link: `${appBase}/plates/${q.plateId}?rev=${q.revisionId}#quote`,
    }),
    { type: 'quote', id: q.id },
  );
}

async function customer(o: OrderView) {
  const [u] = await getDb().select({ email: users.email, name: users.name, active: users.active }).from(users).where(eq(users.id, o.customer.id));
  return u && u.active ? [u] : [];
}

export async function mailPaymentReceived(o: OrderView, appBase: string) {
  return deliver(
    await customer(o),
    'payment-received',
    (r) => ({ name: r.name, reference: o.reference, partNumber: o.partNumber, revision: o.revisionNumber, plateTitle: o.plateTitle, quantity: o.quantity, total: formatMoney(o.amountMinor, o.currency, o.currencyMinorDigits), link: `${appBase}/orders#${o.reference}` }),
    { type: 'order', id: o.id },
  );
}

export async function mailOrderShipped(o: OrderView, appBase: string) {
  return deliver(
    await customer(o),
    'order-shipped',
    (r) => ({ name: r.name, reference: o.reference, partNumber: o.partNumber, revision: o.revisionNumber, plateTitle: o.plateTitle, quantity: o.quantity, trackingNote: o.trackingNote, link: `${appBase}/orders#${o.reference}` }),
    { type: 'order', id: o.id },
  );
}
