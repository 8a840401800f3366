import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { createHash } from 'node:crypto';
import { closeDb, getDb } from '../../src/server/db/client';
import { startServer, testAppPort, type RunningServer } from '../support/server';
import { ApiClient } from '../support/auth';
import { makeUser, TEST_PASSWORD } from '../support/users';
import type { SessionUser } from '../../src/server/auth/types';

const demoSpec = JSON.parse(readFileSync(new URL('../../templates/plates/demo.json', import.meta.url), 'utf8'));
const withMargin = (m: number) => ({ ...demoSpec, outline: { ...demoSpec.outline, edgeMarginMm: m } });

let server: RunningServer;
const people: Record<'designer' | 'outsider' | 'engineer' | 'engineer2' | 'machinist' | 'admin', SessionUser> = {} as never;
const clients: Record<string, ApiClient> = {};

beforeAll(async () => {
  server = await startServer(testAppPort(5));
  const db = getDb();
  people.designer = await makeUser(db, 'designer');
  people.outsider = await makeUser(db, 'designer', 'outsider');
  people.engineer = await makeUser(db, 'engineer');
  people.engineer2 = await makeUser(db, 'engineer', 'second');
  people.machinist = await makeUser(db, 'machinist');
  people.admin = await makeUser(db, 'admin');
  for (const [k, u] of Object.entries(people)) {
    const c = new ApiClient(server.baseUrl);
    const r = await c.signIn(u.email, TEST_PASSWORD);
    expect(r.status, `sign-in of ${k}`).toBe(200);
    clients[k] = c;
  }
  clients.anonymous = new ApiClient(server.baseUrl);
}, 120_000);

afterAll(async () => {
  await server?.stop();
  await closeDb();
});

describe('projects, plates and revisions over HTTP', () => {
  it('walks the workflow with the documented response shapes and status codes', async () => {
    const d = clients.designer;
    const p = await d.post('/api/projects', { name: 'HTTP swap', swapDescription: 'invented' });
    expect(p.status).toBe(201);
    expect(p.body.project).toMatchObject({ name: 'HTTP swap', plates: [] });
    const projectId = p.body.project.id;

    expect((await d.post('/api/projects', { name: '', extra: 1 })).status).toBe(400);
    const unknownField = await d.post(`/api/projects/${projectId}/plates`, { title: 'x', colour: 'red' });
    expect(unknownField.status).toBe(400);
    expect(unknownField.body.error.message).toMatch(/colour/);

    const pl = await d.post(`/api/projects/${projectId}/plates`, { title: 'Adapter', material: '6061-T651 aluminium' });
    expect(pl.status).toBe(201);
    expect(pl.body.plate.partNumber).toMatch(/^PW-\d{4}$/);
    const plateId = pl.body.plate.id;

    const r1 = await d.post(`/api/plates/${plateId}/revisions`, { spec: demoSpec, message: 'first', parentRevisionId: null });
    expect(r1.status).toBe(201);
    expect(r1.body.revision).toMatchObject({ number: 1, status: 'draft' });
    const rev1 = r1.body.revision.id;

    const r2 = await d.post(`/api/plates/${plateId}/revisions`, { spec: withMargin(14), message: 'second', parentRevisionId: rev1 });
    expect(r2.status).toBe(201);
    const stale = await d.post(`/api/plates/${plateId}/revisions`, { spec: withMargin(15), message: 'stale', parentRevisionId: rev1 });
    expect(stale.status).toBe(409);
    expect(stale.body.error).toMatchObject({ code: 'stale_parent', latestRevision: { number: 2 }, parentRevision: { number: 1 } });

    const list = await d.get(`/api/plates/${plateId}/revisions`);
    expect(list.status).toBe(200);
    expect(list.body.revisions.map((r: { number: number }) => r.number)).toEqual([2, 1]);

    const rev2 = r2.body.revision.id;
    expect((await d.post(`/api/revisions/${rev2}/submit`, {})).status).toBe(200);
    expect((await clients.engineer.get('/api/review-queue')).body.queue.map((q: { revisionId: number }) => q.revisionId)).toContain(rev2);
    expect((await clients.designer.get('/api/review-queue')).status).toBe(403);
    expect((await clients.engineer.post(`/api/revisions/${rev2}/request-changes`, {})).status).toBe(400); // comment required
    expect((await clients.designer.post(`/api/revisions/${rev2}/approve`, {})).status).toBe(403);
    expect((await clients.machinist.post(`/api/revisions/${rev2}/approve`, {})).status).toBe(403);
    expect((await clients.anonymous.post(`/api/revisions/${rev2}/approve`, {})).status).toBe(401);

    const approved = await clients.engineer.post(`/api/revisions/${rev2}/approve`, { comment: 'ok' });
    expect(approved.status).toBe(200);
    expect(approved.body.revision.status).toBe('approved');
    const files = approved.body.revision.files as { name: string; sha256: string; bytes: number }[];
    expect(files.map((f) => f.name).sort()).toEqual(['drawing.pdf', 'holes.csv', 'plate.dxf', 'plate.step', 'plate.svg']);
    expect((await clients.engineer.post(`/api/revisions/${rev2}/approve`, { comment: 'again' })).status).toBe(409);

    // the machinist sees the release and downloads exactly the stored bytes
    const rel = await clients.machinist.get('/api/releases');
    expect(rel.status).toBe(200);
    const mine = rel.body.releases.find((r: { plateId: number }) => r.plateId === plateId);
    expect(mine).toMatchObject({ revisionId: rev2, revision: 2, partNumber: pl.body.plate.partNumber });
    for (const f of mine.files as { name: string; sha256: string; bytes: number }[]) {
      const res = await fetch(`${server.baseUrl}/api/revisions/${rev2}/files/${f.name}`, { headers: { cookie: `platewright_session=${clients.machinist.sessionCookie}` } });
      expect(res.status).toBe(200);
      const bytes = new Uint8Array(await res.arrayBuffer());
      expect(bytes.byteLength).toBe(f.bytes);
      expect(createHash('sha256').update(bytes).digest('hex')).toBe(f.sha256);
      if (f.name === 'plate.dxf') expect(res.headers.get('content-disposition')).toMatch(new RegExp(`^attachment; filename="${pl.body.plate.partNumber}-rev2\\.dxf"`));
    }
    // …but not the unreleased first revision, nor the project
    expect((await clients.machinist.get(`/api/revisions/${rev1}`)).status).toBe(404);
    expect((await clients.machinist.get(`/api/revisions/${rev1}/files/plate.dxf`)).status).toBe(404);
    expect((await clients.machinist.get(`/api/projects/${projectId}`)).status).toBe(403);

    const cmp = await d.get(`/api/revisions/${rev1}/compare/${rev2}`);
    expect(cmp.status).toBe(200);
    expect(cmp.body.comparison.otherChanges).toEqual(expect.arrayContaining([expect.objectContaining({ path: 'outline.edgeMarginMm', to: 14 })]));
  });

  it('hides other designers’ projects (404) and checks object ids on every route', async () => {
    const p = await clients.designer.post('/api/projects', { name: 'Private swap', swapDescription: '' });
    const projectId = p.body.project.id;
    const pl = await clients.designer.post(`/api/projects/${projectId}/plates`, { title: 'Private plate' });
    const plateId = pl.body.plate.id;
    const r = await clients.designer.post(`/api/plates/${plateId}/revisions`, { spec: demoSpec, message: '', parentRevisionId: null });
    const revId = r.body.revision.id;
    const o = clients.outsider;
    expect((await o.get(`/api/projects/${projectId}`)).status).toBe(404);
    expect((await o.patch(`/api/projects/${projectId}`, { name: 'mine now' })).status).toBe(404);
    expect((await o.post(`/api/projects/${projectId}/plates`, { title: 'x' })).status).toBe(404);
    expect((await o.post(`/api/projects/${projectId}/members`, { email: people.outsider.email })).status).toBe(404);
    expect((await o.get(`/api/plates/${plateId}`)).status).toBe(404);
    expect((await o.post(`/api/plates/${plateId}/revisions`, { spec: demoSpec, message: '', parentRevisionId: revId })).status).toBe(404);
    expect((await o.get(`/api/revisions/${revId}`)).status).toBe(404);
    expect((await o.post(`/api/revisions/${revId}/submit`, {})).status).toBe(404);
    expect((await o.get(`/api/revisions/${revId}/files/plate.dxf`)).status).toBe(404);
    expect((await clients.engineer.get(`/api/projects/${projectId}`)).status).toBe(200); // engineers see all
    // a member gets in
    expect((await clients.designer.post(`/api/projects/${projectId}/members`, { email: people.outsider.email })).status).toBe(201);
    expect((await o.get(`/api/projects/${projectId}`)).status).toBe(200);
  });

  it('previews unreleased files on request and names them by part number and revision', async () => {
    const p = await clients.designer.post('/api/projects', { name: 'Preview swap', swapDescription: '' });
    const pl = await clients.designer.post(`/api/projects/${p.body.project.id}/plates`, { title: 'Preview plate' });
    const r = await clients.designer.post(`/api/plates/${pl.body.plate.id}/revisions`, { spec: demoSpec, message: '', parentRevisionId: null });
    const res = await fetch(`${server.baseUrl}/api/revisions/${r.body.revision.id}/files/holes.csv`, { headers: { cookie: `platewright_session=${clients.designer.sessionCookie}` } });
    expect(res.status).toBe(200);
    expect(res.headers.get('x-platewright-preview')).toBe('yes');
    expect(res.headers.get('content-disposition')).toMatch(new RegExp(`^attachment; filename="${pl.body.plate.partNumber}-rev1-holes\\.csv"`));
    const text = await res.text();
    expect(text.split(/\r?\n/)[0]).toBe('id,face,operation,x_mm,y_mm,diameter_mm,thread,depth_mm');
    expect((await clients.designer.get(`/api/revisions/${r.body.revision.id}/files/secret.txt`)).status).toBe(404);
  });
});
