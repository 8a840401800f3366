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
const c = {} as Record<'member' | 'engineer' | 'admin' | 'anonymous', ApiClient>;
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
  const u = { member: await makeUser(db, 'designer', 'fuzzer'), engineer: await makeUser(db, 'engineer'), admin: await makeUser(db, 'admin') };
  const target = await makeUser(db, 'designer', 'fuzztarget');
  c.anonymous = new ApiClient(server.baseUrl);
  for (const k of ['member', 'engineer', 'admin'] as const) {
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
