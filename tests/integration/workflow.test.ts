import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { createHash } from 'node:crypto';
import { eq, sql } from 'drizzle-orm';
import { closeDb, getDb } from '../../src/server/db/client';
import { auditEvents, reviews, revisions, artifacts } from '../../src/server/db/schema';
import type { SessionUser } from '../../src/server/auth/types';
import { AppError } from '../../src/server/errors';
import { createProject, addMember, listProjects } from '../../src/server/repos/projects';
import { createPlate, getPlate } from '../../src/server/repos/plates';
import {
  approveRevision,
  compareRevisions,
  getRevision,
  storedFileForViewer,
  listReleases,
  requestChanges,
  reviewQueue,
  saveRevision,
  submitRevision,
  type ReleaseFile,
} from '../../src/server/repos/revisions';
import { makeUser } from '../support/users';
import { parsePlateSpec, plateProfile } from '../../src/domain/index';

const db = () => getDb();
const demoSpec = JSON.parse(readFileSync(new URL('../../templates/plates/demo.json', import.meta.url), 'utf8'));
/** The demo plate with a wider edge margin: a harmless change that keeps the checks free of errors. */
const withMargin = (marginMm: number) => ({ ...demoSpec, outline: { ...demoSpec.outline, edgeMarginMm: marginMm } });
/** What the repository stores: the spec as the schema reads it (defaults filled in). */
const stored = (s: unknown) => parsePlateSpec(s);
const sha = (b: Uint8Array) => createHash('sha256').update(b).digest('hex');

/** Files for approval in these tests: small, real bytes with real hashes (the kernel is tested elsewhere). */
const fakeFiles = async ({ revision }: { revision: { id: number } }): Promise<ReleaseFile[]> => {
  const bytes = new TextEncoder().encode(`file of revision ${revision.id}`);
  return [{ name: 'plate.dxf', contentType: 'image/vnd.dxf', bytes, sha256: sha(bytes), kernelVersion: 'test' }];
};

let designer: SessionUser, designer2: SessionUser, outsider: SessionUser, engineer: SessionUser, engineer2: SessionUser, machinist: SessionUser, admin: SessionUser;

beforeAll(async () => {
  designer = await makeUser(db(), 'designer');
  designer2 = await makeUser(db(), 'designer', 'member');
  outsider = await makeUser(db(), 'designer', 'outsider');
  engineer = await makeUser(db(), 'engineer');
  engineer2 = await makeUser(db(), 'engineer', 'engineertwo');
  machinist = await makeUser(db(), 'machinist');
  admin = await makeUser(db(), 'admin');
});
afterAll(async () => {
  await closeDb();
});

async function expectAppError(p: Promise<unknown>, status: number, code?: string): Promise<AppError> {
  const e = await p.then(
    () => {
      throw new Error(`expected an error with status ${status}, but it succeeded`);
    },
    (err) => err,
  );
  expect(e).toBeInstanceOf(AppError);
  expect((e as AppError).status).toBe(status);
  if (code) expect((e as AppError).code).toBe(code);
  return e as AppError;
}

async function snapshot(revisionId: number) {
  const [r] = await db().select().from(revisions).where(eq(revisions.id, revisionId));
  const [{ n: reviewCount }] = await db().select({ n: sql<number>`count(*)` }).from(reviews).where(eq(reviews.revisionId, revisionId));
  const [{ n: auditCount }] = await db().select({ n: sql<number>`count(*)` }).from(auditEvents);
  return { status: r.status, reviewCount: Number(reviewCount), auditCount: Number(auditCount) };
}

async function newPlate(owner = designer) {
  const { id: projectId } = await createProject(db(), owner, { name: `Workflow ${Math.random().toString(36).slice(2, 7)}`, swapDescription: 'invented test swap' });
  const plate = await createPlate(db(), owner, projectId, { title: 'Test adapter', material: '6061-T651 aluminium' });
  return { projectId, plateId: plate.id, partNumber: plate.partNumber };
}

describe('projects and visibility', () => {
  it('designers see their own and member projects, engineers all, machinists none', async () => {
    const { projectId } = await newPlate();
    const mine = await listProjects(db(), designer);
    expect(mine.map((p) => p.id)).toContain(projectId);
    expect((await listProjects(db(), outsider)).map((p) => p.id)).not.toContain(projectId);
    await addMember(db(), designer, projectId, designer2.email);
    expect((await listProjects(db(), designer2)).map((p) => p.id)).toContain(projectId);
    expect((await listProjects(db(), engineer)).map((p) => p.id)).toContain(projectId);
    await expectAppError(listProjects(db(), machinist), 403);
  });

  it('suggests the next free part number and refuses a taken one', async () => {
    const a = await newPlate();
    const b = await newPlate();
    const na = Number(a.partNumber.replace('PW-', ''));
    const nb = Number(b.partNumber.replace('PW-', ''));
    expect(nb).toBeGreaterThan(na);
    await expectAppError(createPlate(db(), designer, a.projectId, { partNumber: a.partNumber, title: 'dup', material: 'x' }), 409, 'part_number_taken');
  });
});

describe('revisions are immutable', () => {
  it('saving creates N+1 with spec, hash and checks; the database refuses to change a saved spec', async () => {
    const { plateId } = await newPlate();
    const r1 = await saveRevision(db(), designer, plateId, { spec: demoSpec, message: 'first', parentRevisionId: null });
    expect(r1.number).toBe(1);
    expect(r1.specSha256).toMatch(/^[0-9a-f]{64}$/);
    const r2 = await saveRevision(db(), designer, plateId, { spec: { ...demoSpec, thicknessMm: demoSpec.thicknessMm + 3 }, message: 'thicker', parentRevisionId: r1.id });
    expect(r2.number).toBe(2);
    expect(r2.specSha256).not.toBe(r1.specSha256);
    const full = await getRevision(db(), designer, r2.id);
    expect(full.parentRevision).toEqual({ id: r1.id, number: 1 });
    expect(Array.isArray(full.checks)).toBe(true);

    // No code path updates a spec; and if one tried, the database says no.
    const refusal = (p: Promise<unknown>) => p.then(() => 'accepted', (e) => String((e as { cause?: Error }).cause?.message ?? (e as Error).message));
    expect(await refusal(db().update(revisions).set({ spec: { tampered: true } }).where(eq(revisions.id, r1.id)))).toMatch(/immutable/);
    expect(await refusal(db().update(revisions).set({ message: 'rewritten' }).where(eq(revisions.id, r1.id)))).toMatch(/immutable/);
    expect(await refusal(db().delete(revisions).where(eq(revisions.id, r1.id)))).toMatch(/never deleted/);
    // the status alone may move (that is the workflow)
    expect(await refusal(db().update(revisions).set({ status: 'draft' }).where(eq(revisions.id, r1.id)))).toBe('accepted');
    const again = await getRevision(db(), designer, r1.id);
    expect(again.spec).toEqual(stored(demoSpec));
    expect(again.message).toBe('first');
  });

  it('an invalid spec is refused with a message naming the path, nothing saved', async () => {
    const { plateId } = await newPlate();
    const e = await expectAppError(saveRevision(db(), designer, plateId, { spec: { ...demoSpec, colour: 'red' }, message: '', parentRevisionId: null }), 400, 'invalid_spec');
    expect(e.message).toMatch(/colour/);
    expect((await getPlate(db(), designer, plateId)).revisions).toHaveLength(0);
  });

  it('a save against a stale parent answers 409 with both numbers; as a branch it is kept', async () => {
    const { plateId } = await newPlate();
    const r1 = await saveRevision(db(), designer, plateId, { spec: demoSpec, message: 'base', parentRevisionId: null });
    const r2 = await saveRevision(db(), designer, plateId, { spec: { ...demoSpec, thicknessMm: 14 }, message: 'someone else', parentRevisionId: r1.id });
    const mine = { ...demoSpec, thicknessMm: 16 };
    const e = await expectAppError(saveRevision(db(), designer, plateId, { spec: mine, message: 'mine', parentRevisionId: r1.id }), 409, 'stale_parent');
    expect(e.extra.latestRevision).toEqual({ id: r2.id, number: 2 });
    expect(e.extra.parentRevision).toEqual({ id: r1.id, number: 1 });
    const branch = await saveRevision(db(), designer, plateId, { spec: mine, message: 'mine, as a branch', parentRevisionId: r1.id, asBranch: true });
    expect(branch.number).toBe(3);
    expect((await getRevision(db(), designer, branch.id)).parentRevision).toEqual({ id: r1.id, number: 1 });
  });

  it('two concurrent saves on the same parent: exactly one wins, the other gets 409, both specs recoverable', async () => {
    const { plateId } = await newPlate();
    const r1 = await saveRevision(db(), designer, plateId, { spec: demoSpec, message: 'base', parentRevisionId: null });
    const specA = { ...demoSpec, thicknessMm: 13 };
    const specB = { ...demoSpec, thicknessMm: 15 };
    const results = await Promise.allSettled([
      saveRevision(db(), designer, plateId, { spec: specA, message: 'A', parentRevisionId: r1.id }),
      saveRevision(db(), engineer, plateId, { spec: specB, message: 'B', parentRevisionId: r1.id }),
    ]);
    const ok = results.filter((r) => r.status === 'fulfilled');
    const failed = results.filter((r) => r.status === 'rejected') as PromiseRejectedResult[];
    expect(ok).toHaveLength(1);
    expect(failed).toHaveLength(1);
    expect((failed[0].reason as AppError).status).toBe(409);
    const plate = await getPlate(db(), designer, plateId);
    expect(plate.revisions.map((r) => r.number).sort()).toEqual([1, 2]);
    // the loser's spec is still in the loser's hands: saving it as a branch keeps it
    const loserSpec = results[0].status === 'rejected' ? specA : specB;
    const kept = await saveRevision(db(), designer, plateId, { spec: loserSpec, message: 'kept', parentRevisionId: r1.id, asBranch: true });
    expect((await getRevision(db(), designer, kept.id)).spec).toEqual(stored(loserSpec));
  });
});

describe('the review state machine', () => {
  it('draft → in_review → changes_requested; rev 2 → in_review → approved; rev 3 approved supersedes rev 2', async () => {
    const { plateId } = await newPlate();
    const r1 = await saveRevision(db(), designer, plateId, { spec: demoSpec, message: 'first', parentRevisionId: null });
    await submitRevision(db(), designer, r1.id);
    expect((await getRevision(db(), designer, r1.id)).status).toBe('in_review');
    expect((await reviewQueue(db(), engineer)).map((q) => q.revisionId)).toContain(r1.id);
    await requestChanges(db(), engineer, r1.id, 'Move the starter bolts clear of the dowel.');
    const after1 = await getRevision(db(), designer, r1.id);
    expect(after1.status).toBe('changes_requested');
    expect(after1.history.map((h) => h.decision)).toEqual(['submitted', 'changes_requested']);

    const r2 = await saveRevision(db(), designer, plateId, { spec: withMargin(14), message: 'fixed', parentRevisionId: r1.id });
    await submitRevision(db(), designer, r2.id);
    await approveRevision(db(), engineer, r2.id, { comment: 'good' }, fakeFiles);
    const a2 = await getRevision(db(), designer, r2.id);
    expect(a2.status).toBe('approved');
    expect(a2.files).toHaveLength(1);
    expect(a2.approvedBy?.id).toBe(engineer.id);

    const r3 = await saveRevision(db(), designer, plateId, { spec: withMargin(16), message: 'wider margin', parentRevisionId: r2.id });
    await submitRevision(db(), designer, r3.id);
    const t = await approveRevision(db(), admin, r3.id, { comment: 'ok' }, fakeFiles);
    expect(t.supersededRevisionId).toBe(r2.id);
    expect((await getRevision(db(), engineer, r2.id)).status).toBe('superseded');
    expect((await getRevision(db(), engineer, r3.id)).status).toBe('approved');
    const actions = (await db().select({ a: auditEvents.action }).from(auditEvents).where(eq(auditEvents.targetId, String(r3.id)))).map((x) => x.a);
    expect(actions).toEqual(expect.arrayContaining(['revision.saved', 'revision.submitted', 'revision.approved']));
  });

  it('forbidden transitions answer the right status and change nothing', async () => {
    const { plateId } = await newPlate();
    const r1 = await saveRevision(db(), designer, plateId, { spec: demoSpec, message: '', parentRevisionId: null });
    let before = await snapshot(r1.id);
    // approving or sending back a draft
    await expectAppError(approveRevision(db(), engineer, r1.id, { comment: '' }, fakeFiles), 409, 'invalid_transition');
    await expectAppError(requestChanges(db(), engineer, r1.id, 'x'), 409, 'invalid_transition');
    // wrong roles
    await expectAppError(submitRevision(db(), machinist, r1.id), 403);
    await expectAppError(submitRevision(db(), outsider, r1.id), 404); // not their project: not even visible
    expect(await snapshot(r1.id)).toEqual(before);

    await submitRevision(db(), designer, r1.id);
    before = await snapshot(r1.id);
    await expectAppError(submitRevision(db(), designer, r1.id), 409, 'invalid_transition'); // already in review
    await expectAppError(approveRevision(db(), designer, r1.id, { comment: '' }, fakeFiles), 403); // designers never approve
    await expectAppError(approveRevision(db(), machinist, r1.id, { comment: '' }, fakeFiles), 403);
    await expectAppError(requestChanges(db(), engineer, r1.id, '   '), 400, 'comment_required');
    expect(await snapshot(r1.id)).toEqual(before);

    // an engineer never approves a revision they wrote
    const { plateId: p2 } = await newPlate(designer);
    const own = await saveRevision(db(), engineer, p2, { spec: demoSpec, message: 'by the engineer', parentRevisionId: null });
    await submitRevision(db(), engineer, own.id);
    const ownBefore = await snapshot(own.id);
    await expectAppError(approveRevision(db(), engineer, own.id, { comment: '' }, fakeFiles), 403);
    expect(await snapshot(own.id)).toEqual(ownBefore);
    await approveRevision(db(), engineer2, own.id, { comment: 'second pair of eyes' }, fakeFiles);

    // submitting an approved revision
    const approvedBefore = await snapshot(own.id);
    await expectAppError(submitRevision(db(), engineer, own.id), 409, 'invalid_transition');
    expect(await snapshot(own.id)).toEqual(approvedBefore);
  });

  it('approval is blocked by unwaived check errors and allowed with a written waiver per finding', async () => {
    const { plateId } = await newPlate();
    // A plate far thinner than its counterbores: the checks must raise at least one error.
    const broken = { ...demoSpec, thicknessMm: 3 };
    const r = await saveRevision(db(), designer, plateId, { spec: broken, message: 'too thin', parentRevisionId: null });
    const errs = (r.checks as { severity: string; code: string; featureIds: string[] }[]).filter((f) => f.severity === 'error');
    expect(errs.length).toBeGreaterThan(0);
    await submitRevision(db(), designer, r.id);
    const before = await snapshot(r.id);
    const e = await expectAppError(approveRevision(db(), engineer, r.id, { comment: '' }, fakeFiles), 409, 'unwaived_errors');
    expect((e.extra.findings as unknown[]).length).toBe(errs.length);
    // a waiver without a reason does not count
    await expectAppError(approveRevision(db(), engineer, r.id, { comment: '', waivers: errs.map((f) => ({ code: f.code, featureIds: f.featureIds, reason: '' })) }, fakeFiles), 409, 'unwaived_errors');
    expect(await snapshot(r.id)).toEqual(before);
    await approveRevision(db(), engineer, r.id, { comment: 'waived for a test fixture', waivers: errs.map((f) => ({ code: f.code, featureIds: f.featureIds, reason: 'Test fixture; not for cutting.' })) }, fakeFiles);
    const [rv] = await db().select().from(reviews).where(eq(reviews.revisionId, r.id)).orderBy(sql`id desc`).limit(1);
    expect(rv.decision).toBe('approved');
    expect((rv.waivers as unknown[]).length).toBe(errs.length);
  });

  it('two engineers approving at once: approval happens exactly once', async () => {
    const { plateId } = await newPlate();
    const r = await saveRevision(db(), designer, plateId, { spec: demoSpec, message: '', parentRevisionId: null });
    await submitRevision(db(), designer, r.id);
    const results = await Promise.allSettled([
      approveRevision(db(), engineer, r.id, { comment: 'a' }, fakeFiles),
      approveRevision(db(), engineer2, r.id, { comment: 'b' }, fakeFiles),
    ]);
    expect(results.filter((x) => x.status === 'fulfilled')).toHaveLength(1);
    expect(((results.find((x) => x.status === 'rejected') as PromiseRejectedResult).reason as AppError).status).toBe(409);
    const approvals = await db().select().from(reviews).where(eq(reviews.revisionId, r.id));
    expect(approvals.filter((a) => a.decision === 'approved')).toHaveLength(1);
    expect(await db().select().from(artifacts).where(eq(artifacts.revisionId, r.id))).toHaveLength(1);
  });
});

describe('machinists and released files', () => {
  it('see released revisions only, and the stored bytes match their hash', async () => {
    const { plateId, partNumber } = await newPlate();
    const r1 = await saveRevision(db(), designer, plateId, { spec: demoSpec, message: '', parentRevisionId: null });
    await expectAppError(getPlate(db(), machinist, plateId), 404); // nothing released yet
    await expectAppError(getRevision(db(), machinist, r1.id), 404);
    await submitRevision(db(), designer, r1.id);
    await approveRevision(db(), engineer, r1.id, { comment: '' }, fakeFiles);
    const r2 = await saveRevision(db(), designer, plateId, { spec: withMargin(14), message: 'draft after release', parentRevisionId: r1.id });
    const seen = await getPlate(db(), machinist, plateId);
    expect(seen.revisions.map((r) => r.id)).toEqual([r1.id]); // the newer draft is invisible
    await expectAppError(getRevision(db(), machinist, r2.id), 404);
    const rel = (await listReleases(db(), machinist)).find((x) => x.partNumber === partNumber)!;
    expect(rel.revision).toBe(1);
    const { file: f } = await storedFileForViewer(db(), machinist, r1.id, rel.files[0].name);
    expect(sha(f!.bytes)).toBe(rel.files[0].sha256);
    await expectAppError(storedFileForViewer(db(), machinist, r2.id, rel.files[0].name), 404); // not for a draft
  });
});

describe('compare', () => {
  it('reports a moved hole with its distance and a changed thickness', async () => {
    const { plateId } = await newPlate();
    const r1 = await saveRevision(db(), designer, plateId, { spec: demoSpec, message: '', parentRevisionId: null });
    // take engine hole E1 off its pattern and place it explicitly 3 mm right and 4 mm up of where it was
    const e1 = plateProfile(parsePlateSpec(demoSpec)).holes.find((h) => h.id === 'E1')!;
    const moved = structuredClone(demoSpec);
    const i = moved.engineFace.holes.findIndex((h: { id: string }) => h.id === 'E1');
    const { patternId: _p, index: _i, ...rest } = moved.engineFace.holes[i];
    // the engine face is measured from the rear: its coordinates are plate coordinates (no mirror)
    moved.engineFace.holes[i] = { ...rest, x: e1.center.x + 3, y: e1.center.y + 4 };
    const hole = { id: 'E1' };
    moved.thicknessMm = demoSpec.thicknessMm + 1;
    const r2 = await saveRevision(db(), designer, plateId, { spec: moved, message: 'moved', parentRevisionId: r1.id });
    const c = await compareRevisions(db(), designer, r1.id, r2.id);
    const m = c.holesMoved.find((x) => x.id === hole.id);
    expect(m, `hole ${hole.id} reported as moved`).toBeTruthy();
    expect(m!.distanceMm).toBeCloseTo(5, 9); // 3-4-5 triangle (hand arithmetic)
    expect(c.otherChanges).toEqual(expect.arrayContaining([{ path: 'thicknessMm', from: demoSpec.thicknessMm, to: demoSpec.thicknessMm + 1 }]));
  });
});
