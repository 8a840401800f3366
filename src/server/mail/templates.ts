import Mustache from 'mustache';
import invitationText from '../../../templates/email/invitation.txt?raw';
import invitationHtml from '../../../templates/email/invitation.html?raw';
import resetText from '../../../templates/email/password-reset.txt?raw';
import resetHtml from '../../../templates/email/password-reset.html?raw';
import notificationText from '../../../templates/email/notification.txt?raw';
import notificationHtml from '../../../templates/email/notification.html?raw';
import quoteReadyText from '../../../templates/email/quote-ready.txt?raw';
import quoteReadyHtml from '../../../templates/email/quote-ready.html?raw';
import paymentReceivedText from '../../../templates/email/payment-received.txt?raw';
import paymentReceivedHtml from '../../../templates/email/payment-received.html?raw';
import orderShippedText from '../../../templates/email/order-shipped.txt?raw';
import orderShippedHtml from '../../../templates/email/order-shipped.html?raw';

// E-mail templates live in templates/email/: NAME.txt (first line "Subject: …", a blank line, the
// plain-text body) and NAME.html. Values are escaped for HTML and inserted as they are in text.

export interface TemplateVars {
  invitation: { inviterName: string; roleLabel: string; roleDuty: string; link: string; expiresAt: string };
  'password-reset': { name: string; email: string; link: string; validMinutes: number; expiresAt: string };
  notification: { name: string; subject: string; body: string; link?: string; linkLabel?: string };
  'quote-ready': { name: string; reference: string; shopName: string; partNumber: string; revision: number; plateTitle: string; quantity: number; lines: { label: string; basis: string; amount: string }[]; total: string; taxLabel: string; validUntil: string; link: string };
  'payment-received': { name: string; reference: string; partNumber: string; revision: number; plateTitle: string; quantity: number; total: string; link: string };
  'order-shipped': { name: string; reference: string; partNumber: string; revision: number; plateTitle: string; quantity: number; trackingNote: string | null; link: string };
}
export type TemplateName = keyof TemplateVars;

const SOURCES: Record<TemplateName, { text: string; html: string }> = {
  invitation: { text: invitationText, html: invitationHtml },
  'password-reset': { text: resetText, html: resetHtml },
  notification: { text: notificationText, html: notificationHtml },
  'quote-ready': { text: quoteReadyText, html: quoteReadyHtml },
  'payment-received': { text: paymentReceivedText, html: paymentReceivedHtml },
  'order-shipped': { text: orderShippedText, html: orderShippedHtml },
};

export interface RenderedEmail {
  subject: string;
  text: string;
  html: string;
}

const asIs = (value: unknown) => String(value);
/** The five characters that matter in HTML text and quoted attributes (links stay readable). */
const escapeHtml = (value: unknown) =>
  String(value).replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);

export function renderEmail<N extends TemplateName>(name: N, vars: TemplateVars[N]): RenderedEmail {
  const source = SOURCES[name];
  const text = Mustache.render(source.text, vars, {}, { escape: asIs });
  const match = /^Subject: (.*)\r?\n\r?\n/.exec(text);
  if (!match) throw new Error(`templates/email/${name}.txt must start with a "Subject: …" line and a blank line`);
  return {
    subject: match[1].trim(),
    text: text.slice(match[0].length).replace(/\n{3,}/g, '\n\n'),
    html: Mustache.render(source.html, vars, {}, { escape: escapeHtml }),
  };
}
