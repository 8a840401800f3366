import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { and, eq, sql } from 'drizzle-orm';
import { closeDb, getDb } from '../../src/server/db/client';
import { auditEvents, invitations, passwordResetTokens, sessions, users } from '../../src/server/db/schema';
import { startServer, testAppPort, type RunningServer } from '../support/server';
import { ApiClient, makeUser, tag, userRow } from '../support/auth';
import { linkIn, mailTo, waitForMail } from '../support/mail';

// Invitations and password resets end to end: the e-mail really goes over SMTP to the test run's
// mail catcher, the test follows the link from the caught message.

let server: RunningServer;
let admin: ApiClient;
let adminUser: { id: string; email: string };
const db = () => getDb();
const PASSWORD = `Flywheel-Dowel-${tag()}-Ream`;

beforeAll(async () => {
  server = await startServer(testAppPort(4));
  adminUser = await makeUser(db(), { role: 'admin', password: PASSWORD, name: 'Petra Vantongeren' });
  admin = new ApiClient(server.baseUrl);
  expect((await admin.signIn(adminUser.email, PASSWORD)).status).toBe(200);
});
afterAll(async () => {
  await server?.stop();
  await closeDb();
});

const tokenOf = (link: string) => new URL(link).pathname.split('/').pop()!;

describe('invitations', () => {
  it('POST /api/admin/invites → 201; the e-mail arrives with a one-time link that works once and signs the new user in', async () => {
    const email = `new-machinist-${tag()}@example.test`;
    const r = await admin.post('/api/admin/invites', { email, role: 'machinist' });
    expect(r.status).toBe(201);
    expect(r.body.invite).toMatchObject({ email, role: 'machinist', invitedBy: 'Petra Vantongeren' });
    const days = (new Date(r.body.invite.expiresAt).getTime() - Date.now()) / 86_400_000;
    expect(days).toBeGreaterThan(6.99);
    expect(days).toBeLessThanOrEqual(7);

    const mail = await waitForMail(email, /invited you/);
    expect(mail.subject).toBe('Petra Vantongeren invited you to Platewright as machinist');
    expect(mail.text).toMatch(/works once and expires on/);
    expect(mail.html).toContain('Accept the invitation');
    const link = linkIn(mail, server.baseUrl, '/invite/');
    const token = tokenOf(link);
    expect(mail.html).toContain(link);

    // The database holds the token's hash only.
    const [row] = await db().select().from(invitations).where(eq(invitations.id, r.body.invite.id));
    expect(row.tokenHash).toMatch(/^[0-9a-f]{64}$/);
    expect(JSON.stringify(row)).not.toContain(token);

    // The invitation page and its API both know it.
    const page = await fetch(link);
    expect(page.status).toBe(200);
    expect(await page.text()).toContain(email);
    const info = await new ApiClient(server.baseUrl).get(`/api/invites/${token}`);
    expect(info.body.invite).toMatchObject({ email, role: 'machinist' });

    const newcomer = new ApiClient(server.baseUrl);
    const bad = await newcomer.post(`/api/invites/${token}`, { name: '', password: 'short' });
    expect(bad.status).toBe(400);
    expect(Object.keys(bad.body.error.fields).sort()).toEqual(['name', 'password']);

    const accepted = await newcomer.post(`/api/invites/${token}`, { name: 'Tobiah Lark', password: PASSWORD });
    expect(accepted.status).toBe(201);
    expect(accepted.body.user).toMatchObject({ email, name: 'Tobiah Lark', role: 'machinist' });
    const me = await newcomer.get('/api/me');
    expect(me.body.user).toMatchObject({ email, role: 'machinist' });
    const created = await userRow(db(), accepted.body.user.id);
    expect(created.passwordHash).toMatch(/^\$argon2id\$/);

    // Used once: the same link is refused, by the API and by the page.
    const again = await new ApiClient(server.baseUrl).post(`/api/invites/${token}`, { name: 'Someone Else', password: PASSWORD });
    expect(again.status).toBe(410);
    expect(again.body.error.code).toBe('invite_used');
    const pageAgain = await fetch(link);
    expect(pageAgain.status).toBe(410);
    expect(await pageAgain.text()).toContain('already been used');
    expect(await db().select().from(users).where(eq(users.email, email))).toHaveLength(1);

    // And the new account signs in with its password.
    expect((await new ApiClient(server.baseUrl).signIn(email, PASSWORD)).status).toBe(200);

    const actions = (await db().select().from(auditEvents).where(and(eq(auditEvents.targetType, 'invitation'), eq(auditEvents.targetId, String(row.id))))).map((e) => e.action);
    expect(actions).toEqual(expect.arrayContaining(['user.invited', 'invite.accepted']));
  });

  it('an expired invitation is refused (410) and creates no user', async () => {
    const email = `late-${tag()}@example.test`;
    const r = await admin.post('/api/admin/invites', { email, role: 'designer' });
    const token = tokenOf(linkIn(await waitForMail(email), server.baseUrl, '/invite/'));
    await db().update(invitations).set({ expiresAt: new Date(Date.now() - 1000) }).where(eq(invitations.id, r.body.invite.id));
    const late = await new ApiClient(server.baseUrl).post(`/api/invites/${token}`, { name: 'Late Comer', password: PASSWORD });
    expect(late.status).toBe(410);
    expect(late.body.error.code).toBe('invite_expired');
    expect(late.body.error.message).toMatch(/expired on .* UTC\. Ask your admin for a new one/);
    expect(await db().select().from(users).where(eq(users.email, email))).toEqual([]);
  });

  it('an unknown or malformed token is 404; a re-sent invitation replaces the older link', async () => {
    expect((await new ApiClient(server.baseUrl).post(`/api/invites/${'A'.repeat(43)}`, { name: 'X', password: PASSWORD })).status).toBe(404);
    expect((await new ApiClient(server.baseUrl).post('/api/invites/short', { name: 'X', password: PASSWORD })).status).toBe(404);
    expect((await fetch(`${server.baseUrl}/invite/nope`)).status).toBe(404);

    const email = `twice-${tag()}@example.test`;
    await admin.post('/api/admin/invites', { email, role: 'engineer' });
    const first = tokenOf(linkIn(await waitForMail(email), server.baseUrl, '/invite/'));
    await admin.post('/api/admin/invites', { email, role: 'designer' });
    let mails = await mailTo(email);
    for (let i = 0; i < 50 && mails.length < 2; i++) {
      await new Promise((r) => setTimeout(r, 100));
      mails = await mailTo(email);
    }
    expect(mails).toHaveLength(2);
    const second = tokenOf(linkIn(mails[0], server.baseUrl, '/invite/')); // newest first
    expect(second).not.toBe(first);
    const old = await new ApiClient(server.baseUrl).post(`/api/invites/${first}`, { name: 'Old Link', password: PASSWORD });
    expect(old.status).toBe(410);
    expect(old.body.error.code).toBe('invite_replaced');
    const ok = await new ApiClient(server.baseUrl).post(`/api/invites/${second}`, { name: 'New Link', password: PASSWORD });
    expect(ok.status).toBe(201);
    expect(ok.body.user.role).toBe('designer');
  });

  it('refuses to invite an address that already has an account (409) or a bad one (400), and sends nothing', async () => {
    const existing = await makeUser(db(), { role: 'designer', password: PASSWORD });
    const dup = await admin.post('/api/admin/invites', { email: existing.email, role: 'engineer' });
    expect(dup.status).toBe(409);
    expect(dup.body.error.code).toBe('user_exists');
    const bad = await admin.post('/api/admin/invites', { email: 'not an address', role: 'wizard' });
    expect(bad.status).toBe(400);
    expect(Object.keys(bad.body.error.fields).sort()).toEqual(['email', 'role']);
    await new Promise((r) => setTimeout(r, 300));
    expect(await mailTo(existing.email)).toEqual([]);
  });

  it('lists open invitations for admins', async () => {
    const email = `listed-${tag()}@example.test`;
    await admin.post('/api/admin/invites', { email, role: 'machinist' });
    const r = await admin.get('/api/admin/invites');
    expect(r.status).toBe(200);
    expect(r.body.invites.map((i: { email: string }) => i.email)).toContain(email);
    expect(JSON.stringify(r.body)).not.toMatch(/token/i);
  });
});

describe('password reset', () => {
  it('always answers 202; only an active account gets the e-mail', async () => {
    const unknown = `ghost-${tag()}@example.test`;
    const inactive = await makeUser(db(), { role: 'engineer', password: PASSWORD, active: false });
    const known = await makeUser(db(), { role: 'engineer', password: PASSWORD });
    const anon = new ApiClient(server.baseUrl);
    const a = await anon.post('/api/auth/password-reset', { email: unknown });
    const b = await anon.post('/api/auth/password-reset', { email: inactive.email });
    const c = await anon.post('/api/auth/password-reset', { email: known.email });
    for (const r of [a, b, c]) expect(r.status).toBe(202);
    expect(a.body.message.replace(unknown, 'X')).toBe(c.body.message.replace(known.email, 'X'));
    await waitForMail(known.email, /new Platewright password/);
    await new Promise((r) => setTimeout(r, 300));
    expect(await mailTo(unknown)).toEqual([]);
    expect(await mailTo(inactive.email)).toEqual([]);
    expect((await anon.post('/api/auth/password-reset', { email: 'nope' })).status).toBe(400);
  });

  it('end to end: the link sets a new password once, ends every session, and the old password stops working', async () => {
    const u = await makeUser(db(), { role: 'designer', password: PASSWORD, name: 'Wren Castellan' });
    const old = new ApiClient(server.baseUrl);
    expect((await old.signIn(u.email, PASSWORD)).status).toBe(200);

    expect((await new ApiClient(server.baseUrl).post('/api/auth/password-reset', { email: u.email })).status).toBe(202);
    const mail = await waitForMail(u.email, /new Platewright password/);
    expect(mail.subject).toBe('Choose a new Platewright password');
    expect(mail.text).toContain('Hello Wren Castellan');
    expect(mail.text).toMatch(/expires in 60 minutes/);
    const link = linkIn(mail, server.baseUrl, '/reset-password/');
    const token = tokenOf(link);
    const [row] = await db().select().from(passwordResetTokens).where(eq(passwordResetTokens.userId, u.id));
    expect(row.tokenHash).toMatch(/^[0-9a-f]{64}$/);
    expect(JSON.stringify(await db().select().from(passwordResetTokens))).not.toContain(token);

    const page = await fetch(link);
    expect(page.status).toBe(200);
    expect(await page.text()).toContain(u.email);

    const anon = new ApiClient(server.baseUrl);
    const short = await anon.post(`/api/auth/password-reset/${token}`, { password: 'short' });
    expect(short.status).toBe(400);
    expect(short.body.error.fields.password).toMatch(/at least 10/);
    // A refused attempt did not spend the link.
    const NEW = `${PASSWORD}-renewed`;
    const done = await anon.post(`/api/auth/password-reset/${token}`, { password: NEW });
    expect(done.status).toBe(200);

    expect(await db().select().from(sessions).where(eq(sessions.userId, u.id))).toEqual([]);
    expect((await old.get('/api/me')).status).toBe(401);
    expect((await new ApiClient(server.baseUrl).signIn(u.email, PASSWORD)).status).toBe(401);
    expect((await new ApiClient(server.baseUrl).signIn(u.email, NEW)).status).toBe(200);

    const reused = await anon.post(`/api/auth/password-reset/${token}`, { password: `${NEW}-again` });
    expect(reused.status).toBe(410);
    expect(reused.body.error.code).toBe('reset_used');
    expect((await new ApiClient(server.baseUrl).signIn(u.email, NEW)).status).toBe(200);

    const actions = (await db().select().from(auditEvents).where(eq(auditEvents.targetId, u.id))).map((e) => e.action);
    expect(actions).toEqual(expect.arrayContaining(['auth.password_reset_requested', 'auth.password_reset_done']));
    expect(server.output()).not.toContain(token);
    expect(server.output()).not.toContain(NEW);
  });

  it('an expired reset link is refused (410) and the password stays as it was', async () => {
    const u = await makeUser(db(), { role: 'machinist', password: PASSWORD });
    await new ApiClient(server.baseUrl).post('/api/auth/password-reset', { email: u.email });
    const token = tokenOf(linkIn(await waitForMail(u.email), server.baseUrl, '/reset-password/'));
    await db().update(passwordResetTokens).set({ expiresAt: sql`${passwordResetTokens.expiresAt} - INTERVAL 2 HOUR` }).where(eq(passwordResetTokens.userId, u.id));
    const r = await new ApiClient(server.baseUrl).post(`/api/auth/password-reset/${token}`, { password: `${PASSWORD}-late` });
    expect(r.status).toBe(410);
    expect(r.body.error.code).toBe('reset_expired');
    expect((await new ApiClient(server.baseUrl).signIn(u.email, PASSWORD)).status).toBe(200);
  });

  it('a reset also lifts the failed sign-in limit for that address', async () => {
    const u = await makeUser(db(), { role: 'engineer', password: PASSWORD });
    for (let i = 0; i < 5; i++) await new ApiClient(server.baseUrl).signIn(u.email, 'forgotten-it-again');
    expect((await new ApiClient(server.baseUrl).signIn(u.email, PASSWORD)).status).toBe(429);
    await new ApiClient(server.baseUrl).post('/api/auth/password-reset', { email: u.email });
    const token = tokenOf(linkIn(await waitForMail(u.email), server.baseUrl, '/reset-password/'));
    expect((await new ApiClient(server.baseUrl).post(`/api/auth/password-reset/${token}`, { password: `${PASSWORD}-2` })).status).toBe(200);
    expect((await new ApiClient(server.baseUrl).signIn(u.email, `${PASSWORD}-2`)).status).toBe(200);
  });
});

describe('/admin/mail', () => {
  it('shows caught messages to admins (the app runs with the catcher in tests)', async () => {
    const email = `mailpage-${tag()}@example.test`;
    await admin.post('/api/admin/invites', { email, role: 'designer' });
    await waitForMail(email);
    const r = await fetch(server.baseUrl + '/admin/mail', { headers: { cookie: `platewright_session=${admin.sessionCookie}` } });
    expect(r.status).toBe(200);
    const html = await r.text();
    expect(html).toContain(email);
    expect(html).toContain('invited you to Platewright');
    const api = await admin.get('/api/admin/mail');
    expect(api.body.messages.some((m: { envelope: { to: string[] } }) => m.envelope.to.includes(email))).toBe(true);
  });
});
