/**
 * The access matrix, generated from the files under src/pages: every route × method × caller
 * against the one table in accessExpectations.ts (a route without an entry fails). Then the
 * session rules: cookie flags, a new session id at every sign-in, sign-out everywhere on a
 * password change, cross-site form posts refused on every state-changing route, no stack traces
 * in answers, and no password or session id in the server's output.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { closeDb, getDb } from '../../src/server/db/client';
import { startServer, testAppPort, type RunningServer } from '../support/server';
import { ApiClient } from '../support/auth';
import { makeUser, TEST_PASSWORD } from '../support/users';
import { postUpload } from '../support/measureUploads';
import { discoverRoutes } from './routes';
import { API_EXPECTATIONS, CALLERS, PAGE_EXPECTATIONS, type Caller, type Expectation, type Fixtures, type Req, type Status } from './accessExpectations';

const ROOT = fileURLToPath(new URL('../..', import.meta.url));

const routes = discoverRoutes();
const table: Record<string, Expectation> = { ...API_EXPECTATIONS, ...PAGE_EXPECTATIONS };
/** what a leaked stack trace looks like: "at fn (/path/file.js:12:5)", a "stack" field, a module path */
const STACK = /\bat (?:async )?[\w.$<>\[\] ]*\(?(?:file:\/\/)?\/[^\s)]*:\d+:\d+\)?|"stack"\s*:|node_modules\/|\/(?:src|dist)\/[\w/.-]+\.(?:ts|js|mjs):\d+/;

let server: RunningServer;
let fx: Fixtures;
const clients = {} as Record<Caller, ApiClient>;
const seenSessionIds = new Set<string>();

function defaultRequest(route: string): Req {
  const path = route.split(' ')[1]!;
  return {
    path: path.replace(/^(\/api)?\/(projects|plates|revisions|uploads)\/:id/, (_m, api = '', kind: string) => {
      const id = { projects: fx.projectId, plates: fx.plateId, revisions: fx.draftRevisionId, uploads: fx.uploadId }[kind as 'projects'];
      return `${api}/${kind}/${id}`;
    }),
  };
}

async function send(client: ApiClient, method: string, req: Req) {
  if (req.form) {
    const headers: Record<string, string> = { origin: client.base, accept: 'application/json' };
    if (client.cookies.size) headers.cookie = [...client.cookies].map(([k, v]) => `${k}=${v}`).join('; ');
    const r = await fetch(client.base + req.path, { method, headers, body: req.form, redirect: 'manual' });
    const text = await r.text();
    return { status: r.status, text };
  }
  const body = method === 'GET' ? undefined : (req.body ?? {});
  const r = await client.request(method, req.path, body, method === 'GET' && !req.path.startsWith('/api') ? { accept: 'text/html' } : {});
  for (const c of r.headers.getSetCookie?.() ?? []) {
    const v = /^platewright_session=([^;]+)/.exec(c)?.[1];
    if (v) seenSessionIds.add(v);
  }
  return { status: r.status, text: typeof r.body === 'string' ? r.body : JSON.stringify(r.body) };
}

const matches = (got: number, want: Status) => (typeof want === 'number' ? got === want : want.includes(got));

async function clientFor(caller: Caller, own: boolean): Promise<ApiClient> {
  if (!own) return clients[caller];
  const c = new ApiClient(server.baseUrl);
  if (caller !== 'anonymous') {
    const r = await c.signIn(fx.emails[caller], fx.password);
    if (r.status !== 200) throw new Error(`throwaway sign-in of ${caller}: ${r.status}`);
    if (c.sessionCookie) seenSessionIds.add(c.sessionCookie);
  }
  return c;
}

function planeXyz(): string {
  const lines: string[] = [];
  for (let i = 0; i < 20; i++) for (let j = 0; j < 20; j++) lines.push(`${i * 5} ${j * 5} ${(0.001 * i).toFixed(4)}`);
  return lines.join('\n') + '\n';
}

beforeAll(async () => {
  server = await startServer(testAppPort(27));
  const db = getDb();
  const people = {
    member: await makeUser(db, 'designer', 'member'),
    outsider: await makeUser(db, 'designer', 'outsider'),
    engineer: await makeUser(db, 'engineer'),
    machinist: await makeUser(db, 'machinist'),
    admin: await makeUser(db, 'admin'),
  };
  const target = await makeUser(db, 'designer', 'target');
  clients.anonymous = new ApiClient(server.baseUrl);
  for (const [k, u] of Object.entries(people)) {
    const c = new ApiClient(server.baseUrl);
    expect((await c.signIn(u.email, TEST_PASSWORD)).status, `sign-in of ${k}`).toBe(200);
    seenSessionIds.add(c.sessionCookie!);
    clients[k as Caller] = c;
  }
  const demoSpec = JSON.parse(readFileSync(join(ROOT, 'templates/plates/demo.json'), 'utf8'));
  const m = clients.member;
  const ok = <T extends { status: number; body: any }>(r: T, want: number, what: string): T => {
    if (r.status !== want) throw new Error(`${what}: ${r.status} ${JSON.stringify(r.body).slice(0, 400)}`);
    return r;
  };
  const project = ok(await m.post('/api/projects', { name: 'Matrix swap', swapDescription: 'invented' }), 201, 'project').body.project.id as number;
  ok(await clients.outsider.post('/api/projects', { name: 'Outsider swap', swapDescription: 'invented' }), 201, 'outsider project');
  const freshPlate = async () => ok(await m.post(`/api/projects/${project}/plates`, { title: 'Matrix fixture', material: '6061-T6 aluminium' }), 201, 'plate').body.plate.id as number;
  const saveOn = async (plate: number, parent: number | null) => ok(await m.post(`/api/plates/${plate}/revisions`, { spec: demoSpec, message: 'fixture', parentRevisionId: parent }), 201, 'save').body.revision.id as number;
  const plateId = await freshPlate();
  const rev1 = await saveOn(plateId, null);
  ok(await m.post(`/api/revisions/${rev1}/submit`, {}), 200, 'submit');
  ok(await clients.engineer.post(`/api/revisions/${rev1}/approve`, { comment: 'fixture release' }), 200, 'approve');
  const rev2 = await saveOn(plateId, rev1);
  const upload = await postUpload(m, project, { name: 'face.xyz', bytes: planeXyz() });
  if (upload.status !== 201) throw new Error(`upload: ${upload.status} ${JSON.stringify(upload.body)}`);
  fx = {
    projectId: project,
    plateId,
    approvedRevisionId: rev1,
    draftRevisionId: rev2,
    uploadId: upload.body.upload.id,
    targetUserId: target.id,
    emails: Object.fromEntries(Object.entries(people).map(([k, u]) => [k, u.email])) as Fixtures['emails'],
    password: TEST_PASSWORD,
    demoSpec,
    freshPlate,
    freshDraft: async () => saveOn(await freshPlate(), null),
    freshInReview: async () => {
      const id = await saveOn(await freshPlate(), null);
      ok(await m.post(`/api/revisions/${id}/submit`, {}), 200, 'submit');
      return id;
    },
    freshQuote: async () => ok(await m.post(`/api/revisions/${rev1}/quotes`, { quantity: 1 }), 201, 'quote').body.quote.id as number,
    shopRates: async () => ok(await clients.admin.get('/api/admin/shop-settings'), 200, 'shop settings').body.rates,
    uploadForm: () => {
      const f = new FormData();
      f.append('units', 'mm');
      f.append('file', new Blob([planeXyz()]), 'matrix.xyz');
      return f;
    },
  };
}, 120_000);

afterAll(async () => {
  await server?.stop();
  await closeDb();
});

describe('the route list', () => {
  it('is built from the files and finds the known routes (so the walk itself is tested)', () => {
    expect(routes).toContain('GET /api/health');
    expect(routes).toContain('POST /api/plates/:id/revisions');
    expect(routes).toContain('GET /api/revisions/:id/files/:name');
    expect(routes).toContain('GET /plates/:id/edit');
    expect(routes).toContain('POST /sign-out');
    expect(routes.length).toBeGreaterThan(40);
  });

  it('every route × method has an expectation for every caller (add new routes to accessExpectations.ts)', () => {
    const missing = routes.filter((r) => !table[r]);
    expect(missing, `routes without an access expectation:\n${missing.join('\n')}`).toEqual([]);
    for (const [r, e] of Object.entries(table)) for (const c of CALLERS) expect(e.expect[c], `${r}: no expectation for ${c}`).toBeDefined();
  });

  it('the table names no route that is gone', () => {
    const stale = Object.keys(table).filter((r) => !routes.includes(r));
    expect(stale, `expectations for routes that no longer exist:\n${stale.join('\n')}`).toEqual([]);
  });
});

describe('access matrix', () => {
  it.each(routes.filter((r) => table[r]))('%s', async (route) => {
    const e = table[route]!;
    const method = route.split(' ')[0]!;
    const problems: string[] = [];
    for (const caller of CALLERS) {
      const client = await clientFor(caller, !!e.ownSession);
      const req = e.request ? await e.request(fx, caller) : defaultRequest(route);
      const r = await send(client, method, req);
      if (!matches(r.status, e.expect[caller])) problems.push(`${caller}: got ${r.status}, want ${JSON.stringify(e.expect[caller])} — ${r.text.slice(0, 200)}`);
      if (r.status >= 500) problems.push(`${caller}: server error ${r.status}`);
      if (STACK.test(r.text)) problems.push(`${caller}: the answer shows a stack trace or source path`);
      if (req.path.startsWith('/api') && r.status >= 400) {
        try {
          const b = JSON.parse(r.text);
          if (typeof b?.error?.message !== 'string' || !b.error.message) problems.push(`${caller}: error without a message`);
        } catch {
          problems.push(`${caller}: ${r.status} is not JSON`);
        }
      }
    }
    expect(problems, `${route}\n${problems.join('\n')}`).toEqual([]);
  });
});

describe('object-level checks beyond the matrix', () => {
  it('a machinist sees the released revision and its DXF, but not the draft of the same plate', async () => {
    const mc = clients.machinist;
    expect((await mc.get(`/api/revisions/${fx.approvedRevisionId}`)).status).toBe(200);
    expect((await mc.get(`/api/revisions/${fx.approvedRevisionId}/files/plate.dxf`)).status).toBe(200);
    expect((await mc.get(`/api/revisions/${fx.draftRevisionId}`)).status).toBe(404);
    expect((await mc.get(`/api/revisions/${fx.draftRevisionId}/files/plate.dxf`)).status).toBe(404);
  });

  it("the outsider's project list does not show the member's project; ids that do not exist answer 404 like hidden ones", async () => {
    const list = await clients.outsider.get('/api/projects');
    expect(list.status).toBe(200);
    expect(list.body.projects.map((p: { id: number }) => p.id)).not.toContain(fx.projectId);
    const hidden = await clients.outsider.get(`/api/projects/${fx.projectId}`);
    const absent = await clients.outsider.get('/api/projects/999999999');
    expect([hidden.status, absent.status]).toEqual([404, 404]);
    expect(hidden.body.error.message).toBe(absent.body.error.message);
    for (const id of ['0', '-1', 'abc', '1e3', '99999999999999999999']) {
      const r = await clients.member.get(`/api/revisions/${id}`);
      expect(r.status, `revision id ${id}`).toBe(404);
    }
  });

  it('the outsider cannot save on, submit or fit the member objects (404 / no change)', async () => {
    const o = clients.outsider;
    const before = (await clients.member.get(`/api/plates/${fx.plateId}/revisions`)).body.revisions.length;
    expect((await o.post(`/api/plates/${fx.plateId}/revisions`, { spec: fx.demoSpec, message: 'intrusion', parentRevisionId: fx.draftRevisionId })).status).toBe(404);
    expect((await o.post(`/api/revisions/${fx.draftRevisionId}/submit`, {})).status).toBe(404);
    expect((await o.post(`/api/uploads/${fx.uploadId}/fit`, { kind: 'plane' })).status).toBe(404);
    expect((await clients.member.get(`/api/plates/${fx.plateId}/revisions`)).body.revisions.length).toBe(before);
  });
});

describe('sessions', () => {
  it('the session cookie is HttpOnly, SameSite=Lax, Path=/ (Secure is checked on a production instance below)', async () => {
    const c = new ApiClient(server.baseUrl);
    await c.signIn(fx.emails.member, fx.password);
    const cookie = c.lastSetCookies.find((s) => s.startsWith('platewright_session='))!;
    expect(cookie).toBeDefined();
    expect(cookie).toMatch(/;\s*HttpOnly/i);
    expect(cookie).toMatch(/;\s*SameSite=Lax/i);
    expect(cookie).toMatch(/;\s*Path=\//i);
    expect(c.sessionCookie!.length).toBeGreaterThanOrEqual(20);
  });

  it('sign-in always issues a new session id; the old cookie sent at sign-in is ended, a planted one is never adopted', async () => {
    const c = new ApiClient(server.baseUrl);
    await c.signIn(fx.emails.member, fx.password);
    const first = c.sessionCookie!;
    await c.signIn(fx.emails.member, fx.password);
    const second = c.sessionCookie!;
    expect(second).not.toBe(first);
    const old = new ApiClient(server.baseUrl);
    old.cookies.set('platewright_session', first);
    expect((await old.get('/api/me')).status, 'the session sent at sign-in is ended').toBe(401);

    const planted = 'attackerchosen0123456789abcdefgh';
    const victim = new ApiClient(server.baseUrl);
    victim.cookies.set('platewright_session', planted);
    expect((await victim.signIn(fx.emails.member, fx.password)).status).toBe(200);
    expect(victim.sessionCookie).not.toBe(planted);
    const attacker = new ApiClient(server.baseUrl);
    attacker.cookies.set('platewright_session', planted);
    expect((await attacker.get('/api/me')).status).toBe(401);
    seenSessionIds.add(first).add(second).add(victim.sessionCookie!);
  });

  it('a password change signs the user out everywhere else; the old password stops working', async () => {
    const u = await makeUser(getDb(), 'designer', 'changer');
    const a = new ApiClient(server.baseUrl);
    const b = new ApiClient(server.baseUrl);
    expect((await a.signIn(u.email, TEST_PASSWORD)).status).toBe(200);
    expect((await b.signIn(u.email, TEST_PASSWORD)).status).toBe(200);
    seenSessionIds.add(a.sessionCookie!).add(b.sessionCookie!);
    const next = 'a completely new passphrase 2024';
    const r = await a.post('/api/account/password', { currentPassword: TEST_PASSWORD, newPassword: next });
    expect(r.status).toBe(200);
    expect((await b.get('/api/me')).status, 'the other device is signed out').toBe(401);
    expect((await a.get('/api/me')).status, 'the device that changed it stays signed in').toBe(200);
    expect((await new ApiClient(server.baseUrl).signIn(u.email, TEST_PASSWORD)).status).toBe(401);
    expect((await new ApiClient(server.baseUrl).signIn(u.email, next)).status).toBe(200);
  });

  it('sign-out ends the session on the server, not only in the browser', async () => {
    const c = new ApiClient(server.baseUrl);
    await c.signIn(fx.emails.engineer, fx.password);
    const id = c.sessionCookie!;
    expect((await c.post('/api/auth/sign-out', {})).status).toBe(204);
    const replay = new ApiClient(server.baseUrl);
    replay.cookies.set('platewright_session', id);
    expect((await replay.get('/api/me')).status).toBe(401);
  });
});

describe('cross-site requests', () => {
  const stateChanging = routes.filter((r) => !r.startsWith('GET '));
  const evil = 'http://evil.example.test';

  it.each(['application/x-www-form-urlencoded', 'multipart/form-data; boundary=x', 'text/plain', 'application/json', 'no Origin, Sec-Fetch-Site: cross-site'])('a cross-site %s post is refused with 403 on every state-changing route', async (type) => {
    const problems: string[] = [];
    const body = type.startsWith('multipart') ? '--x\r\nContent-Disposition: form-data; name="a"\r\n\r\n1\r\n--x--\r\n' : 'a=1';
    for (const route of stateChanging) {
      const [method] = route.split(' ');
      const req = defaultRequest(route);
      const path = req.path.replace(/:token/, 'no-such-token').replace(/:name/, 'plate.dxf').replace(/:a\/compare\/:b/, `${fx.approvedRevisionId}/compare/${fx.draftRevisionId}`).replace(/\/:id/, `/${fx.targetUserId}`);
      const r = await fetch(server.baseUrl + path, {
        method,
        headers: type.startsWith('no Origin')
          ? { 'sec-fetch-site': 'cross-site', 'content-type': 'application/json', cookie: `platewright_session=${clients.member.sessionCookie}` }
          : { origin: evil, 'content-type': type, cookie: `platewright_session=${clients.member.sessionCookie}` },
        body: type.includes('json') || type.startsWith('no Origin') ? '{}' : body,
        redirect: 'manual',
      });
      const text = await r.text();
      if (r.status !== 403) problems.push(`${route}: ${r.status} ${text.slice(0, 120)}`);
    }
    expect(problems, problems.join('\n')).toEqual([]);
  });

  it('a cross-site JSON post is refused too (and a CORS preflight is never granted)', async () => {
    const pre = await fetch(`${server.baseUrl}/api/projects`, { method: 'OPTIONS', headers: { origin: evil, 'access-control-request-method': 'POST', 'access-control-request-headers': 'content-type' } });
    await pre.text();
    expect(pre.headers.get('access-control-allow-origin'), 'no CORS grant for another site').toBeNull();
    const r = await fetch(`${server.baseUrl}/api/projects`, {
      method: 'POST',
      headers: { origin: evil, 'content-type': 'application/json', cookie: `platewright_session=${clients.member.sessionCookie}` },
      body: JSON.stringify({ name: 'cross-site', swapDescription: 'x' }),
    });
    const text = await r.text();
    expect(r.status, text).toBe(403);
    expect(JSON.parse(text).error.code).toBe('cross_site');
  });
});

describe('server output', () => {
  it('never shows a password or a session id', async () => {
    const out = server.output();
    expect(out.length).toBeGreaterThan(0);
    expect(out.includes(TEST_PASSWORD), 'the password appears in the server output').toBe(false);
    const leaked = [...seenSessionIds].filter((id) => out.includes(id));
    expect(seenSessionIds.size).toBeGreaterThan(5);
    expect(leaked, 'session ids in the server output').toEqual([]);
  });
});

describe('production cookie', () => {
  it('a production instance marks the session cookie Secure', async () => {
    const port = testAppPort(28);
    const prod = await startServer(port, { NODE_ENV: 'production', APP_SECRET: 'x'.repeat(40), APP_URL: `http://127.0.0.1:${port}` });
    try {
      const c = new ApiClient(prod.baseUrl);
      const r = await c.signIn(fx.emails.member, fx.password);
      expect(r.status).toBe(200);
      expect(c.lastSetCookies.find((s) => s.startsWith('platewright_session='))).toMatch(/;\s*Secure/i);
    } finally {
      await prod.stop();
    }
  });
});
