/**
 * The local mail catcher: an SMTP server on 127.0.0.1 that accepts every message and stores it,
 * parsed, as one JSON file in a folder. Never used in production.
 *   MAIL_FAKE_PORT (default 2526), MAIL_FAKE_DIR (default .data/mail), MAIL_FAKE_PIDFILE (optional)
 * Run by scripts/mail-fake.sh (npm start / npm test), not by hand.
 */
import { SMTPServer } from 'smtp-server';
import { simpleParser, type AddressObject } from 'mailparser';
import { mkdirSync, renameSync, rmSync, writeFileSync } from 'node:fs';
import { randomBytes } from 'node:crypto';
import { join, resolve } from 'node:path';
import type { CapturedMail } from '../src/server/mail/captured';

const port = Number(process.env.MAIL_FAKE_PORT ?? 2526);
const dir = resolve(process.env.MAIL_FAKE_DIR ?? '.data/mail');
const pidFile = process.env.MAIL_FAKE_PIDFILE;
mkdirSync(dir, { recursive: true });

const addressText = (a: AddressObject | AddressObject[] | undefined): string =>
  a === undefined ? '' : (Array.isArray(a) ? a : [a]).map((x) => x.text).join(', ');

let lastStamp = 0;
function newId(): string {
  // Sortable by arrival: millisecond stamp (strictly increasing), then random.
  lastStamp = Math.max(Date.now(), lastStamp + 1);
  return `${lastStamp}-${randomBytes(4).toString('hex')}`;
}

const server = new SMTPServer({
  authOptional: true,
  disabledCommands: ['STARTTLS'],
  banner: 'Platewright local mail catcher',
  size: 10 * 1024 * 1024,
  onData(stream, session, callback) {
    simpleParser(stream)
      .then((parsed) => {
        const id = newId();
        const mail: CapturedMail = {
          id,
          receivedAt: new Date().toISOString(),
          envelope: {
            from: session.envelope.mailFrom ? session.envelope.mailFrom.address : null,
            to: session.envelope.rcptTo.map((r) => r.address),
          },
          from: addressText(parsed.from),
          to: addressText(parsed.to),
          subject: parsed.subject ?? '',
          text: parsed.text ?? '',
          html: typeof parsed.html === 'string' ? parsed.html : null,
        };
        mkdirSync(dir, { recursive: true }); // the folder may have been emptied meanwhile
        const tmp = join(dir, `.${id}.tmp`);
        writeFileSync(tmp, JSON.stringify(mail, null, 2));
        renameSync(tmp, join(dir, `${id}.json`)); // readers never see half a file
        callback();
      })
      .catch((err: Error) => callback(err));
  },
});

server.on('error', (err: NodeJS.ErrnoException) => {
  if (err.code === 'EADDRINUSE') {
    console.error(`[fake-smtp] port ${port} on 127.0.0.1 is taken by another program — choose another with MAIL_FAKE_PORT=…`);
    process.exit(2);
  }
  console.error(`[fake-smtp] ${err.message}`);
});

server.listen(port, '127.0.0.1', () => {
  if (pidFile) writeFileSync(pidFile, String(process.pid));
  console.log(`[fake-smtp] listening on 127.0.0.1:${port}, storing messages in ${dir}`);
});

function stop() {
  server.close(() => {
    if (pidFile) rmSync(pidFile, { force: true });
    process.exit(0);
  });
  setTimeout(() => process.exit(0), 2000).unref();
}
process.on('SIGTERM', stop);
process.on('SIGINT', stop);
