/**
 * Property-based: random and malformed bodies POSTed/PATCHed to every JSON endpoint, mutated
 * plate specs to the save and preview endpoints, random upload bytes to the upload endpoint.
 * Never a 5xx; every refusal is JSON with a message; no stack trace or source path in any answer.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import fc from 'fast-check';

// One fixed seed per run of the suite (change FUZZ_SEED to explore); a failure prints its seed and path.
fc.configureGlobal({ seed: Number(process.env.FUZZ_SEED ?? 20261201) });
import { readFileSync } from 'node:fs';
import { closeDb, getDb } from '../../src/server/db/client';
import { startServer, testAppPort, type RunningServer } from '../support/server';
import { ApiClient } from '../support/auth';
import { makeUser, TEST_PASSWORD } from '../support/users';
import { postUpload } from '../support/measureUploads';
import { discoverRoutes } from './routes';

const demo = JSON.parse(readFileSync(new URL('../../templates/plates/demo.json', import.meta.url), 'utf8'));
const STACK = /\bat (?:async )?[\w.$<>\[\] ]*\(?(?:file:\/\/)?\/[^\s)]*:\d+:\d+\)?|"stack"\s*:|node_modules\/|\/(?:src|dist)\/[\w/.-]+\.(?:ts|js|mjs):\d+/;

let server: RunningServer;
const c = {} as Record<'member' | 'engineer' | 'admin' | 'machinist' | 'anonymous', ApiClient>;
const emails = {} as Record<'member' | 'engineer' | 'admin' | 'machinist', string>;
let ids: { project: number; plate: number; approved: number; draft: number; inReview: number; upload: number; user: string };

function check(route: string, r: { status: number; body: unknown }, sent: string) {
  const text = typeof r.body === 'string' ? r.body : JSON.stringify(r.body);
  if (r.status >= 500) throw new Error(`${route} answered ${r.status} to ${sent.slice(0, 300)}: ${text.slice(0, 300)}`);
  if (STACK.test(text)) throw new Error(`${route}: the answer shows a stack trace or path: ${text.slice(0, 300)}`);
  if (r.status >= 400) {
    const msg = (r.body as { error?: { message?: unknown } } | null)?.error?.message;
    if (typeof msg !== 'string' || msg.trim() === '') throw new Error(`${route}: ${r.status} without a JSON error message: ${text.slice(0, 300)}`);
  }
}

/** every state-changing JSON route, with the caller that gets past the role rule and the ids filled in */
function targets(): { route: string; method: string; path: string; who: keyof typeof c }[] {
  const skip = new Set(['POST /api/auth/sign-out', 'POST /sign-out', 'POST /api/projects/:id/uploads', 'POST /api/payments/webhook']);
  return discoverRoutes()
    .filter((r) => !r.startsWith('GET ') && r.includes('/api/') && !skip.has(r))
    .map((route) => {
      const [method, p] = route.split(' ') as [string, string];
      const path = p
        .replace('/projects/:id', `/projects/${ids.project}`)
        .replace('/plates/:id', `/plates/${ids.plate}`)
        .replace(/\/revisions\/:id\/(approve|request-changes)/, `/revisions/${ids.inReview}/$1`)
        .replace('/revisions/:id/quotes', `/revisions/${ids.approved}/quotes`)
        .replace('/revisions/:id', `/revisions/${ids.draft}`)
        .replace('/uploads/:id', `/uploads/${ids.upload}`)
        .replace('/admin/users/:id', `/admin/users/${ids.user}`)
        .replace(/:\w+/g, '999999');
      const who = p.startsWith('/api/admin') ? 'admin' : /approve|request-changes|\/orders\//.test(p) ? 'engineer' : p.startsWith('/api/auth') || p.startsWith('/api/invites') ? 'anonymous' : 'member';
      return { route, method, path, who };
    });
}

const weird = fc.oneof(
  fc.constantFrom(NaN, Infinity, -1, 0, 1e308, '', 'x'.repeat(300), null, true, [], {}),
  fc.double(),
  fc.integer(),
  fc.string({ maxLength: 30 }),
  fc.jsonValue({ maxDepth: 2 }),
);
/** bodies: random JSON, plausible field names with wrong values, broken text */
const bodyText = fc.oneof(
  fc.jsonValue({ maxDepth: 3 }).map((v) => JSON.stringify(v)),
  fc.dictionary(fc.constantFrom('email', 'password', 'name', 'role', 'active', 'comment', 'waivers', 'spec', 'message', 'parentRevisionId', 'asBranch', 'title', 'material', 'partNumber', 'swapDescription', 'quantity', 'state', 'kind', 'thresholdMm', 'currentPassword', 'newPassword', '__proto__', 'constructor'), weird, { maxKeys: 5 }).map((v) => JSON.stringify(v)),
  fc.constantFrom('', '{', '{"a":', 'null', '[]', '"str"', '{"__proto__":{"admin":true}}', '\u0000', '{"a":1}garbage', '[' .repeat(5000) + ']'.repeat(5000), '{"spec":' + '{"a":'.repeat(3000) + '1' + '}'.repeat(3001)),
  fc.string({ maxLength: 200 }),
);

beforeAll(async () => {
  server = await startServer(testAppPort(29));
  const db = getDb();
  const u = { member: await makeUser(db, 'designer', 'fuzzer'), engineer: await makeUser(db, 'engineer'), admin: await makeUser(db, 'admin'), machinist: await makeUser(db, 'machinist') };
  const target = await makeUser(db, 'designer', 'fuzztarget');
  c.anonymous = new ApiClient(server.baseUrl);
  for (const k of ['member', 'engineer', 'admin', 'machinist'] as const) {
    emails[k] = u[k].email;
    c[k] = new ApiClient(server.baseUrl);
    expect((await c[k].signIn(u[k].email, TEST_PASSWORD)).status).toBe(200);
  }
  const m = c.member;
  const project = (await m.post('/api/projects', { name: 'Fuzz swap', swapDescription: 'invented' })).body.project.id;
  const plate = async () => (await m.post(`/api/projects/${project}/plates`, { title: 'Fuzz plate', material: '6061-T6 aluminium' })).body.plate.id as number;
  const p1 = await plate();
  const approved = (await m.post(`/api/plates/${p1}/revisions`, { spec: demo, message: 'one', parentRevisionId: null })).body.revision.id;
  await m.post(`/api/revisions/${approved}/submit`, {});
  expect((await c.engineer.post(`/api/revisions/${approved}/approve`, { comment: 'ok' })).status).toBe(200);
  const draft = (await m.post(`/api/plates/${p1}/revisions`, { spec: demo, message: 'two', parentRevisionId: approved })).body.revision.id;
  const p2 = await plate();
  const inReview = (await m.post(`/api/plates/${p2}/revisions`, { spec: demo, message: 'review me', parentRevisionId: null })).body.revision.id;
  await m.post(`/api/revisions/${inReview}/submit`, {});
  const up = await postUpload(m, project, { name: 'f.xyz', bytes: '0 0 0\n10 0 0\n0 10 0\n10 10 0.01\n5 5 0\n' });
  expect(up.status).toBe(201);
  ids = { project, plate: p1, approved, draft, inReview, upload: up.body.upload.id, user: target.id };
}, 120_000);

afterAll(async () => {
  await server?.stop();
  await closeDb();
});

describe('API fuzz', () => {
  it('random and malformed bodies on every JSON endpoint: never 5xx, always a JSON error with a message', async () => {
    const list = targets();
    expect(list.length).toBeGreaterThan(20);
    for (const t of list) {
      const runs = t.route.includes('sign-in') || t.route.includes('password') ? 6 : 14;
      await fc.assert(
        fc.asyncProperty(bodyText, fc.constantFrom('application/json', 'application/json; charset=utf-8', 'text/plain'), async (text, type) => {
          const r = await c[t.who].request(t.method, t.path, text, { 'content-type': type });
          check(t.route, r, text);
        }),
        { numRuns: runs },
      );
    }
  });

  /**
   * A valid body for every JSON endpoint, so that an extra field is the only thing wrong with it.
   * Generated from the route list: an endpoint without a row here fails the test (a new endpoint
   * needs its row). Not JSON: sign-out takes no body, uploads are multipart, the payment webhook's
   * events come signed from the payment service with fields of its own.
   */
  const NOT_JSON = new Set(['POST /api/auth/sign-out', 'POST /sign-out', 'POST /api/projects/:id/uploads', 'POST /api/payments/webhook']);
  async function validBody(route: string): Promise<Record<string, unknown> | undefined> {
    const bodies: Record<string, () => Promise<Record<string, unknown>> | Record<string, unknown>> = {
      'PATCH /api/account': () => ({ name: 'Fuzz member' }),
      'PATCH /api/admin/shop-settings': async () => (await c.admin.get('/api/admin/shop-settings')).body.rates,
      'PATCH /api/admin/users/:id': () => ({ active: true }),
      'PATCH /api/orders/:id': () => ({ state: 'shipped' }),
      'PATCH /api/projects/:id': () => ({ name: 'Fuzz swap' }),
      'POST /api/account/password': () => ({ currentPassword: TEST_PASSWORD, newPassword: `${TEST_PASSWORD} changed` }),
      'POST /api/admin/invites': () => ({ email: 'strict-invite@example.test', role: 'designer' }),
      'POST /api/auth/password-reset': () => ({ email: 'nobody-here@example.test' }),
      'POST /api/auth/password-reset/:token': () => ({ password: 'a long enough new password' }),
      'POST /api/auth/sign-in': () => ({ email: emails.member, password: TEST_PASSWORD }),
      'POST /api/inspections/:id/accept': () => ({ comment: 'within the limits on the drawing' }),
      'POST /api/invites/:token': () => ({ name: 'Invited Person', password: 'a long enough new password' }),
      'POST /api/plates/:id/preview/drawing.pdf': () => ({ spec: demo }),
      'POST /api/plates/:id/revisions': () => ({ spec: demo, message: 'strict', parentRevisionId: ids.draft, asBranch: true }),
      'POST /api/projects': () => ({ name: 'Strict swap', swapDescription: '' }),
      'POST /api/projects/:id/members': () => ({ email: 'someone-else@example.test' }),
      'POST /api/projects/:id/plates': () => ({ title: 'Strict plate' }),
      'POST /api/quotes/:id/accept': () => ({}),
      'POST /api/revisions/:id/approve': () => ({ comment: 'ok' }),
      'POST /api/revisions/:id/inspections': () => ({}),
      'POST /api/revisions/:id/quotes': () => ({ quantity: 1 }),
      'POST /api/revisions/:id/request-changes': () => ({ comment: 'please change the bolt circle' }),
      'POST /api/revisions/:id/submit': () => ({}),
      'POST /api/uploads/:id/fit': () => ({ kind: 'plane' }),
      'PUT /api/inspections/:id/measurements': () => ({ rows: [] }),
    };
    const make = bodies[route];
    return make ? await make() : undefined;
  }

  it('an unknown field is refused with 400 naming it, on every JSON endpoint (nothing is changed)', async () => {
    const list = targets().filter((t) => !NOT_JSON.has(t.route));
    expect(list.length).toBeGreaterThan(20);
    const missing: string[] = [];
    const accepted: string[] = [];
    for (const t of list) {
      const body = await validBody(t.route);
      if (!body) {
        missing.push(t.route);
        continue;
      }
      const who = /\/measurements$|^POST \/api\/revisions\/:id\/inspections$/.test(t.route) ? 'machinist' : /\/inspections\/:id\/accept$/.test(t.route) ? 'engineer' : t.who;
      // anonymous routes get a fresh client each, so a wrongly accepted sign-in changes nothing for the other rows
      const client = who === 'anonymous' ? new ApiClient(server.baseUrl) : c[who];
      for (const extra of [{ sneakyExtraField: 1 }, { sneakyExtraField: { nested: true } }]) {
        const sent = { ...body, ...extra };
        const r = await client.request(t.method, t.path, JSON.stringify(sent), { 'content-type': 'application/json' });
        check(t.route, r, JSON.stringify(sent));
        const e = (r.body as { error?: { message?: string; fields?: Record<string, string> } }).error;
        if (r.status !== 400 || !e?.message?.includes('"sneakyExtraField"') || !e.fields?.sneakyExtraField) accepted.push(`${t.route} → ${r.status} ${JSON.stringify(r.body).slice(0, 200)}`);
      }
    }
    expect(missing, 'JSON endpoints without a valid body in the table').toEqual([]);
    expect(accepted, `endpoints that did not refuse an unknown field with 400 naming it:\n${accepted.join('\n')}`).toEqual([]);
    // nothing was changed by the refused requests: the member can still sign in with the old password
    expect((await new ApiClient(server.baseUrl).signIn(emails.member, TEST_PASSWORD)).status).toBe(200);
  });

  it('an unknown field inside a nested object is named with its path', async () => {
    // a revision of its own in review (the random bodies above may have approved the shared one)
    const plate = (await c.member.post(`/api/projects/${ids.project}/plates`, { title: 'Nested field plate' })).body.plate.id;
    const inReview = (await c.member.post(`/api/plates/${plate}/revisions`, { spec: demo, message: 'nested', parentRevisionId: null })).body.revision.id;
    expect((await c.member.post(`/api/revisions/${inReview}/submit`, {})).status).toBe(200);
    const r = await c.engineer.post(`/api/revisions/${inReview}/approve`, { comment: 'ok', waivers: [{ code: 'x', featureIds: [], reason: 'fine as drawn here', sneaky: 1 }] });
    expect(r.status).toBe(400);
    expect(r.body.error.fields['waivers.0.sneaky']).toMatch(/unknown field "waivers\.0\.sneaky"/);
    const rev = await c.member.get(`/api/revisions/${inReview}`);
    expect(rev.body.revision.status).toBe('in_review'); // not approved by the refused request
  });

  it('a body larger than the cap answers 413 (or 400), not 5xx', async () => {
    const big = JSON.stringify({ spec: demo, message: 'x'.repeat(6_000_000), parentRevisionId: null });
    const r = await c.member.request('POST', `/api/plates/${ids.plate}/revisions`, big);
    check('POST /api/plates/:id/revisions', r, 'big');
    expect([400, 413]).toContain(r.status);
  });

  it('mutated plate specs to save and preview: a revision, or a 4xx naming the problem', async () => {
    const paths: (string | number)[][] = [];
    const walk = (v: unknown, base: (string | number)[]) => {
      paths.push(base);
      if (Array.isArray(v)) v.forEach((x, i) => walk(x, [...base, i]));
      else if (v && typeof v === 'object') for (const [k, x] of Object.entries(v)) walk(x, [...base, k]);
    };
    walk(demo, []);
    const mutate = (spec: any, at: number, value: unknown) => {
      const p = paths[at]!;
      if (p.length === 0) return value;
      let o = spec;
      for (const k of p.slice(0, -1)) o = o?.[k];
      if (o && typeof o === 'object') o[p[p.length - 1]!] = value;
      return spec;
    };
    let saved = 0;
    let refused = 0;
    await fc.assert(
      fc.asyncProperty(fc.nat(paths.length - 1), fc.oneof(weird, fc.constant(undefined)), fc.boolean(), async (at, value, preview) => {
        const spec = mutate(structuredClone(demo), at, value);
        const list = await c.member.get(`/api/plates/${ids.plate}/revisions`);
        const parent = list.body.revisions[0]?.id ?? null;
        const path = preview ? `/api/plates/${ids.plate}/preview/drawing.pdf` : `/api/plates/${ids.plate}/revisions`;
        const r = await c.member.post(path, preview ? { spec } : { spec, message: 'fuzz', parentRevisionId: parent });
        check(path, r, String(JSON.stringify(spec)).slice(0, 200)); // the root itself may be mutated to undefined
        if (r.status < 300) saved++;
        else refused++;
      }),
      { numRuns: 30 },
    );
    expect(saved + refused).toBe(30);
    expect(refused).toBeGreaterThan(0);
  });

  it('random upload bytes and file names: stored or refused with a message, never 5xx', async () => {
    await fc.assert(
      fc.asyncProperty(fc.uint8Array({ maxLength: 3000 }), fc.constantFrom('a.xyz', 'a.csv', 'a.ply', 'a.stl', 'a.exe', 'noext', '../../etc/passwd.xyz', 'ä ü.csv'), fc.constantFrom('mm', 'in', 'furlong', ''), async (bytes, name, units) => {
        const r = await postUpload(c.member, ids.project, { name, bytes }, { units });
        check('POST /api/projects/:id/uploads', r, `${name} ${bytes.length} bytes`);
      }),
      { numRuns: 20 },
    );
  });

  it('the server stayed up and said nothing it should not have', async () => {
    expect((await c.anonymous.get('/api/health')).status).toBe(200);
    expect(server.output()).not.toContain(TEST_PASSWORD);
  });
});
