import { and, eq } from 'drizzle-orm';
import { getDb } from './db/client';
import { users, type Role } from './db/schema';
import type { SessionUser } from './auth/types';
import { authConfig } from './config';
import { sendTemplate } from './mail/mailer';
import type { TransitionResult } from './repos/revisions';
import { audit } from './repos/audit';

/**
 * Workflow e-mails. The state change is already committed when these run: a mail server that
 * refuses is logged and reported back (`notified.failed`), it never undoes an approval.
 */
export interface Notified {
  sent: string[];
  failed: string[];
}

function link(path: string): string {
  let base = 'http://127.0.0.1:4321';
  try {
    base = authConfig().appUrl ?? `http://${process.env.HOST ?? '127.0.0.1'}:${process.env.PORT ?? '4321'}`;
  } catch {
    /* config problems are reported at start */
  }
  return base.replace(/\/$/, '') + path;
}

async function activeWithRole(role: Role): Promise<{ email: string; name: string }[]> {
  return getDb().select({ email: users.email, name: users.name }).from(users).where(and(eq(users.role, role), eq(users.active, true)));
}

async function byId(id: string): Promise<{ email: string; name: string; active: boolean } | undefined> {
  const [u] = await getDb().select({ email: users.email, name: users.name, active: users.active }).from(users).where(eq(users.id, id));
  return u;
}

async function send(to: { email: string; name: string }[], subject: string, body: string, path: string, linkLabel: string, event: TransitionResult): Promise<Notified> {
  const out: Notified = { sent: [], failed: [] };
  for (const r of to) {
    try {
      await sendTemplate(r.email, 'notification', { name: r.name, subject, body, link: link(path), linkLabel });
      out.sent.push(r.email);
    } catch (e) {
      out.failed.push(r.email);
      console.error(`[platewright] workflow e-mail to ${r.email} failed: ${e instanceof Error ? e.message : String(e)}`);
    }
  }
  await audit(getDb(), null, 'mail.workflow', { type: 'revision', id: event.revisionId }, { subject, sent: out.sent, failed: out.failed }).catch(() => {});
  return out;
}

export async function notifySubmitted(e: TransitionResult, by: SessionUser, comment: string): Promise<Notified> {
  const engineers = (await activeWithRole('engineer')).filter((u) => u.email !== by.email);
  return send(
    engineers,
    `Review requested: ${e.partNumber} rev ${e.number}`,
    `${by.name} submitted ${e.partNumber} revision ${e.number} for review.${comment ? `\n\nTheir note: “${comment}”` : ''}\n\nCheck every finding, then approve or request changes.`,
    `/plates/${e.plateId}?rev=${e.revisionId}`,
    'Open the revision',
    e,
  );
}

export async function notifyChangesRequested(e: TransitionResult, by: SessionUser, comment: string): Promise<Notified> {
  const author = await byId(e.authorId);
  return send(
    author && author.active ? [author] : [],
    `Changes requested: ${e.partNumber} rev ${e.number}`,
    `${by.name} asked for changes to ${e.partNumber} revision ${e.number}:\n\n“${comment}”\n\nSave a new revision with the changes and submit it again.`,
    `/plates/${e.plateId}?rev=${e.revisionId}`,
    'Open the revision',
    e,
  );
}

export async function notifyReleased(e: TransitionResult, by: SessionUser): Promise<Notified> {
  const machinists = await activeWithRole('machinist');
  const author = await byId(e.authorId);
  const to = [...machinists, ...(author && author.active ? [author] : [])];
  return send(
    to,
    `Released: ${e.partNumber} rev ${e.number}`,
    `${by.name} approved ${e.partNumber} revision ${e.number}. Its drawing, DXF and STEP are ready in the shop, with their SHA-256 hashes.${e.supersededRevisionId ? ' The previous release is superseded: do not cut from its files.' : ''}\n\nBefore running the part: bolts of proper grade and length at the maker's torque, thread locking, containment where rules ask for it, and a runout check with a dial indicator.`,
    `/shop`,
    'Open the shop',
    e,
  );
}
