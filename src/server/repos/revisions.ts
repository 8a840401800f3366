import { and, asc, desc, eq, inArray, ne, sql } from 'drizzle-orm';
import type { Db, Tx } from '../db/client';
import { alias } from 'drizzle-orm/mysql-core';
import { LRUCache } from 'lru-cache';
import { artifacts, plates, projectMembers, projects, reviews, revisions, users, type RevisionStatus } from '../db/schema';
import type { SessionUser } from '../auth/types';
import { AppError, forbidden, notFound } from '../errors';
import { audit } from './audit';
import { artifactBytes } from '../files/artifactCache';
import { assertProject } from './projects';
import { assertPlateView, countFindings, findPlate } from './plates';
import { runChecks, specSha256, validateSpec, profileOf, type Finding } from '../plateEngine';
import { compareProfiles, diffDocuments } from '~/domain/compare';
import type { PlateSpec } from '~/domain';

export interface RevisionRow {
  id: number;
  plateId: number;
  number: number;
  parentRevisionId: number | null;
  status: RevisionStatus;
  spec: unknown;
  specSha256: string;
  specSchemaVersion: number;
  checks: unknown;
  authorId: string;
  message: string;
  createdAt: Date;
}

export async function findRevision(db: Db | Tx, id: number, forUpdate = false): Promise<RevisionRow | undefined> {
  const q = db.select().from(revisions).where(eq(revisions.id, id)).limit(1);
  const [r] = forUpdate ? await q.for('update') : await q;
  return r as RevisionRow | undefined;
}

function isDuplicate(e: unknown): boolean {
  const code = (e as { code?: string }).code ?? (e as { cause?: { code?: string } }).cause?.code;
  return code === 'ER_DUP_ENTRY';
}

export interface SaveInput {
  spec: unknown;
  message: string;
  parentRevisionId: number | null;
  /** save on top of a revision that is not the newest (a branch) instead of answering 409 */
  asBranch?: boolean;
}

/**
 * Save = a new immutable revision N+1. The plate row is locked so two saves are serialised; a
 * save whose parent is not the newest revision answers 409 with both numbers (unless asBranch).
 */
export async function saveRevision(db: Db, user: SessionUser, plateId: number, input: SaveInput) {
  if (user.role === 'machinist') throw forbidden('Machinists record inspections; they do not save plate revisions.');
  const plate = await findPlate(db, plateId);
  if (!plate) throw notFound('Plate');
  await assertProject(db, user, plate.projectId, 'edit').catch((e) => {
    throw e instanceof AppError && e.status === 404 ? notFound('Plate') : e;
  });
  const spec = validateSpec(input.spec);
  const checks = runChecks(spec);
  const sha = specSha256(spec);
  try {
    return await db.transaction(async (tx) => {
      await tx.select({ id: plates.id }).from(plates).where(eq(plates.id, plateId)).for('update');
      const [latest] = await tx
        .select({ id: revisions.id, number: revisions.number })
        .from(revisions)
        .where(eq(revisions.plateId, plateId))
        .orderBy(desc(revisions.number))
        .limit(1);
      const parentId = input.parentRevisionId;
      if (parentId !== null) {
        const [parent] = await tx.select({ id: revisions.id, number: revisions.number, plateId: revisions.plateId }).from(revisions).where(eq(revisions.id, parentId)).limit(1);
        if (!parent || parent.plateId !== plateId) throw new AppError(400, 'invalid_parent', `Revision ${parentId} is not a revision of this plate.`);
        if (latest && latest.id !== parentId && !input.asBranch) {
          throw new AppError(409, 'stale_parent', `Someone saved revision ${latest.number} while you were editing revision ${parent.number}. Nothing was saved: reload revision ${latest.number} and apply your changes, or save yours as a branch of revision ${parent.number}.`, {
            latestRevision: { id: latest.id, number: latest.number },
            parentRevision: { id: parent.id, number: parent.number },
          });
        }
      } else if (latest && !input.asBranch) {
        throw new AppError(409, 'stale_parent', `This plate already has revision ${latest.number}; save on top of it (parentRevisionId ${latest.id}).`, {
          latestRevision: { id: latest.id, number: latest.number },
          parentRevision: null,
        });
      }
      const number = (latest?.number ?? 0) + 1;
      const [r] = await tx
        .insert(revisions)
        .values({ plateId, number, parentRevisionId: parentId, status: 'draft', spec, specSha256: sha, specSchemaVersion: spec.schemaVersion, checks, authorId: user.id, message: input.message })
        .$returningId();
      await audit(tx, user.id, 'revision.saved', { type: 'revision', id: r.id }, { plateId, number, parentRevisionId: parentId, specSha256: sha, branch: !!(latest && parentId !== latest.id) });
      await tx.update(projects).set({ updatedAt: sql`CURRENT_TIMESTAMP(3)` }).where(eq(projects.id, plate.projectId));
      return { id: r.id, number, status: 'draft' as const, specSha256: sha, checks };
    });
  } catch (e) {
    if (isDuplicate(e)) {
      const [latest] = await db.select({ id: revisions.id, number: revisions.number }).from(revisions).where(eq(revisions.plateId, plateId)).orderBy(desc(revisions.number)).limit(1);
      throw new AppError(409, 'stale_parent', `Someone saved revision ${latest?.number} at the same moment. Nothing was saved: reload and apply your changes, or save as a branch.`, {
        latestRevision: latest ?? null,
        parentRevision: input.parentRevisionId ? { id: input.parentRevisionId } : null,
      });
    }
    throw e;
  }
}

/** A revision's content never changes (database triggers): spec and checks are kept in memory by id + spec hash. */
interface RevisionContent {
  spec: unknown;
  checks: Finding[];
  checkCounts: { error: number; warning: number; note: number };
}
const contentCache = new LRUCache<string, RevisionContent>({ max: 500 });
const contentKey = (id: number, specSha256: string, schemaVersion: number) => `${id}:${specSha256}:${schemaVersion}`;

/**
 * A released revision's file list is final: its files are inserted in the same transaction that
 * makes it approved, and never changed or deleted. Kept only once the (fresh) status says released.
 */
type FileList = { name: string; sha256: string; bytes: number; contentType: string; kernelVersion: string; createdAt: Date }[];
const releasedFilesCache = new LRUCache<string, FileList>({ max: 1000 });

const parentRevisions = alias(revisions, 'parent_revisions');
const authors = alias(users, 'authors');

/**
 * The revision with its plate, if this user may see it — one query. The rules: engineers and
 * admins see every revision; designers those of projects they own or are members of; machinists
 * approved revisions only. Anything else (including ids that do not exist) is 404, so nothing
 * leaks about what exists. Always read fresh: status and membership change.
 */
export async function revisionForViewer(db: Db | Tx, user: SessionUser, revisionId: number, fileName?: string) {
  const [r] = await db
    .select({
      id: revisions.id,
      plateId: revisions.plateId,
      number: revisions.number,
      parentRevisionId: revisions.parentRevisionId,
      parentNumber: parentRevisions.number,
      status: revisions.status,
      specSha256: revisions.specSha256,
      specSchemaVersion: revisions.specSchemaVersion,
      authorId: revisions.authorId,
      authorName: authors.name,
      message: revisions.message,
      createdAt: revisions.createdAt,
      partNumber: plates.partNumber,
      plateTitle: plates.title,
      projectId: plates.projectId,
      ownerId: projects.ownerId,
      memberId: projectMembers.userId,
      // the stored file asked for, if any (downloads: access check and file in one query)
      fileId: artifacts.id,
      fileContentType: artifacts.contentType,
      fileSha256: artifacts.sha256,
    })
    .from(revisions)
    .innerJoin(plates, eq(plates.id, revisions.plateId))
    .innerJoin(projects, eq(projects.id, plates.projectId))
    .leftJoin(projectMembers, and(eq(projectMembers.projectId, projects.id), eq(projectMembers.userId, user.id)))
    .leftJoin(authors, eq(authors.id, revisions.authorId))
    .leftJoin(parentRevisions, eq(parentRevisions.id, revisions.parentRevisionId))
    .leftJoin(artifacts, and(eq(artifacts.revisionId, revisions.id), eq(artifacts.kind, fileName ?? '')))
    .where(eq(revisions.id, revisionId))
    .limit(1);
  if (!r) throw notFound('Revision');
  const canView =
    user.role === 'engineer' || user.role === 'admin'
      ? true
      : user.role === 'designer'
        ? r.ownerId === user.id || r.memberId === user.id
        : user.role === 'machinist'
          ? r.status === 'approved'
          : false;
  if (!canView) throw notFound('Revision');
  return r;
}

/** Cached content is shared by every answer: frozen so no caller can change it for the next one. */
function deepFreeze<T>(v: T): T {
  if (v && typeof v === 'object' && !Object.isFrozen(v)) {
    Object.freeze(v);
    for (const k of Object.keys(v)) deepFreeze((v as Record<string, unknown>)[k]);
  }
  return v;
}

async function revisionContent(db: Db, r: { id: number; specSha256: string; specSchemaVersion: number }): Promise<RevisionContent> {
  const key = contentKey(r.id, r.specSha256, r.specSchemaVersion);
  const hit = contentCache.get(key);
  if (hit) return hit;
  const [row] = await db.select({ spec: revisions.spec, checks: revisions.checks, specSha256: revisions.specSha256 }).from(revisions).where(eq(revisions.id, r.id)).limit(1);
  if (!row) throw notFound('Revision');
  const content: RevisionContent = deepFreeze({ spec: row.spec, checks: row.checks as Finding[], checkCounts: countFindings(row.checks) });
  if (row.specSha256 === r.specSha256) contentCache.set(key, content);
  return content;
}

async function revisionFiles(db: Db, r: { id: number; specSha256: string; status: RevisionStatus }): Promise<FileList> {
  const released = r.status === 'approved' || r.status === 'superseded';
  const key = `${r.id}:${r.specSha256}`;
  const hit = released ? releasedFilesCache.get(key) : undefined;
  if (hit) return hit.map((f) => ({ ...f }));
  const files = await db
    .select({ name: artifacts.kind, sha256: artifacts.sha256, bytes: artifacts.sizeBytes, contentType: artifacts.contentType, kernelVersion: artifacts.kernelVersion, createdAt: artifacts.createdAt })
    .from(artifacts)
    .where(eq(artifacts.revisionId, r.id))
    .orderBy(asc(artifacts.kind));
  if (released && files.length > 0) releasedFilesCache.set(key, files.map((f) => ({ ...f })));
  return files;
}

/** Full revision for a viewer: spec, checks, state, history of reviews, files. */
export async function getRevision(db: Db, user: SessionUser, revisionId: number) {
  const r = await revisionForViewer(db, user, revisionId);
  const [content, history, files] = await Promise.all([
    revisionContent(db, r),
    db
      .select({ id: reviews.id, decision: reviews.decision, comment: reviews.comment, waivers: reviews.waivers, createdAt: reviews.createdAt, reviewerId: reviews.reviewerId, reviewerName: users.name, reviewerRole: users.role })
      .from(reviews)
      .innerJoin(users, eq(users.id, reviews.reviewerId))
      .where(eq(reviews.revisionId, revisionId))
      .orderBy(asc(reviews.createdAt), asc(reviews.id)),
    revisionFiles(db, r),
  ]);
  const approval = [...history].reverse().find((h) => h.decision === 'approved');
  return {
    id: r.id,
    plateId: r.plateId,
    partNumber: r.partNumber,
    plateTitle: r.plateTitle,
    projectId: r.projectId,
    number: r.number,
    status: r.status,
    parentRevision: r.parentRevisionId && r.parentNumber != null ? { id: r.parentRevisionId, number: r.parentNumber } : null,
    spec: content.spec,
    specSha256: r.specSha256,
    specSchemaVersion: r.specSchemaVersion,
    checks: content.checks,
    checkCounts: { ...content.checkCounts },
    author: { id: r.authorId, name: r.authorName ?? '(unknown)' },
    message: r.message,
    createdAt: r.createdAt.toISOString(),
    approvedBy: approval ? { id: approval.reviewerId, name: approval.reviewerName, at: approval.createdAt.toISOString() } : null,
    history: history.map((h) => ({ id: h.id, decision: h.decision, comment: h.comment, waivers: h.waivers, at: h.createdAt.toISOString(), by: { id: h.reviewerId, name: h.reviewerName, role: h.reviewerRole } })),
    files,
  };
}

const waiverSchemaNote = 'Each waiver names the finding (code + feature ids) and gives a written reason.';

export interface Waiver {
  code: string;
  featureIds: string[];
  reason: string;
}

function findingKey(code: string, featureIds: readonly string[]): string {
  return `${code}|${[...featureIds].sort().join(',')}`;
}

/** The outcome of a state change, with everything the caller needs to notify people. */
export interface TransitionResult {
  revisionId: number;
  number: number;
  plateId: number;
  partNumber: string;
  status: RevisionStatus;
  authorId: string;
  supersededRevisionId?: number | null;
}

async function lockForTransition(tx: Tx, revisionId: number) {
  const r = await findRevision(tx, revisionId, true);
  if (!r) throw notFound('Revision');
  const [plate] = await tx.select().from(plates).where(eq(plates.id, r.plateId));
  return { r, plate };
}

/** draft → in_review, by a designer (or engineer/admin) with edit rights on the project. */
export async function submitRevision(db: Db, user: SessionUser, revisionId: number, comment = ''): Promise<TransitionResult> {
  if (user.role === 'machinist') throw forbidden('Machinists do not submit revisions.');
  return db.transaction(async (tx) => {
    const { r, plate } = await lockForTransition(tx, revisionId);
    await assertProject(tx, user, plate.projectId, 'edit').catch((e) => {
      throw e instanceof AppError && e.status === 404 ? notFound('Revision') : e;
    });
    if (r.status !== 'draft') throw new AppError(409, 'invalid_transition', `Revision ${r.number} is ${r.status.replace('_', ' ')}; only a draft can be submitted for review.`, { status: r.status });
    await tx.update(revisions).set({ status: 'in_review' }).where(eq(revisions.id, revisionId));
    await tx.insert(reviews).values({ revisionId, reviewerId: user.id, decision: 'submitted', comment });
    await audit(tx, user.id, 'revision.submitted', { type: 'revision', id: revisionId }, { plateId: r.plateId, number: r.number });
    return { revisionId, number: r.number, plateId: r.plateId, partNumber: plate.partNumber, status: 'in_review', authorId: r.authorId };
  });
}

function assertReviewer(user: SessionUser, r: RevisionRow) {
  if (user.role !== 'engineer' && user.role !== 'admin') throw forbidden('Only an engineer or an admin reviews revisions.');
  if (r.authorId === user.id) throw forbidden('You wrote this revision; another engineer must review it.');
}

/** in_review → changes_requested, with a comment the designer will read. */
export async function requestChanges(db: Db, user: SessionUser, revisionId: number, comment: string): Promise<TransitionResult> {
  if (!comment.trim()) throw new AppError(400, 'comment_required', 'Say what has to change: a comment is required.', { fields: { comment: 'required' } });
  return db.transaction(async (tx) => {
    const { r, plate } = await lockForTransition(tx, revisionId);
    assertReviewer(user, r);
    if (r.status !== 'in_review') throw new AppError(409, 'invalid_transition', `Revision ${r.number} is ${r.status.replace('_', ' ')}; only a revision in review can be sent back.`, { status: r.status });
    await tx.update(revisions).set({ status: 'changes_requested' }).where(eq(revisions.id, revisionId));
    await tx.insert(reviews).values({ revisionId, reviewerId: user.id, decision: 'changes_requested', comment });
    await audit(tx, user.id, 'revision.changes_requested', { type: 'revision', id: revisionId }, { plateId: r.plateId, number: r.number });
    return { revisionId, number: r.number, plateId: r.plateId, partNumber: plate.partNumber, status: 'changes_requested', authorId: r.authorId };
  });
}

export interface ReleaseFile {
  name: string;
  contentType: string;
  bytes: Uint8Array;
  sha256: string;
  kernelVersion: string;
}

/**
 * in_review → approved. Blocked while the revision has check errors without a written waiver each.
 * The files are generated first (outside the transaction: the kernel is slow), then in one
 * transaction: lock, re-check the state, store the files, supersede the previous release, record.
 * Two approvals racing: the second finds the state changed and gets 409 — approval happens once.
 */
export async function approveRevision(
  db: Db,
  user: SessionUser,
  revisionId: number,
  input: { comment: string; waivers?: Waiver[] },
  makeFiles: (ctx: { revision: RevisionRow; spec: PlateSpec; partNumber: string; approver: SessionUser; approvedAt: Date }) => Promise<ReleaseFile[]>,
): Promise<TransitionResult> {
  const pre = await findRevision(db, revisionId);
  if (!pre) throw notFound('Revision');
  const prePlate = await findPlate(db, pre.plateId);
  assertReviewer(user, pre);
  if (pre.status !== 'in_review') throw new AppError(409, 'invalid_transition', `Revision ${pre.number} is ${pre.status.replace('_', ' ')}; only a revision in review can be approved.`, { status: pre.status });
  const findings = (Array.isArray(pre.checks) ? pre.checks : []) as Finding[];
  const waivers = input.waivers ?? [];
  const waived = new Map(waivers.filter((w) => w.reason.trim().length >= 5).map((w) => [findingKey(w.code, w.featureIds), w]));
  const unwaived = findings.filter((f) => f.severity === 'error' && !waived.has(findingKey(f.code, f.featureIds)));
  if (unwaived.length) {
    throw new AppError(409, 'unwaived_errors', `Revision ${pre.number} has ${unwaived.length} check error(s) without a written waiver: ${unwaived.map((f) => `${f.code} (${f.featureIds.join(', ') || 'plate'})`).join('; ')}. ${waiverSchemaNote}`, {
      findings: unwaived.map((f) => ({ code: f.code, featureIds: f.featureIds, message: f.message })),
    });
  }
  const approvedAt = new Date();
  const spec = validateSpec(pre.spec);
  const files = await makeFiles({ revision: pre, spec, partNumber: prePlate!.partNumber, approver: user, approvedAt });
  return db.transaction(async (tx) => {
    const { r, plate } = await lockForTransition(tx, revisionId);
    if (r.status !== 'in_review') throw new AppError(409, 'invalid_transition', `Revision ${r.number} was ${r.status.replace('_', ' ')} by someone else a moment ago.`, { status: r.status });
    const [previous] = await tx
      .select({ id: revisions.id })
      .from(revisions)
      .where(and(eq(revisions.plateId, r.plateId), eq(revisions.status, 'approved'), ne(revisions.id, revisionId)))
      .for('update');
    if (previous) {
      await tx.update(revisions).set({ status: 'superseded' }).where(eq(revisions.id, previous.id));
      await audit(tx, user.id, 'revision.superseded', { type: 'revision', id: previous.id }, { by: revisionId });
    }
    await tx.update(revisions).set({ status: 'approved' }).where(eq(revisions.id, revisionId));
    for (const f of files) {
      await tx.insert(artifacts).values({ revisionId, kind: f.name, contentType: f.contentType, sha256: f.sha256, sizeBytes: f.bytes.byteLength, bytes: Buffer.from(f.bytes), kernelVersion: f.kernelVersion });
    }
    const usedWaivers = findings.filter((f) => f.severity === 'error').map((f) => waived.get(findingKey(f.code, f.featureIds))!);
    await tx.insert(reviews).values({ revisionId, reviewerId: user.id, decision: 'approved', comment: input.comment, waivers: usedWaivers.length ? usedWaivers : null });
    await audit(tx, user.id, 'revision.approved', { type: 'revision', id: revisionId }, {
      plateId: r.plateId,
      number: r.number,
      specSha256: r.specSha256,
      files: files.map((f) => ({ name: f.name, sha256: f.sha256 })),
      waivers: usedWaivers.length,
      approvedAt: approvedAt.toISOString(),
    });
    return { revisionId, number: r.number, plateId: r.plateId, partNumber: plate.partNumber, status: 'approved', authorId: r.authorId, supersededRevisionId: previous?.id ?? null };
  });
}

/** Holes added, removed, moved (with distance), changed; other spec fields changed. */
export async function compareRevisions(db: Db, user: SessionUser, aId: number, bId: number) {
  const a = await getRevision(db, user, aId);
  const b = await getRevision(db, user, bId);
  if (a.plateId !== b.plateId) throw new AppError(400, 'different_plates', 'Only revisions of the same plate can be compared.');
  const specA = validateSpec(a.spec);
  const specB = validateSpec(b.spec);
  const holes = compareProfiles(profileOf(specA), profileOf(specB));
  const otherChanges = diffDocuments(specA, specB, (path) => /(^|\.)(holes|patterns)(\.|$)/.test(path));
  return { a: { id: a.id, number: a.number, status: a.status }, b: { id: b.id, number: b.number, status: b.status }, ...holes, otherChanges };
}

/** Engineers' queue: revisions in review, oldest first, with counts. */
export async function reviewQueue(db: Db, user: SessionUser) {
  if (user.role !== 'engineer' && user.role !== 'admin') throw forbidden('The review queue is for engineers and admins.');
  const rows = await db
    .select({ id: revisions.id, number: revisions.number, plateId: revisions.plateId, partNumber: plates.partNumber, title: plates.title, authorId: revisions.authorId, authorName: users.name, checks: revisions.checks, createdAt: revisions.createdAt, projectId: plates.projectId, projectName: projects.name })
    .from(revisions)
    .innerJoin(plates, eq(plates.id, revisions.plateId))
    .innerJoin(projects, eq(projects.id, plates.projectId))
    .innerJoin(users, eq(users.id, revisions.authorId))
    .where(eq(revisions.status, 'in_review'))
    .orderBy(asc(revisions.id));
  const ids = rows.map((r) => r.id);
  const submitted = ids.length
    ? await db.select({ revisionId: reviews.revisionId, at: reviews.createdAt }).from(reviews).where(and(inArray(reviews.revisionId, ids), eq(reviews.decision, 'submitted')))
    : [];
  return rows.map((r) => {
    const since = submitted.filter((s) => s.revisionId === r.id).map((s) => s.at.getTime()).sort((x, y) => y - x)[0];
    return {
      revisionId: r.id,
      plateId: r.plateId,
      partNumber: r.partNumber,
      title: r.title,
      projectId: r.projectId,
      projectName: r.projectName,
      revision: r.number,
      author: { id: r.authorId, name: r.authorName },
      waitingSince: new Date(since ?? r.createdAt.getTime()).toISOString(),
      counts: countFindings(r.checks),
      mine: r.authorId === user.id,
    };
  });
}

/** Machinists' list: every approved revision with its stored files. */
export async function listReleases(db: Db, user: SessionUser) {
  if (!['machinist', 'engineer', 'admin'].includes(user.role)) throw forbidden('Released files are for the shop: machinists, engineers and admins.');
  const rows = await db
    .select({ revisionId: revisions.id, plateId: plates.id, partNumber: plates.partNumber, title: plates.title, material: plates.material, revision: revisions.number, specSha256: revisions.specSha256 })
    .from(revisions)
    .innerJoin(plates, eq(plates.id, revisions.plateId))
    .where(eq(revisions.status, 'approved'))
    .orderBy(asc(plates.partNumber));
  if (!rows.length) return [];
  const ids = rows.map((r) => r.revisionId);
  const files = await db.select({ revisionId: artifacts.revisionId, name: artifacts.kind, sha256: artifacts.sha256, bytes: artifacts.sizeBytes }).from(artifacts).where(inArray(artifacts.revisionId, ids)).orderBy(asc(artifacts.kind));
  const approvals = await db
    .select({ revisionId: reviews.revisionId, at: reviews.createdAt, name: users.name })
    .from(reviews)
    .innerJoin(users, eq(users.id, reviews.reviewerId))
    .where(and(inArray(reviews.revisionId, ids), eq(reviews.decision, 'approved')));
  return rows.map((r) => {
    const ap = approvals.find((a) => a.revisionId === r.revisionId);
    return {
      ...r,
      approvedAt: ap ? ap.at.toISOString() : null,
      approvedBy: ap?.name ?? null,
      files: files.filter((f) => f.revisionId === r.revisionId).map(({ name, sha256, bytes }) => ({ name, sha256, bytes })),
    };
  });
}

/**
 * A stored file of a revision the caller may see, byte-identical to what was approved (bytes from
 * memory by sha256 when seen before). The access check and the file's row come in one query;
 * `file` is undefined when the revision has no stored file of that name.
 */
export async function storedFileForViewer(db: Db, user: SessionUser, revisionId: number, name: string) {
  const rev = await revisionForViewer(db, user, revisionId, name);
  if (rev.fileId === null || rev.fileSha256 === null || rev.fileContentType === null) return { rev, file: undefined };
  const fileId = rev.fileId;
  const bytes = await artifactBytes(rev.fileSha256, async () => {
    const [row] = await db.select({ bytes: artifacts.bytes }).from(artifacts).where(eq(artifacts.id, fileId)).limit(1);
    return row?.bytes;
  });
  return { rev, file: bytes ? { bytes, contentType: rev.fileContentType, sha256: rev.fileSha256 } : undefined };
}
