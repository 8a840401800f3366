/**
 * The read paths keep some things in memory (a revision's immutable spec and checks, released
 * files' bytes by sha256). These tests hold them to it: status, reviews, access and sessions are
 * always read fresh, and a cached file is byte-identical to the stored one. Also the project
 * list's plate counts and states (one joined query) against what was done to each plate.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { createHash } from 'node:crypto';
import { closeDb, getDb } from '../../src/server/db/client';
import { startServer, testAppPort, type RunningServer } from '../support/server';
import { ApiClient } from '../support/auth';
import { makeUser, TEST_PASSWORD } from '../support/users';
import type { SessionUser } from '../../src/server/auth/types';

const demoSpec = JSON.parse(readFileSync(new URL('../../templates/plates/demo.json', import.meta.url), 'utf8'));

let server: RunningServer;
const people = {} as Record<'designer' | 'engineer' | 'machinist' | 'admin' | 'other', SessionUser>;
const clients = {} as Record<keyof typeof people, ApiClient>;

async function signedIn(u: SessionUser): Promise<ApiClient> {
  const c = new ApiClient(server.baseUrl);
  expect((await c.signIn(u.email, TEST_PASSWORD)).status).toBe(200);
  return c;
}

async function download(c: ApiClient, revisionId: number, name: string) {
  const headers: Record<string, string> = {};
  if (c.cookies.size) headers.cookie = [...c.cookies].map(([k, v]) => `${k}=${v}`).join('; ');
  const r = await fetch(`${server.baseUrl}/api/revisions/${revisionId}/files/${name}`, { headers });
  const bytes = Buffer.from(await r.arrayBuffer());
  return { status: r.status, bytes, sha: r.headers.get('x-content-sha256'), sha256: createHash('sha256').update(bytes).digest('hex') };
}

beforeAll(async () => {
  server = await startServer(testAppPort(30));
  const db = getDb();
  people.designer = await makeUser(db, 'designer', 'fresh');
  people.other = await makeUser(db, 'designer', 'freshother');
  people.engineer = await makeUser(db, 'engineer', 'fresh');
  people.machinist = await makeUser(db, 'machinist', 'fresh');
  people.admin = await makeUser(db, 'admin', 'fresh');
  for (const k of Object.keys(people) as (keyof typeof people)[]) clients[k] = await signedIn(people[k]);
}, 120_000);

afterAll(async () => {
  await server?.stop();
  await closeDb();
});

describe('reads stay fresh where it matters', () => {
  it('status, reviews and the machinist’s access follow the workflow at once; released bytes match their hash on every download', async () => {
    const d = clients.designer;
    const project = (await d.post('/api/projects', { name: 'Freshness swap', swapDescription: 'invented' })).body.project.id;
    const plate = (await d.post(`/api/projects/${project}/plates`, { title: 'Fresh plate' })).body.plate.id;
    const rev = (await d.post(`/api/plates/${plate}/revisions`, { spec: demoSpec, message: 'one', parentRevisionId: null })).body.revision.id;

    // warm every read path while the revision is a draft
    const draft = await d.get(`/api/revisions/${rev}`);
    expect(draft.body.revision).toMatchObject({ status: 'draft', history: [], files: [] });
    expect((await clients.machinist.get(`/api/revisions/${rev}`)).status).toBe(404);
    expect((await download(clients.machinist, rev, 'plate.dxf')).status).toBe(404);

    expect((await d.post(`/api/revisions/${rev}/submit`, { comment: 'please look' })).status).toBe(200);
    const inReview = await d.get(`/api/revisions/${rev}`);
    expect(inReview.body.revision.status).toBe('in_review');
    expect(inReview.body.revision.history.map((h: { decision: string }) => h.decision)).toEqual(['submitted']);

    expect((await clients.engineer.post(`/api/revisions/${rev}/approve`, { comment: 'released' })).status).toBe(200);
    const approved = await d.get(`/api/revisions/${rev}`);
    expect(approved.body.revision.status).toBe('approved');
    expect(approved.body.revision.approvedBy).toMatchObject({ id: people.engineer.id });
    expect(approved.body.revision.files.map((f: { name: string }) => f.name)).toContain('plate.dxf');
    // the same spec as at save time (the content read from memory is the stored one)
    expect(approved.body.revision.spec).toEqual(draft.body.revision.spec);
    expect(approved.body.revision.specSha256).toBe(draft.body.revision.specSha256);

    // the machinist sees it now, and every download (first from the database, then from memory) is the stored file
    const listed = approved.body.revision.files.find((f: { name: string }) => f.name === 'plate.dxf');
    for (let i = 0; i < 3; i++) {
      const f = await download(clients.machinist, rev, 'plate.dxf');
      expect(f.status).toBe(200);
      expect(f.sha256).toBe(listed.sha256);
      expect(f.sha).toBe(listed.sha256);
      expect(f.bytes.byteLength).toBe(listed.bytes);
    }

    // a new revision on top supersedes it: the machinist loses the old one at once
    const rev2 = (await d.post(`/api/plates/${plate}/revisions`, { spec: { ...demoSpec, outline: { ...demoSpec.outline, edgeMarginMm: demoSpec.outline.edgeMarginMm + 1 } }, message: 'two', parentRevisionId: rev })).body.revision.id;
    await d.post(`/api/revisions/${rev2}/submit`, {});
    expect((await clients.engineer.post(`/api/revisions/${rev2}/approve`, { comment: 'released again' })).status).toBe(200);
    expect((await d.get(`/api/revisions/${rev}`)).body.revision.status).toBe('superseded');
    expect((await clients.machinist.get(`/api/revisions/${rev}`)).status).toBe(404);
    expect((await download(clients.machinist, rev, 'plate.dxf')).status).toBe(404);
    expect((await download(clients.machinist, rev2, 'plate.dxf')).status).toBe(200);
  });

  it('someone without access never gets the cached content; access given later works at once', async () => {
    const d = clients.designer;
    const project = (await d.post('/api/projects', { name: 'Private swap', swapDescription: 'invented' })).body.project.id;
    const plate = (await d.post(`/api/projects/${project}/plates`, { title: 'Private plate' })).body.plate.id;
    const rev = (await d.post(`/api/plates/${plate}/revisions`, { spec: demoSpec, message: 'one', parentRevisionId: null })).body.revision.id;
    expect((await d.get(`/api/revisions/${rev}`)).status).toBe(200); // in memory now
    expect((await clients.other.get(`/api/revisions/${rev}`)).status).toBe(404);
    expect((await download(clients.other, rev, 'plate.dxf')).status).toBe(404);
    expect((await d.post(`/api/projects/${project}/members`, { email: people.other.email })).status).toBeLessThan(300);
    expect((await clients.other.get(`/api/revisions/${rev}`)).status).toBe(200);
  });

  it('sign-out, sign-out everywhere (password change) and deactivation end access with the very next request', async () => {
    const project = (await clients.designer.post('/api/projects', { name: 'Session swap', swapDescription: 'invented' })).body.project.id;
    const plate = (await clients.designer.post(`/api/projects/${project}/plates`, { title: 'Session plate' })).body.plate.id;
    const rev = (await clients.designer.post(`/api/plates/${plate}/revisions`, { spec: demoSpec, message: 'one', parentRevisionId: null })).body.revision.id;
    await clients.designer.post(`/api/revisions/${rev}/submit`, {});
    await clients.engineer.post(`/api/revisions/${rev}/approve`, { comment: 'ok' });

    // sign-out
    const a = await signedIn(people.machinist);
    expect((await download(a, rev, 'plate.dxf')).status).toBe(200);
    const kept = new Map(a.cookies);
    expect((await a.post('/api/auth/sign-out')).status).toBe(204);
    a.cookies = kept; // the old cookie, replayed
    expect((await a.get(`/api/revisions/${rev}`)).status).toBe(401);
    expect((await download(a, rev, 'plate.dxf')).status).toBe(401);

    // password change ends the other sessions
    const phone = await signedIn(people.designer);
    const laptop = await signedIn(people.designer);
    expect((await phone.get(`/api/revisions/${rev}`)).status).toBe(200);
    expect((await phone.get('/api/projects')).status).toBe(200);
    const newPassword = `${TEST_PASSWORD} renewed`;
    expect((await laptop.post('/api/account/password', { currentPassword: TEST_PASSWORD, newPassword })).status).toBe(200);
    expect((await phone.get(`/api/revisions/${rev}`)).status).toBe(401);
    expect((await phone.get('/api/projects')).status).toBe(401);
    expect((await download(phone, rev, 'plate.dxf')).status).toBe(401);
    expect((await laptop.get(`/api/revisions/${rev}`)).status).toBe(200);
    expect((await laptop.post('/api/account/password', { currentPassword: newPassword, newPassword: TEST_PASSWORD })).status).toBe(200);

    // deactivation by an admin
    const m = await signedIn(people.machinist);
    expect((await download(m, rev, 'plate.dxf')).status).toBe(200);
    expect((await clients.admin.patch(`/api/admin/users/${people.machinist.id}`, { active: false })).status).toBe(200);
    expect((await download(m, rev, 'plate.dxf')).status).toBe(401);
    expect((await m.get(`/api/revisions/${rev}`)).status).toBe(401);
    expect((await clients.admin.patch(`/api/admin/users/${people.machinist.id}`, { active: true })).status).toBe(200);
  });

  it('the project list counts each plate once with the state of its latest revision', async () => {
    const o = clients.other;
    const project = (await o.post('/api/projects', { name: 'Counting swap', swapDescription: 'invented' })).body.project.id;
    const list0 = (await o.get('/api/projects')).body.projects.find((p: { id: number }) => p.id === project);
    expect(list0).toMatchObject({ plateCount: 0, status: 'empty', owner: { id: people.other.id } });

    const empty = (await o.post(`/api/projects/${project}/plates`, { title: 'No revision yet' })).body.plate.id;
    expect(empty).toBeGreaterThan(0);
    const list1 = (await o.get('/api/projects')).body.projects.find((p: { id: number }) => p.id === project);
    expect(list1).toMatchObject({ plateCount: 1, status: 'draft' }); // a plate without a revision counts as a draft

    const plate = (await o.post(`/api/projects/${project}/plates`, { title: 'Three revisions' })).body.plate.id;
    const r1 = (await o.post(`/api/plates/${plate}/revisions`, { spec: demoSpec, message: 'one', parentRevisionId: null })).body.revision.id;
    await o.post(`/api/revisions/${r1}/submit`, {});
    const list2 = (await o.get('/api/projects')).body.projects.find((p: { id: number }) => p.id === project);
    expect(list2).toMatchObject({ plateCount: 2, status: 'in_review' });

    expect((await clients.engineer.post(`/api/revisions/${r1}/approve`, { comment: 'ok' })).status).toBe(200);
    const r2 = (await o.post(`/api/plates/${plate}/revisions`, { spec: demoSpec, message: 'two', parentRevisionId: r1 })).body.revision.id;
    expect(r2).toBeGreaterThan(r1);
    // latest revision of that plate is a draft now; the project shows the most advanced latest state
    const list3 = (await o.get('/api/projects')).body.projects.find((p: { id: number }) => p.id === project);
    expect(list3).toMatchObject({ plateCount: 2, status: 'draft' });

    // the engineer sees the same counts; the first designer (not a member) does not see it at all
    const asEngineer = (await clients.engineer.get('/api/projects')).body.projects.find((p: { id: number }) => p.id === project);
    expect(asEngineer).toMatchObject({ plateCount: 2, status: 'draft' });
    const designer = await signedIn(people.designer); // its first session ended with the password change above
    expect((await designer.get('/api/projects')).body.projects.some((p: { id: number }) => p.id === project)).toBe(false);
    // each project once
    const ids = (await clients.engineer.get('/api/projects')).body.projects.map((p: { id: number }) => p.id);
    expect(new Set(ids).size).toBe(ids.length);
  });
});
