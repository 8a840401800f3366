import Mustache from 'mustache';
import invitationText from '../../../templates/email/invitation.txt?raw';
import invitationHtml from '../../../templates/email/invitation.html?raw';
import resetText from '../../../templates/email/password-reset.txt?raw';
import resetHtml from '../../../templates/email/password-reset.html?raw';
import notificationText from '../../../templates/email/notification.txt?raw';
import notificationHtml from '../../../templates/email/notification.html?raw';

// E-mail templates live in templates/email/: NAME.txt (first line "Subject: …", a blank line, the
// plain-text body) and NAME.html. Values are escaped for HTML and inserted as they are in text.

export interface TemplateVars {
  invitation: { inviterName: string; roleLabel: string; roleDuty: string; link: string; expiresAt: string };
  'password-reset': { name: string; email: string; link: string; validMinutes: number; expiresAt: string };
  notification: { name: string; subject: string; body: string; link?: string; linkLabel?: string };
}
export type TemplateName = keyof TemplateVars;

const SOURCES: Record<TemplateName, { text: string; html: string }> = {
  invitation: { text: invitationText, html: invitationHtml },
  'password-reset': { text: resetText, html: resetHtml },
  notification: { text: notificationText, html: notificationHtml },
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
