import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { execFileSync, spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { eq } from 'drizzle-orm';
import { closeDb, getDb } from '../../src/server/db/client';
import { invitations, passwordResetTokens } from '../../src/server/db/schema';
import { startServer, testAppPort, type RunningServer } from '../support/server';
import { ApiClient, makeUser, tag } from '../support/auth';
import { linkIn, waitForMail } from '../support/mail';

// Production mode: no defaults for the secret, the mail server or the public address; Secure
// cookies; no captured-mail page even if the catcher's folder is in the environment.

const ROOT = fileURLToPath(new URL('../..', import.meta.url));
const PASSWORD = `Bellhousing-${tag()}-Register`;
const PROD = {
  NODE_ENV: 'production',
  APP_SECRET: 'a-test-only-secret-of-forty-characters-x',
  APP_URL: 'https://plates.example.test',
};

afterAll(async () => {
  await closeDb();
});

describe('production settings', () => {
  it('the built server refuses to start without APP_SECRET, SMTP_URL and APP_URL, and says which', async () => {
    let failure = '';
    try {
      const s = await startServer(testAppPort(5), { NODE_ENV: 'production', APP_SECRET: '', SMTP_URL: '', APP_URL: '' });
      await s.stop();
    } catch (err) {
      failure = err instanceof Error ? err.message : String(err);
    }
    expect(failure).toMatch(/server exited \(1\)/);
    expect(failure).toContain('APP_SECRET must be set');
    expect(failure).toContain('SMTP_URL must point at the mail server');
    expect(failure).toContain('APP_URL must be the public address');
  });

  it('npm start checks the same before serving, and seeds nothing in production', () => {
    const env = { ...process.env, NODE_ENV: 'production', APP_SECRET: '', SMTP_URL: '', APP_URL: '', SEED_DEMO: '' };
    const check = spawnSync('npx', ['tsx', 'scripts/check-config.ts'], { cwd: ROOT, env, encoding: 'utf8' });
    expect(check.status).toBe(1);
    expect(check.stderr).toContain('Platewright cannot start');
    const ok = spawnSync('npx', ['tsx', 'scripts/check-config.ts'], { cwd: ROOT, env: { ...env, ...PROD, SMTP_URL: 'smtp://127.0.0.1:1' }, encoding: 'utf8' });
    expect(ok.status).toBe(0);
    const seeded = execFileSync('npx', ['tsx', 'scripts/seed.ts'], { cwd: ROOT, env: { ...env, SEED_DEMO: '' }, encoding: 'utf8' });
    expect(seeded).toContain('production mode: no demo data seeded');
  });

  describe('with the settings given', () => {
    let server: RunningServer;
    beforeAll(async () => {
      server = await startServer(testAppPort(6), PROD); // SMTP_URL and MAIL_FAKE_DIR come from npm test
    });
    afterAll(async () => {
      await server?.stop();
    });

    it('sets a Secure cookie, links e-mails to APP_URL and has no captured-mail page', async () => {
      const a = await makeUser(getDb(), { role: 'admin', password: PASSWORD });
      const c = new ApiClient(server.baseUrl);
      expect((await c.signIn(a.email, PASSWORD)).status).toBe(200);
      const cookie = c.lastSetCookies.find((s) => s.startsWith('platewright_session='))!;
      expect(cookie).toMatch(/; Secure/i);
      expect(cookie).toMatch(/HttpOnly/i);

      const email = `prod-invite-${tag()}@example.test`;
      expect((await c.post('/api/admin/invites', { email, role: 'engineer' })).status).toBe(201);
      const link = linkIn(await waitForMail(email), 'https://plates.example.test', '/invite/');
      expect(link).toMatch(/^https:\/\/plates\.example\.test\/invite\/[A-Za-z0-9_-]{43}$/);

      expect((await c.get('/api/admin/mail')).status).toBe(404);
      const page = await fetch(server.baseUrl + '/admin/mail', { headers: { cookie: `platewright_session=${c.sessionCookie}` } });
      expect(page.status).toBe(404);
      const signIn = await (await fetch(server.baseUrl + '/sign-in')).text();
      expect(signIn).not.toContain('data-testid="demo-sign-ins"');
    });
  });
});

describe('when the mail server is down', () => {
  let server: RunningServer;
  beforeAll(async () => {
    server = await startServer(testAppPort(7), { SMTP_URL: 'smtp://127.0.0.1:9' }); // nothing listens there
  });
  afterAll(async () => {
    await server?.stop();
  });

  it('an invitation answers 502 with the reason and keeps nothing; a reset still answers 202 and logs no token', async () => {
    const a = await makeUser(getDb(), { role: 'admin', password: PASSWORD });
    const c = new ApiClient(server.baseUrl);
    expect((await c.signIn(a.email, PASSWORD)).status).toBe(200);
    const email = `unreachable-${tag()}@example.test`;
    const r = await c.post('/api/admin/invites', { email, role: 'designer' });
    expect(r.status).toBe(502);
    expect(r.body.error.code).toBe('mail_failed');
    expect(r.body.error.message).toMatch(/could not be e-mailed: .*Nothing was sent; try again\./);
    expect(await getDb().select().from(invitations).where(eq(invitations.email, email))).toEqual([]);

    const reset = await new ApiClient(server.baseUrl).post('/api/auth/password-reset', { email: a.email });
    expect(reset.status).toBe(202);
    const deadline = Date.now() + 15_000;
    while (!server.output().includes('password reset e-mail for user') && Date.now() < deadline) await new Promise((res) => setTimeout(res, 100));
    expect(server.output()).toContain(`password reset e-mail for user ${a.id} not sent`);
    const [row] = await getDb().select().from(passwordResetTokens).where(eq(passwordResetTokens.userId, a.id));
    expect(row.tokenHash).toMatch(/^[0-9a-f]{64}$/);
    expect(server.output()).not.toMatch(/reset-password\/[A-Za-z0-9_-]{43}/);
  });
});
