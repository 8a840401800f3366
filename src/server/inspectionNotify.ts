import { getDb } from './db/client';
import { authConfig } from './config';
import { sendTemplate } from './mail/mailer';
import { audit } from './repos/audit';
import { revisionAuthor } from './repos/inspections';

function link(path: string): string {
  let base = 'http://127.0.0.1:4321';
  try {
    base = authConfig().appUrl ?? `http://${process.env.HOST ?? '127.0.0.1'}:${process.env.PORT ?? '4321'}`;
  } catch {
    /* config problems are reported at start */
  }
  return base.replace(/\/$/, '') + path;
}

const WORD: Record<string, string> = { passed: 'passed', failed: 'failed', accepted_with_deviation: 'was accepted with deviation' };

/**
 * The report link to the revision's designer when an inspection completes (or a failed one is
 * accepted). The state change is committed first: a refusing mail server is logged, never undoes it.
 */
export async function notifyInspection(e: { inspectionId: number; revisionId: number; partNumber: string; revision: number; state: string; failing: readonly string[] }) {
  const out = { sent: [] as string[], failed: [] as string[] };
  const author = await revisionAuthor(getDb(), e.revisionId);
  if (author && author.active) {
    const subject = `Inspection ${WORD[e.state] ?? e.state}: ${e.partNumber} rev ${e.revision}`;
    const body = `The machined ${e.partNumber} revision ${e.revision} ${WORD[e.state] ?? e.state} inspection #${e.inspectionId}.${e.failing.length ? `\n\nOut of tolerance: ${e.failing.join(', ')}.` : ''}\n\nThe report lists every feature with nominal, measured, deviation and tolerance.`;
    try {
      await sendTemplate(author.email, 'notification', { name: author.name, subject, body, link: link(`/api/inspections/${e.inspectionId}/report.pdf`), linkLabel: 'Open the inspection report (PDF)' });
      out.sent.push(author.email);
    } catch (err) {
      out.failed.push(author.email);
      console.error(`[platewright] inspection e-mail to ${author.email} failed: ${err instanceof Error ? err.message : String(err)}`);
    }
  }
  await audit(getDb(), null, 'mail.inspection', { type: 'inspection', id: e.inspectionId }, { state: e.state, sent: out.sent, failed: out.failed }).catch(() => {});
  return out;
}
