import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { eq } from 'drizzle-orm';
import { extractText, getDocumentProxy } from 'unpdf';
import { closeDb, getDb } from '../../src/server/db/client';
import { auditEvents } from '../../src/server/db/schema';
import { startServer, testAppPort, type RunningServer } from '../support/server';
import { ApiClient } from '../support/auth';
import { makeUser, TEST_PASSWORD } from '../support/users';
import { waitForMail } from '../support/mail';
import type { SessionUser } from '../../src/server/auth/types';
import { parsePlateSpec, plateProfile } from '../../src/domain';
import { inspectionPlanFor, inspectionCsv, type MeasurementRow } from '../../src/domain/inspection';

const demoRaw = JSON.parse(readFileSync(new URL('../../templates/plates/demo.json', import.meta.url), 'utf8'));
const demoSpec = parsePlateSpec(demoRaw);
const plan = inspectionPlanFor(plateProfile(demoSpec), demoSpec.tolerances, demoRaw);

/** Every feature on nominal, sizes mid-limit, thickness on nominal, flatness 0.02. */
function perfect(): MeasurementRow[] {
  return [
    ...plan.holes.map((h) => ({ featureId: h.id, x: h.nominal.x, y: h.nominal.y, diameter: Math.round(((h.size.lowerMm + h.size.upperMm) / 2) * 1000) / 1000 })),
    ...[1, 2, 3, 4].map((i) => ({ featureId: `THK${i}`, z: plan.thickness.nominalMm })),
    { featureId: 'FLAT', z: 0.02 },
  ];
}

let server: RunningServer;
const people: Record<string, SessionUser> = {};
const c: Record<string, ApiClient> = {};
let approvedRev = 0;
let draftRev = 0;

beforeAll(async () => {
  server = await startServer(testAppPort(15));
  const db = getDb();
  for (const role of ['designer', 'engineer', 'machinist', 'admin'] as const) people[role] = await makeUser(db, role);
  people.machinist2 = await makeUser(db, 'machinist', 'second');
  for (const [k, u] of Object.entries(people)) {
    c[k] = new ApiClient(server.baseUrl);
    expect((await c[k]!.signIn(u.email, TEST_PASSWORD)).status, `sign-in ${k}`).toBe(200);
  }
  c.anonymous = new ApiClient(server.baseUrl);
  const p = await c.designer!.post('/api/projects', { name: 'Inspection swap', swapDescription: 'invented' });
  const pl = await c.designer!.post(`/api/projects/${p.body.project.id}/plates`, { title: 'Inspected plate', material: '6061-T651 aluminium', partNumber: `IT-INSP-${Date.now().toString(36).toUpperCase()}` });
  const r1 = await c.designer!.post(`/api/plates/${pl.body.plate.id}/revisions`, { spec: demoRaw, message: 'for inspection', parentRevisionId: null });
  approvedRev = r1.body.revision.id;
  expect((await c.designer!.post(`/api/revisions/${approvedRev}/submit`, {})).status).toBe(200);
  const ap = await c.engineer!.post(`/api/revisions/${approvedRev}/approve`, { comment: 'ok', waivers: [] });
  if (ap.status !== 200) {
    // waivers may be needed for the demo's findings: approve with a waiver for each
    const rev = await c.engineer!.get(`/api/revisions/${approvedRev}`);
    const waivers = (rev.body.revision.checks as { code: string; featureIds: string[]; severity: string }[]).filter((f) => f.severity !== 'note').map((f) => ({ code: f.code, featureIds: f.featureIds, reason: 'accepted for the test plate' }));
    expect((await c.engineer!.post(`/api/revisions/${approvedRev}/approve`, { comment: 'ok', waivers })).status).toBe(200);
  }
  const r2 = await c.designer!.post(`/api/plates/${pl.body.plate.id}/revisions`, { spec: { ...demoRaw, thicknessMm: 15 }, message: 'draft', parentRevisionId: approvedRev });
  draftRev = r2.body.revision.id;
}, 180_000);

afterAll(async () => {
  await server?.stop();
  await closeDb();
});

describe('inspections over HTTP', () => {
  it('only machinists start, only on released revisions', async () => {
    for (const who of ['designer', 'engineer', 'admin']) expect((await c[who]!.post(`/api/revisions/${approvedRev}/inspections`, {})).status, who).toBe(403);
    expect((await c.anonymous!.post(`/api/revisions/${approvedRev}/inspections`, {})).status).toBe(401);
    const draft = await c.machinist!.post(`/api/revisions/${draftRev}/inspections`, {});
    expect(draft.status).toBe(404);
    expect(draft.body.error.message).toMatch(/approved \(released\) revisions only/);
    const ok = await c.machinist!.post(`/api/revisions/${approvedRev}/inspections`, {});
    expect(ok.status).toBe(201);
    expect(ok.body.inspection).toMatchObject({ id: ok.body.id, state: 'in_progress', revision: { id: approvedRev } });
    expect(ok.body.inspection.artifactHashes.map((f: { name: string }) => f.name)).toContain('drawing.pdf');
  });

  it('rejects bad rows per row and keeps what was saved', async () => {
    const id = (await c.machinist!.post(`/api/revisions/${approvedRev}/inspections`, {})).body.id;
    const first = await c.machinist!.request('PUT', `/api/inspections/${id}/measurements`, { rows: perfect().slice(0, 3) });
    expect(first.status).toBe(200);
    expect(first.body.overall).toBe('incomplete');
    const bad = await c.machinist!.request('PUT', `/api/inspections/${id}/measurements`, { rows: [{ featureId: 'NOPE', x: 1, y: 2 }, { featureId: 'E1', x: 1 }] });
    expect(bad.status).toBe(400);
    expect(bad.body.error.code).toBe('invalid_measurements');
    expect(bad.body.error.rows.map((r: { row: number }) => r.row)).toEqual([0, 1]);
    const csv = await c.machinist!.request('PUT', `/api/inspections/${id}/measurements`, 'id,x,y,diameter\nE1,1.2.3,4,9\nQ7,1,2,3\n', { 'content-type': 'text/csv' });
    expect(csv.status).toBe(400);
    expect(csv.body.error.rows).toEqual([expect.objectContaining({ row: 2, column: 'x' }), expect.objectContaining({ row: 3, featureId: 'Q7' })]);
    const kept = await c.machinist!.get(`/api/inspections/${id}`);
    expect(kept.body.inspection.measurements).toHaveLength(3);
    expect((await c.engineer!.request('PUT', `/api/inspections/${id}/measurements`, { rows: [] })).status).toBe(403);
    // finishing with features missing is refused and saves nothing
    const early = await c.machinist!.request('PUT', `/api/inspections/${id}/measurements`, { rows: perfect().slice(0, 5), finish: true });
    expect(early.status).toBe(409);
    expect((await c.machinist!.get(`/api/inspections/${id}`)).body.inspection.measurements).toHaveLength(3);
  });

  it('a CSV of a perfect part passes and closes; a passed inspection cannot be accepted', async () => {
    const id = (await c.machinist2!.post(`/api/revisions/${approvedRev}/inspections`, {})).body.id;
    const r = await c.machinist2!.request('PUT', `/api/inspections/${id}/measurements?finish=1`, inspectionCsv(perfect()), { 'content-type': 'text/csv' });
    expect(r.status).toBe(200);
    expect(r.body).toMatchObject({ state: 'passed', overall: 'passed', failing: [] });
    expect(r.body.results.find((x: { featureId: string }) => x.featureId === 'ED1')).toMatchObject({ truePositionMm: 0, result: 'pass' });
    expect((await c.engineer!.post(`/api/inspections/${id}/accept`, { comment: 'fine as it is' })).status).toBe(409);
    expect((await c.machinist2!.request('PUT', `/api/inspections/${id}/measurements`, { rows: perfect() })).status).toBe(409);
  });

  it('one dowel oversize → failed; only engineers accept, with a comment; report names the failing feature; designer mailed', async () => {
    const id = (await c.machinist!.post(`/api/revisions/${approvedRev}/inspections`, {})).body.id;
    const rows = perfect().map((r) => (r.featureId === 'ED1' ? { ...r, diameter: 10.02 } : r)); // H7 Ø10 allows 10.000…10.015 (ISO 286-1)
    const r = await c.machinist!.request('PUT', `/api/inspections/${id}/measurements`, { rows, finish: true });
    expect(r.status).toBe(200);
    expect(r.body.state).toBe('failed');
    expect(r.body.failing).toEqual(['ED1']);
    const ed1 = r.body.results.find((x: { featureId: string }) => x.featureId === 'ED1');
    expect(ed1.sizeDeviationMm).toBeCloseTo(0.02, 9);
    expect(ed1.result).toBe('fail');
    const mail = await waitForMail(people.designer!.email, /Inspection failed/);
    expect(mail.text).toContain(`/api/inspections/${id}/report.pdf`);
    expect(mail.text).toContain('ED1');

    expect((await c.machinist!.post(`/api/inspections/${id}/accept`, { comment: 'looks fine to me' })).status).toBe(403);
    expect((await c.designer!.post(`/api/inspections/${id}/accept`, { comment: 'looks fine to me' })).status).toBe(403);
    const noComment = await c.engineer!.post(`/api/inspections/${id}/accept`, {});
    expect(noComment.status).toBe(400);
    expect(noComment.body.error.fields.comment).toMatch(/required/);
    const acc = await c.engineer!.post(`/api/inspections/${id}/accept`, { comment: 'Dowel pin is a slip fit; ream to next size approved.' });
    expect(acc.status).toBe(200);
    expect(acc.body.inspection).toMatchObject({ state: 'accepted_with_deviation', acceptComment: 'Dowel pin is a slip fit; ream to next size approved.' });

    const events = await getDb().select().from(auditEvents).where(eq(auditEvents.targetId, String(id)));
    expect(events.filter((e) => e.targetType === 'inspection').map((e) => e.action)).toEqual(expect.arrayContaining(['inspection.started', 'inspection.failed', 'inspection.accepted_with_deviation']));

    // the designer (revision author) opens the report from the mail
    const pdf = await fetch(`${server.baseUrl}/api/inspections/${id}/report.pdf`, { headers: { cookie: `platewright_session=${c.designer!.sessionCookie}` } });
    expect(pdf.status).toBe(200);
    expect(pdf.headers.get('content-type')).toBe('application/pdf');
    const doc = await getDocumentProxy(new Uint8Array(await pdf.arrayBuffer()));
    const { text } = await extractText(doc, { mergePages: true });
    expect(text).toMatch(/ED1 FAIL/);
    expect(text).toMatch(/ACCEPTED WITH DEVIATION/);
    expect(text).toMatch(/Out of tolerance: ED1/);
    expect(text).toContain(acc.body.inspection.artifactHashes[0].sha256);
    expect(text).toMatch(/dial indicator/);

    const list = await c.engineer!.get(`/api/plates/${acc.body.inspection.plate.id}/inspections`);
    expect(list.status).toBe(200);
    expect(list.body.inspections.find((i: { id: number }) => i.id === id)).toMatchObject({ state: 'accepted_with_deviation', failing: ['ED1'] });
    expect((await c.anonymous!.get(`/api/inspections/${id}`)).status).toBe(401);
  });
});
