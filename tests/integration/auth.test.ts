import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { and, eq, sql } from 'drizzle-orm';
import { closeDb, getDb } from '../../src/server/db/client';
import { auditEvents, sessions, signInAttempts, users } from '../../src/server/db/schema';
import { startServer, testAppPort, type RunningServer } from '../support/server';
import { ApiClient, makeUser, tag, userRow } from '../support/auth';

// Sign-in, sign-out, /api/me, the failed-attempt limit, cookies and sliding expiry, against the
// built server on the real test MariaDB.

let server: RunningServer;
const db = () => getDb();
const PASSWORD = `Glassbead-Torque-${tag()}-Quill`;

beforeAll(async () => {
  server = await startServer(testAppPort(2));
});
afterAll(async () => {
  await server?.stop();
  await closeDb();
});

const client = () => new ApiClient(server.baseUrl);

describe('POST /api/auth/sign-in', () => {
  it('signs in with the right password: 200 {user}, an httpOnly SameSite=Lax cookie, a session row, last sign-in set', async () => {
    const u = await makeUser(db(), { role: 'designer', password: PASSWORD });
    const c = client();
    const r = await c.signIn(u.email.toUpperCase(), PASSWORD); // addresses are not case-sensitive
    expect(r.status).toBe(200);
    expect(r.body).toEqual({ user: { id: u.id, email: u.email, name: expect.any(String), role: 'designer' } });
    expect(r.body.user).not.toHaveProperty('passwordHash');
    const cookie = c.lastSetCookies.find((s) => s.startsWith('platewright_session='));
    expect(cookie).toBeDefined();
    expect(cookie).toMatch(/HttpOnly/i);
    expect(cookie).toMatch(/SameSite=Lax/i);
    expect(cookie).toMatch(/Path=\//i);
    expect(cookie).toMatch(/Max-Age=\d+/i);
    expect(cookie).not.toMatch(/Secure/i); // plain http in tests; production sets Secure (auth-config.test.ts)
    const rows = await db().select().from(sessions).where(eq(sessions.userId, u.id));
    expect(rows.map((s) => s.id)).toEqual([c.sessionCookie]);
    expect((await userRow(db(), u.id)).lastSignInAt).toBeInstanceOf(Date);

    const me = await c.get('/api/me');
    expect(me.status).toBe(200);
    expect(me.body.user).toEqual(r.body.user);
  });

  it('answers a wrong password, an unknown e-mail and a deactivated account with the same 401', async () => {
    const active = await makeUser(db(), { role: 'engineer', password: PASSWORD });
    const inactive = await makeUser(db(), { role: 'machinist', password: PASSWORD, active: false });
    const wrong = await client().signIn(active.email, PASSWORD + 'x');
    const unknown = await client().signIn(`nobody-${tag()}@example.test`, PASSWORD);
    const deactivated = await client().signIn(inactive.email, PASSWORD);
    for (const r of [wrong, unknown, deactivated]) {
      expect(r.status).toBe(401);
      expect(r.body.error.code).toBe('invalid_credentials');
    }
    expect(unknown.body).toEqual(wrong.body);
    expect(deactivated.body).toEqual(wrong.body);
    expect(wrong.body.error.message).toMatch(/e-mail and password/i);
    const rows = await db().select().from(sessions).where(eq(sessions.userId, inactive.id));
    expect(rows).toEqual([]);
  });

  it('refuses bad input with 400 and names the field', async () => {
    const c = client();
    const notJson = await c.post('/api/auth/sign-in', 'email=a', { 'content-type': 'application/json' });
    expect(notJson.status).toBe(400);
    expect(notJson.body.error.code).toBe('invalid_json');
    const badEmail = await c.signIn('not-an-address', 'x');
    expect(badEmail.status).toBe(400);
    expect(badEmail.body.error.fields.email).toMatch(/e-mail address/i);
    const noPassword = await c.post('/api/auth/sign-in', { email: 'a@example.test' });
    expect(noPassword.status).toBe(400);
    expect(noPassword.body.error.fields.password).toMatch(/password/i);
  });

  it('rate-limits: after 5 failed attempts for one e-mail within 15 minutes even the right password gets 429', async () => {
    const u = await makeUser(db(), { role: 'designer', password: PASSWORD });
    for (let i = 0; i < 5; i++) {
      const r = await client().signIn(u.email, `wrong-${i}-password`);
      expect(r.status).toBe(401);
    }
    const limited = await client().signIn(u.email, PASSWORD);
    expect(limited.status).toBe(429);
    expect(limited.body.error.code).toBe('rate_limited');
    expect(limited.body.error.message).toMatch(/try again in \d+ minute/i);
    expect(Number(limited.headers.get('retry-after'))).toBeGreaterThan(0);
    expect(Number(limited.headers.get('retry-after'))).toBeLessThanOrEqual(15 * 60);
    // Another address is not affected.
    const other = await makeUser(db(), { role: 'designer', password: PASSWORD });
    expect((await client().signIn(other.email, PASSWORD)).status).toBe(200);

    // Once the failures are older than 15 minutes, the right password works again.
    await db().update(signInAttempts).set({ at: sql`${signInAttempts.at} - INTERVAL 16 MINUTE` }).where(eq(signInAttempts.email, u.email));
    expect((await client().signIn(u.email, PASSWORD)).status).toBe(200);
  });

  it('a successful sign-in starts the count afresh; four failures then a success then four more do not lock', async () => {
    const u = await makeUser(db(), { role: 'engineer', password: PASSWORD });
    for (let i = 0; i < 4; i++) expect((await client().signIn(u.email, 'nope-nope-nope')).status).toBe(401);
    expect((await client().signIn(u.email, PASSWORD)).status).toBe(200);
    for (let i = 0; i < 4; i++) expect((await client().signIn(u.email, 'nope-nope-nope')).status).toBe(401);
    expect((await client().signIn(u.email, PASSWORD)).status).toBe(200);
  });
});

describe('sign-out, /api/me and the session cookie', () => {
  it('GET /api/me is 401 without a session', async () => {
    const r = await client().get('/api/me');
    expect(r.status).toBe(401);
    expect(r.body.error.code).toBe('unauthenticated');
  });

  it('POST /api/auth/sign-out → 204, deletes the session row and blanks the cookie; the old cookie no longer works', async () => {
    const u = await makeUser(db(), { role: 'machinist', password: PASSWORD });
    const c = client();
    expect((await c.signIn(u.email, PASSWORD)).status).toBe(200);
    const sessionId = c.sessionCookie!;
    const out = await c.post('/api/auth/sign-out');
    expect(out.status).toBe(204);
    expect(c.lastSetCookies.some((s) => /^platewright_session=;/.test(s) && /Max-Age=0/i.test(s))).toBe(true);
    expect(await db().select().from(sessions).where(eq(sessions.id, sessionId))).toEqual([]);
    const replay = new ApiClient(server.baseUrl);
    replay.cookies.set('platewright_session', sessionId);
    expect((await replay.get('/api/me')).status).toBe(401);
    const [ev] = await db().select().from(auditEvents).where(and(eq(auditEvents.action, 'auth.sign_out'), eq(auditEvents.targetId, u.id)));
    expect(ev.actorId).toBe(u.id);
  });

  it('blanks a cookie that names no session', async () => {
    const c = client();
    c.cookies.set('platewright_session', 'made-up-session-id');
    const r = await c.get('/api/me');
    expect(r.status).toBe(401);
    expect(c.lastSetCookies.some((s) => /^platewright_session=;/.test(s))).toBe(true);
  });

  it('slides: a session in the second half of its life is extended and its cookie re-sent', async () => {
    const u = await makeUser(db(), { role: 'designer', password: PASSWORD });
    const c = client();
    await c.signIn(u.email, PASSWORD);
    const id = c.sessionCookie!;
    const soon = new Date(Math.floor(Date.now() / 1000 + 2 * 24 * 3600) * 1000); // 2 of 30 days left
    await db().update(sessions).set({ expiresAt: soon }).where(eq(sessions.id, id));
    const r = await c.get('/api/me');
    expect(r.status).toBe(200);
    expect(c.lastSetCookies.some((s) => s.startsWith(`platewright_session=${id};`))).toBe(true);
    const [row] = await db().select().from(sessions).where(eq(sessions.id, id));
    expect(row.expiresAt.getTime() - Date.now()).toBeGreaterThan(29 * 24 * 3600 * 1000);
    // A fresh session is not re-sent on every request.
    await c.get('/api/me');
    expect(c.lastSetCookies.filter((s) => s.startsWith('platewright_session='))).toEqual([]);
  });

  it('an expired session is refused and its cookie blanked', async () => {
    const u = await makeUser(db(), { role: 'designer', password: PASSWORD });
    const c = client();
    await c.signIn(u.email, PASSWORD);
    const id = c.sessionCookie!;
    await db().update(sessions).set({ expiresAt: new Date(Date.now() - 60_000) }).where(eq(sessions.id, id));
    expect((await c.get('/api/me')).status).toBe(401);
    expect(c.cookies.has('platewright_session')).toBe(false);
  });
});

describe('pages use the same rule', () => {
  it('an anonymous visitor to /account is sent to /sign-in?next=/account; a signed-in one sees it', async () => {
    const anon = await fetch(server.baseUrl + '/account', { redirect: 'manual' });
    expect(anon.status).toBe(302);
    expect(anon.headers.get('location')).toBe('/sign-in?next=%2Faccount');
    const u = await makeUser(db(), { role: 'engineer', password: PASSWORD, name: 'Ilse Marrow' });
    const c = client();
    await c.signIn(u.email, PASSWORD);
    const page = await fetch(server.baseUrl + '/account', { headers: { cookie: `platewright_session=${c.sessionCookie}` } });
    expect(page.status).toBe(200);
    const html = await page.text();
    expect(html).toContain('Ilse Marrow');
    expect(html).toContain(u.email);
  });

  it('the sign-in form works without JavaScript: 303 to next on success, 401 with the message inline on failure', async () => {
    const u = await makeUser(db(), { role: 'designer', password: PASSWORD });
    const form = (email: string, password: string, origin = server.baseUrl) =>
      fetch(server.baseUrl + '/sign-in', {
        method: 'POST',
        redirect: 'manual',
        headers: { 'content-type': 'application/x-www-form-urlencoded', origin },
        body: new URLSearchParams({ email, password, next: '/account' }),
      });
    const ok = await form(u.email, PASSWORD);
    expect(ok.status).toBe(303);
    expect(ok.headers.get('location')).toBe('/account');
    expect(ok.headers.getSetCookie().some((s) => s.startsWith('platewright_session='))).toBe(true);
    const bad = await form(u.email, 'not-the-password');
    expect(bad.status).toBe(401);
    const html = await bad.text();
    expect(html).toContain('That e-mail and password do not match an active Platewright account.');
    expect(html).toContain(`value="${u.email}"`); // what was typed is kept
    // The origin check is on: the same form posted from another site is refused.
    const foreign = await form(u.email, PASSWORD, 'http://elsewhere.example.test');
    expect(foreign.status).toBe(403);
    expect(foreign.headers.getSetCookie()).toEqual([]);
  });

  it('an open redirect through next is not possible', async () => {
    const u = await makeUser(db(), { role: 'machinist', password: PASSWORD });
    const r = await fetch(server.baseUrl + '/sign-in', {
      method: 'POST',
      redirect: 'manual',
      headers: { 'content-type': 'application/x-www-form-urlencoded', origin: server.baseUrl },
      body: new URLSearchParams({ email: u.email, password: PASSWORD, next: '//elsewhere.example.test/x' }),
    });
    expect(r.status).toBe(303);
    expect(r.headers.get('location')).toBe('/shop');
  });
});

describe('audit and secrecy', () => {
  it('records sign-ins that worked and that failed, never the password', async () => {
    const u = await makeUser(db(), { role: 'designer', password: PASSWORD });
    await client().signIn(u.email, 'Wrong-Horse-Staple-99');
    await client().signIn(u.email, PASSWORD);
    const events = await db().select().from(auditEvents).where(eq(auditEvents.targetId, u.id));
    const actions = events.map((e) => e.action);
    expect(actions).toContain('auth.sign_in');
    expect(actions).toContain('auth.sign_in_failed');
    const failed = events.find((e) => e.action === 'auth.sign_in_failed')!;
    expect(failed.details).toMatchObject({ email: u.email, reason: 'wrong_password' });
    const text = JSON.stringify(events);
    expect(text).not.toContain('Wrong-Horse-Staple-99');
    expect(text).not.toContain(PASSWORD);
  });

  it('never stores or logs a password in clear: hashes are argon2id, no table and no server output holds the password', async () => {
    const secret = `Plain-Text-Canary-${tag()}`;
    const u = await makeUser(db(), { role: 'engineer', password: secret });
    const c = client();
    expect((await c.signIn(u.email, secret)).status).toBe(200);
    await client().signIn(u.email, secret + '-wrong');
    await c.post('/api/account/password', { currentPassword: 'not-it-at-all', newPassword: secret + '-new' });
    expect((await c.post('/api/account/password', { currentPassword: secret, newPassword: secret + '-next' })).status).toBe(200);

    const row = await userRow(db(), u.id);
    expect(row.passwordHash).toMatch(/^\$argon2id\$/);
    expect(row.passwordHash).not.toContain(secret);

    const [tables] = (await db().execute(sql`SHOW TABLES`)) as unknown as [Record<string, string>[]];
    for (const t of tables.map((r) => Object.values(r)[0])) {
      if (t === 'artifacts' || t === '__drizzle_migrations') continue;
      const [rows] = (await db().execute(sql.raw(`SELECT * FROM \`${t}\``))) as unknown as [unknown[]];
      expect(JSON.stringify(rows), `table ${t}`).not.toContain(secret);
    }
    expect(server.output()).not.toContain(secret);
    expect(server.output()).not.toContain(c.sessionCookie!);
  });
});
