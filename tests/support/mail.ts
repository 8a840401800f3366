import { listCapturedMail, type CapturedMail } from '../../src/server/mail/captured';

/** The folder the test run's mail catcher writes to (set by scripts/test.sh). */
export function mailDir(): string {
  const dir = process.env.MAIL_FAKE_DIR;
  if (!dir) throw new Error('MAIL_FAKE_DIR is not set: run the tests through npm test, which starts the mail catcher');
  return dir;
}

/** Wait until a message to this address (and matching the subject, if given) has been caught. */
export async function waitForMail(to: string, subject?: RegExp, timeoutMs = 10_000): Promise<CapturedMail> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const found = (await listCapturedMail(mailDir())).find((m) => m.envelope.to.includes(to) && (!subject || subject.test(m.subject)));
    if (found) return found;
    if (Date.now() > deadline) throw new Error(`no mail to ${to}${subject ? ` matching ${subject}` : ''} within ${timeoutMs} ms`);
    await new Promise((r) => setTimeout(r, 100));
  }
}

export async function mailTo(to: string): Promise<CapturedMail[]> {
  return (await listCapturedMail(mailDir())).filter((m) => m.envelope.to.includes(to));
}

/** The first link in a message's text that starts with base + path prefix. */
export function linkIn(mail: CapturedMail, base: string, pathPrefix: string): string {
  const links = mail.text.match(/https?:\/\/[^\s<>"]+/g) ?? [];
  const link = links.find((l) => l.startsWith(base + pathPrefix));
  if (!link) throw new Error(`no ${pathPrefix} link in the mail "${mail.subject}": ${links.join(', ') || 'no links at all'}`);
  return link;
}
