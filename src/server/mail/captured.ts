import { readdir, readFile } from 'node:fs/promises';
import { join } from 'node:path';

/**
 * A message caught by the local mail catcher (scripts/fake-smtp.ts), one JSON file per message in
 * MAIL_FAKE_DIR. The app reads them for /admin/mail; the tests read them to follow e-mailed links.
 */
export interface CapturedMail {
  id: string;
  receivedAt: string;
  envelope: { from: string | null; to: string[] };
  from: string;
  to: string;
  subject: string;
  text: string;
  html: string | null;
}

const ID = /^[0-9]{13}-[a-f0-9]{8}$/;

/** Newest first. A folder that does not exist yet holds no mail. */
export async function listCapturedMail(dir: string, limit = 200): Promise<CapturedMail[]> {
  let names: string[];
  try {
    names = await readdir(dir);
  } catch (err) {
    if ((err as NodeJS.ErrnoException).code === 'ENOENT') return [];
    throw err;
  }
  const ids = names.filter((n) => n.endsWith('.json')).map((n) => n.slice(0, -5)).filter((id) => ID.test(id));
  ids.sort().reverse();
  const out: CapturedMail[] = [];
  for (const id of ids.slice(0, limit)) {
    const m = await readCapturedMail(dir, id);
    if (m) out.push(m);
  }
  return out;
}

export async function readCapturedMail(dir: string, id: string): Promise<CapturedMail | null> {
  if (!ID.test(id)) return null;
  try {
    return JSON.parse(await readFile(join(dir, `${id}.json`), 'utf8')) as CapturedMail;
  } catch {
    return null;
  }
}

export function isCapturedMailId(id: string): boolean {
  return ID.test(id);
}
