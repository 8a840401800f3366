import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { and, eq, inArray, ne } from 'drizzle-orm';
import { closeDb, getDb } from '../../src/server/db/client';
import { auditEvents, invitations, sessions, users, type Role } from '../../src/server/db/schema';
import { startServer, testAppPort, type RunningServer } from '../support/server';
import { ApiClient, makeUser, tag, userRow } from '../support/auth';

// Admin endpoints: who may call them (every role × every endpoint), role and activation changes,
// deactivation ending sessions at once, and the last-admin rule.

let server: RunningServer;
const db = () => getDb();
const PASSWORD = `Spindle-Arbor-${tag()}-Chuck`;
const signedIn: Partial<Record<Role, ApiClient>> = {};
let adminId = '';

beforeAll(async () => {
  server = await startServer(testAppPort(3));
  for (const role of ['designer', 'engineer', 'machinist', 'admin'] as const) {
    const u = await makeUser(db(), { role, password: PASSWORD });
    if (role === 'admin') adminId = u.id;
    const c = new ApiClient(server.baseUrl);
    expect((await c.signIn(u.email, PASSWORD)).status).toBe(200);
    signedIn[role] = c;
  }
});
afterAll(async () => {
  await server?.stop();
  await closeDb();
});

interface Endpoint {
  name: string;
  call: (c: ApiClient) => Promise<{ status: number; body: any }>;
  ok: number;
  /** checks that a refused call changed nothing */
  unchanged?: () => Promise<void>;
}

let target: { id: string; email: string };
const inviteEmails: string[] = [];

const ENDPOINTS: Endpoint[] = [
  { name: 'GET /api/admin/users', call: (c) => c.get('/api/admin/users'), ok: 200 },
  {
    name: 'PATCH /api/admin/users/:id',
    call: (c) => c.patch(`/api/admin/users/${target.id}`, { role: 'engineer' }),
    ok: 200,
    unchanged: async () => expect((await userRow(db(), target.id)).role).toBe('designer'),
  },
  { name: 'GET /api/admin/invites', call: (c) => c.get('/api/admin/invites'), ok: 200 },
  {
    name: 'POST /api/admin/invites',
    call: (c) => {
      const email = `matrix-${tag()}@example.test`;
      inviteEmails.push(email);
      return c.post('/api/admin/invites', { email, role: 'machinist' });
    },
    ok: 201,
    unchanged: async () => {
      const rows = await db().select().from(invitations).where(inArray(invitations.email, inviteEmails));
      expect(rows).toEqual([]);
    },
  },
  { name: 'GET /api/admin/mail', call: (c) => c.get('/api/admin/mail'), ok: 200 },
];

describe('role × endpoint matrix for every admin endpoint', () => {
  for (const ep of ENDPOINTS) {
    describe(ep.name, () => {
      it('anonymous → 401', async () => {
        target = await makeUser(db(), { role: 'designer', password: PASSWORD });
        inviteEmails.length = 0;
        const r = await ep.call(new ApiClient(server.baseUrl));
        expect(r.status).toBe(401);
        expect(r.body.error.code).toBe('unauthenticated');
        await ep.unchanged?.();
      });
      for (const role of ['designer', 'engineer', 'machinist'] as const) {
        it(`${role} → 403`, async () => {
          target = await makeUser(db(), { role: 'designer', password: PASSWORD });
          inviteEmails.length = 0;
          const r = await ep.call(signedIn[role]!);
          expect(r.status).toBe(403);
          expect(r.body.error.code).toBe('forbidden');
          expect(r.body.error.message).toContain(`signed in as ${role}`);
          await ep.unchanged?.();
        });
      }
      it(`admin → ${ep.ok}`, async () => {
        target = await makeUser(db(), { role: 'designer', password: PASSWORD });
        inviteEmails.length = 0;
        const r = await ep.call(signedIn.admin!);
        expect(r.status).toBe(ep.ok);
        expect(r.body.error).toBeUndefined();
      });
    });
  }
});

describe('GET /api/admin/users', () => {
  it('lists users with role, active and last sign-in, never a password hash', async () => {
    const r = await signedIn.admin!.get('/api/admin/users');
    const me = r.body.users.find((u: { id: string }) => u.id === adminId);
    expect(me).toMatchObject({ role: 'admin', active: true, lastSignInAt: expect.any(String) });
    expect(JSON.stringify(r.body)).not.toMatch(/argon2|passwordHash|password_hash/);
  });
});

describe('PATCH /api/admin/users/:id', () => {
  it('changes the role and writes an audit event with from/to', async () => {
    const u = await makeUser(db(), { role: 'designer', password: PASSWORD });
    const r = await signedIn.admin!.patch(`/api/admin/users/${u.id}`, { role: 'engineer' });
    expect(r.status).toBe(200);
    expect(r.body.user).toMatchObject({ id: u.id, role: 'engineer', active: true });
    expect((await userRow(db(), u.id)).role).toBe('engineer');
    const [ev] = await db().select().from(auditEvents).where(and(eq(auditEvents.action, 'user.role_changed'), eq(auditEvents.targetId, u.id)));
    expect(ev).toMatchObject({ actorId: adminId, details: { from: 'designer', to: 'engineer' } });
  });

  it('the new role applies to the user at once: a designer made admin may list users on the next request', async () => {
    const u = await makeUser(db(), { role: 'designer', password: PASSWORD });
    const c = new ApiClient(server.baseUrl);
    await c.signIn(u.email, PASSWORD);
    expect((await c.get('/api/admin/users')).status).toBe(403);
    await signedIn.admin!.patch(`/api/admin/users/${u.id}`, { role: 'admin' });
    expect((await c.get('/api/admin/users')).status).toBe(200);
    await signedIn.admin!.patch(`/api/admin/users/${u.id}`, { active: false });
  });

  it('deactivating ends every session of that user at once; reactivating lets them sign in again', async () => {
    const u = await makeUser(db(), { role: 'machinist', password: PASSWORD });
    const phone = new ApiClient(server.baseUrl);
    const laptop = new ApiClient(server.baseUrl);
    await phone.signIn(u.email, PASSWORD);
    await laptop.signIn(u.email, PASSWORD);
    expect(await db().select().from(sessions).where(eq(sessions.userId, u.id))).toHaveLength(2);

    const off = await signedIn.admin!.patch(`/api/admin/users/${u.id}`, { active: false });
    expect(off.status).toBe(200);
    expect(off.body.user.active).toBe(false);
    expect(await db().select().from(sessions).where(eq(sessions.userId, u.id))).toEqual([]);
    expect((await phone.get('/api/me')).status).toBe(401);
    expect((await laptop.get('/api/me')).status).toBe(401);
    expect((await new ApiClient(server.baseUrl).signIn(u.email, PASSWORD)).status).toBe(401);

    const on = await signedIn.admin!.patch(`/api/admin/users/${u.id}`, { active: true });
    expect(on.body.user.active).toBe(true);
    expect((await new ApiClient(server.baseUrl).signIn(u.email, PASSWORD)).status).toBe(200);
    const actions = (await db().select().from(auditEvents).where(eq(auditEvents.targetId, u.id))).map((e) => e.action);
    expect(actions).toEqual(expect.arrayContaining(['user.deactivated', 'user.activated']));
  });

  it('refuses bad input: 400 for an unknown role, a non-boolean active or nothing to change; 404 for an unknown user', async () => {
    const u = await makeUser(db(), { role: 'designer', password: PASSWORD });
    const badRole = await signedIn.admin!.patch(`/api/admin/users/${u.id}`, { role: 'foreman' });
    expect(badRole.status).toBe(400);
    expect(badRole.body.error.fields.role).toMatch(/designer, engineer, machinist, admin/);
    const badActive = await signedIn.admin!.patch(`/api/admin/users/${u.id}`, { active: 'no' });
    expect(badActive.status).toBe(400);
    expect(badActive.body.error.fields.active).toBeDefined();
    const empty = await signedIn.admin!.patch(`/api/admin/users/${u.id}`, {});
    expect(empty.status).toBe(400);
    expect(empty.body.error.message).toMatch(/nothing to change/i);
    const missing = await signedIn.admin!.patch('/api/admin/users/no-such-user', { role: 'engineer' });
    expect(missing.status).toBe(404);
    expect((await userRow(db(), u.id)).role).toBe('designer');
  });
});

describe('the last active admin', () => {
  it('cannot be demoted or deactivated (409); once there is another admin, they can', async () => {
    // Make our admin the only active one for this test, then put the others back.
    const others = await db().select({ id: users.id }).from(users).where(and(eq(users.role, 'admin'), eq(users.active, true), ne(users.id, adminId)));
    const otherIds = others.map((o) => o.id);
    if (otherIds.length) await db().update(users).set({ active: false }).where(inArray(users.id, otherIds));
    try {
      const demote = await signedIn.admin!.patch(`/api/admin/users/${adminId}`, { role: 'engineer' });
      expect(demote.status).toBe(409);
      expect(demote.body.error.code).toBe('last_admin');
      expect(demote.body.error.message).toMatch(/last active admin/);
      const deactivate = await signedIn.admin!.patch(`/api/admin/users/${adminId}`, { active: false });
      expect(deactivate.status).toBe(409);
      expect(await userRow(db(), adminId)).toMatchObject({ role: 'admin', active: true });
      expect((await signedIn.admin!.get('/api/me')).status).toBe(200);

      // With a second active admin, the first may step down.
      const second = await makeUser(db(), { role: 'admin', password: PASSWORD });
      const stepDown = await signedIn.admin!.patch(`/api/admin/users/${adminId}`, { role: 'engineer' });
      expect(stepDown.status).toBe(200);
      // …and the second, now the last, cannot.
      const c2 = new ApiClient(server.baseUrl);
      await c2.signIn(second.email, PASSWORD);
      expect((await c2.patch(`/api/admin/users/${second.id}`, { active: false })).status).toBe(409);
      expect((await c2.patch(`/api/admin/users/${adminId}`, { role: 'admin' })).status).toBe(200);
      await db().update(users).set({ active: false }).where(eq(users.id, second.id));
    } finally {
      if (otherIds.length) await db().update(users).set({ active: true }).where(inArray(users.id, otherIds));
    }
  });
});

describe('admin pages', () => {
  it('/admin/users: anonymous → sign-in, other roles → the 403 page, admin → the table', async () => {
    const anon = await fetch(server.baseUrl + '/admin/users', { redirect: 'manual' });
    expect(anon.status).toBe(302);
    expect(anon.headers.get('location')).toBe('/sign-in?next=%2Fadmin%2Fusers');
    for (const role of ['designer', 'engineer', 'machinist'] as const) {
      const r = await fetch(server.baseUrl + '/admin/users', { headers: { cookie: `platewright_session=${signedIn[role]!.sessionCookie}` } });
      expect(r.status, role).toBe(403);
      const html = await r.text();
      expect(html).toContain(`role <strong>${role}</strong>`);
      expect(html).not.toContain('data-testid="users-table"');
    }
    const ok = await fetch(server.baseUrl + '/admin/users', { headers: { cookie: `platewright_session=${signedIn.admin!.sessionCookie}` } });
    expect(ok.status).toBe(200);
    expect(await ok.text()).toContain('data-testid="users-table"');
  });
});
