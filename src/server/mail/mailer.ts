import nodemailer, { type Transporter } from 'nodemailer';
import { authConfig } from '../config';
import { renderEmail, type TemplateName, type TemplateVars } from './templates';

let transport: { url: string; transporter: Transporter } | undefined;

/** Short timeouts unless the URL sets its own (nodemailer reads transport options from the query). */
function withTimeouts(url: string): string {
  const u = new URL(url);
  for (const [k, v] of [['connectionTimeout', '5000'], ['greetingTimeout', '5000'], ['socketTimeout', '10000']]) {
    if (!u.searchParams.has(k)) u.searchParams.set(k, v);
  }
  return u.toString();
}

function transporter(): Transporter {
  const { smtpUrl } = authConfig();
  if (!transport || transport.url !== smtpUrl) {
    transport = { url: smtpUrl, transporter: nodemailer.createTransport(withTimeouts(smtpUrl)) };
  }
  return transport.transporter;
}

export class MailError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'MailError';
  }
}

/** Render a template from templates/email/ and send it over SMTP. Throws MailError when the server refuses. */
export async function sendTemplate<N extends TemplateName>(to: string, name: N, vars: TemplateVars[N]): Promise<{ messageId: string }> {
  const mail = renderEmail(name, vars);
  try {
    const info = await transporter().sendMail({ from: authConfig().mailFrom, to, subject: mail.subject, text: mail.text, html: mail.html });
    return { messageId: info.messageId };
  } catch (err) {
    // The reason only, never the message (it carries a one-time link).
    throw new MailError(`the mail server did not take the message (${err instanceof Error ? err.message : String(err)})`);
  }
}
