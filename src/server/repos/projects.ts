import { and, asc, desc, eq, inArray, like, or, sql } from 'drizzle-orm';
import type { Db, Tx } from '../db/client';
import { plates, projectMembers, projects, revisions, users } from '../db/schema';
import type { SessionUser } from '../auth/types';
import { AppError, forbidden, notFound } from '../errors';
import { audit } from './audit';

export interface ProjectSummary {
  id: number;
  name: string;
  swapDescription: string;
  owner: { id: string; name: string };
  plateCount: number;
  /** the most advanced state among the plates' latest revisions */
  status: 'empty' | 'draft' | 'in_review' | 'approved' | 'changes_requested';
  updatedAt: string;
}

export const SEES_ALL_PROJECTS = ['engineer', 'admin'] as const;

/** Who may see and change a project: engineers and admins all; designers their own and where they are members. */
export async function projectAccess(db: Db | Tx, user: SessionUser, projectId: number): Promise<{ canView: boolean; canEdit: boolean; exists: boolean }> {
  const [p] = await db.select({ id: projects.id, ownerId: projects.ownerId }).from(projects).where(eq(projects.id, projectId)).limit(1);
  if (!p) return { exists: false, canView: false, canEdit: false };
  if (user.role === 'engineer' || user.role === 'admin') return { exists: true, canView: true, canEdit: true };
  if (user.role === 'designer') {
    if (p.ownerId === user.id) return { exists: true, canView: true, canEdit: true };
    const [m] = await db
      .select({ u: projectMembers.userId })
      .from(projectMembers)
      .where(and(eq(projectMembers.projectId, projectId), eq(projectMembers.userId, user.id)))
      .limit(1);
    return { exists: true, canView: !!m, canEdit: !!m };
  }
  return { exists: true, canView: false, canEdit: false };
}

/** 404 for projects the user may not see (no leak of what exists), 403 for view-only users trying to change. */
export async function assertProject(db: Db | Tx, user: SessionUser, projectId: number, need: 'view' | 'edit'): Promise<void> {
  const a = await projectAccess(db, user, projectId);
  if (!a.exists || !a.canView) throw notFound('Project');
  if (need === 'edit' && !a.canEdit) throw forbidden('You may view this project but not change it.');
}

const STATUS_RANK = { empty: 0, draft: 1, changes_requested: 2, in_review: 3, approved: 4 } as const;

export async function listProjects(db: Db, user: SessionUser, opts: { q?: string } = {}): Promise<ProjectSummary[]> {
  if (user.role === 'machinist') throw forbidden('Machinists see released plates in the shop, not projects.');
  const conditions = [];
  if (user.role === 'designer') {
    const memberOf = db.select({ id: projectMembers.projectId }).from(projectMembers).where(eq(projectMembers.userId, user.id));
    conditions.push(or(eq(projects.ownerId, user.id), inArray(projects.id, memberOf)));
  }
  if (opts.q) conditions.push(or(like(projects.name, `%${opts.q}%`), like(projects.swapDescription, `%${opts.q}%`)));
  // one query: each project with each of its plates and that plate's latest revision (highest number)
  const latestNumber = sql`(SELECT MAX(${sql.raw('lr.number')}) FROM ${revisions} AS ${sql.raw('lr')} WHERE ${sql.raw('lr.plate_id')} = ${plates.id})`;
  const rows = await db
    .select({
      id: projects.id,
      name: projects.name,
      swapDescription: projects.swapDescription,
      ownerId: projects.ownerId,
      ownerName: users.name,
      updatedAt: projects.updatedAt,
      plateId: plates.id,
      status: revisions.status,
    })
    .from(projects)
    .innerJoin(users, eq(users.id, projects.ownerId))
    .leftJoin(plates, eq(plates.projectId, projects.id))
    .leftJoin(revisions, and(eq(revisions.plateId, plates.id), eq(revisions.number, latestNumber)))
    .where(conditions.length ? and(...conditions) : undefined)
    .orderBy(desc(projects.updatedAt), asc(projects.id));
  const out: ProjectSummary[] = [];
  const byId = new Map<number, ProjectSummary>();
  for (const r of rows) {
    let p = byId.get(r.id);
    if (!p) {
      p = { id: r.id, name: r.name, swapDescription: r.swapDescription, owner: { id: r.ownerId, name: r.ownerName }, plateCount: 0, status: 'empty', updatedAt: r.updatedAt.toISOString() };
      byId.set(r.id, p);
      out.push(p);
    }
    if (r.plateId === null) continue;
    p.plateCount++;
    const s = (r.status === 'superseded' ? 'approved' : r.status ?? 'draft') as keyof typeof STATUS_RANK;
    if (STATUS_RANK[s] > STATUS_RANK[p.status]) p.status = s as ProjectSummary['status'];
  }
  return out;
}

export async function createProject(db: Db, user: SessionUser, input: { name: string; swapDescription: string }): Promise<{ id: number }> {
  if (user.role === 'machinist') throw forbidden('Machinists do not create projects.');
  return db.transaction(async (tx) => {
    const [p] = await tx.insert(projects).values({ name: input.name, swapDescription: input.swapDescription, ownerId: user.id }).$returningId();
    await audit(tx, user.id, 'project.created', { type: 'project', id: p.id }, { name: input.name });
    return { id: p.id };
  });
}

export async function getProject(db: Db, user: SessionUser, projectId: number) {
  await assertProject(db, user, projectId, 'view');
  const [p] = await db
    .select({ id: projects.id, name: projects.name, swapDescription: projects.swapDescription, ownerId: projects.ownerId, ownerName: users.name, createdAt: projects.createdAt, updatedAt: projects.updatedAt })
    .from(projects)
    .innerJoin(users, eq(users.id, projects.ownerId))
    .where(eq(projects.id, projectId));
  const members = await db
    .select({ id: users.id, name: users.name, email: users.email, role: users.role })
    .from(projectMembers)
    .innerJoin(users, eq(users.id, projectMembers.userId))
    .where(eq(projectMembers.projectId, projectId))
    .orderBy(asc(users.name));
  const plateRows = await db.select().from(plates).where(eq(plates.projectId, projectId)).orderBy(asc(plates.partNumber));
  const revRows = plateRows.length
    ? await db
        .select({ id: revisions.id, plateId: revisions.plateId, number: revisions.number, status: revisions.status, createdAt: revisions.createdAt })
        .from(revisions)
        .where(inArray(revisions.plateId, plateRows.map((p) => p.id)))
    : [];
  return {
    id: p.id,
    name: p.name,
    swapDescription: p.swapDescription,
    owner: { id: p.ownerId, name: p.ownerName },
    members,
    createdAt: p.createdAt.toISOString(),
    updatedAt: p.updatedAt.toISOString(),
    plates: plateRows.map((pl) => {
      const revs = revRows.filter((r) => r.plateId === pl.id).sort((a, b) => b.number - a.number);
      const released = revs.find((r) => r.status === 'approved');
      return {
        id: pl.id,
        partNumber: pl.partNumber,
        title: pl.title,
        material: pl.material,
        latestRevision: revs[0] ? { id: revs[0].id, number: revs[0].number, status: revs[0].status, createdAt: revs[0].createdAt.toISOString() } : null,
        releasedRevision: released ? { id: released.id, number: released.number } : null,
      };
    }),
  };
}

export async function updateProject(db: Db, user: SessionUser, projectId: number, patch: { name?: string; swapDescription?: string }) {
  await assertProject(db, user, projectId, 'edit');
  await db.transaction(async (tx) => {
    await tx.update(projects).set({ ...patch, updatedAt: sql`CURRENT_TIMESTAMP(3)` }).where(eq(projects.id, projectId));
    await audit(tx, user.id, 'project.updated', { type: 'project', id: projectId }, patch);
  });
}

export async function addMember(db: Db, user: SessionUser, projectId: number, email: string) {
  await assertProject(db, user, projectId, 'edit');
  const [u] = await db.select({ id: users.id, role: users.role, active: users.active, name: users.name }).from(users).where(eq(users.email, email.toLowerCase())).limit(1);
  if (!u || !u.active) throw new AppError(404, 'user_not_found', `No active user with the e-mail ${email}. Invite them first (Admin → Users).`);
  if (u.role === 'machinist') throw new AppError(400, 'invalid_member', 'Machinists see released plates in the shop; they are not project members.');
  await db.transaction(async (tx) => {
    const [exists] = await tx.select({ u: projectMembers.userId }).from(projectMembers).where(and(eq(projectMembers.projectId, projectId), eq(projectMembers.userId, u.id))).limit(1);
    if (exists) return;
    await tx.insert(projectMembers).values({ projectId, userId: u.id });
    await audit(tx, user.id, 'project.member_added', { type: 'project', id: projectId }, { userId: u.id });
  });
  return { id: u.id, name: u.name, role: u.role };
}
