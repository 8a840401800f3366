import { and, desc, eq, like } from 'drizzle-orm';
import type { Db, Tx } from '../db/client';
import { plates, revisions, users } from '../db/schema';
import type { SessionUser } from '../auth/types';
import { AppError, notFound } from '../errors';
import { audit } from './audit';
import { assertProject } from './projects';

export const PART_NUMBER_RE = /^[A-Z0-9][A-Z0-9-]{1,30}$/;

/** Next free part number in the shop's series, e.g. PW-0042. */
export async function suggestPartNumber(db: Db | Tx, prefix = 'PW-'): Promise<string> {
  const rows = await db.select({ pn: plates.partNumber }).from(plates).where(like(plates.partNumber, `${prefix}%`));
  let max = 0;
  for (const r of rows) {
    const n = Number(r.pn.slice(prefix.length));
    if (Number.isInteger(n) && n > max) max = n;
  }
  return `${prefix}${String(max + 1).padStart(4, '0')}`;
}

export async function createPlate(db: Db, user: SessionUser, projectId: number, input: { partNumber?: string; title: string; material: string }) {
  await assertProject(db, user, projectId, 'edit');
  for (let attempt = 0; attempt < 3; attempt++) {
    const partNumber = input.partNumber ?? (await suggestPartNumber(db));
    try {
      return await db.transaction(async (tx) => {
        const [p] = await tx.insert(plates).values({ projectId, partNumber, title: input.title, material: input.material }).$returningId();
        await audit(tx, user.id, 'plate.created', { type: 'plate', id: p.id }, { projectId, partNumber });
        return { id: p.id, partNumber };
      });
    } catch (e) {
      const dup = (e as { code?: string; cause?: { code?: string } }).cause?.code === 'ER_DUP_ENTRY' || (e as { code?: string }).code === 'ER_DUP_ENTRY';
      if (!dup) throw e;
      if (input.partNumber) throw new AppError(409, 'part_number_taken', `Part number ${input.partNumber} is already used in this shop; choose another (next free: ${await suggestPartNumber(db)}).`);
    }
  }
  throw new AppError(409, 'part_number_taken', 'Could not find a free part number; try again.');
}

export interface PlateRow {
  id: number;
  projectId: number;
  partNumber: string;
  title: string;
  material: string;
  createdAt: Date;
}

export async function findPlate(db: Db | Tx, plateId: number): Promise<PlateRow | undefined> {
  const [p] = await db.select().from(plates).where(eq(plates.id, plateId)).limit(1);
  return p;
}

/** Does the plate have a released (approved) revision? Machinists see only those plates. */
export async function releasedRevisionId(db: Db | Tx, plateId: number): Promise<number | null> {
  const [r] = await db.select({ id: revisions.id }).from(revisions).where(and(eq(revisions.plateId, plateId), eq(revisions.status, 'approved'))).limit(1);
  return r?.id ?? null;
}

/** View access to a plate: through its project, or — for machinists — only when released. */
export async function assertPlateView(db: Db | Tx, user: SessionUser, plateId: number): Promise<PlateRow> {
  const plate = await findPlate(db, plateId);
  if (!plate) throw notFound('Plate');
  if (user.role === 'machinist') {
    if (!(await releasedRevisionId(db, plateId))) throw notFound('Plate');
    return plate;
  }
  await assertProject(db, user, plate.projectId, 'view').catch(() => {
    throw notFound('Plate');
  });
  return plate;
}

export async function listRevisionSummaries(db: Db | Tx, user: SessionUser, plateId: number) {
  await assertPlateView(db, user, plateId);
  const rows = await db
    .select({
      id: revisions.id,
      number: revisions.number,
      status: revisions.status,
      parentRevisionId: revisions.parentRevisionId,
      specSha256: revisions.specSha256,
      message: revisions.message,
      createdAt: revisions.createdAt,
      authorId: revisions.authorId,
      authorName: users.name,
      checks: revisions.checks,
    })
    .from(revisions)
    .innerJoin(users, eq(users.id, revisions.authorId))
    .where(eq(revisions.plateId, plateId))
    .orderBy(desc(revisions.number));
  const visible = user.role === 'machinist' ? rows.filter((r) => r.status === 'approved') : rows;
  return visible.map((r) => ({
    id: r.id,
    number: r.number,
    status: r.status,
    parentRevisionId: r.parentRevisionId,
    specSha256: r.specSha256,
    message: r.message,
    createdAt: r.createdAt.toISOString(),
    author: { id: r.authorId, name: r.authorName },
    checkCounts: countFindings(r.checks),
  }));
}

export function countFindings(checks: unknown): { error: number; warning: number; note: number } {
  const c = { error: 0, warning: 0, note: 0 };
  if (Array.isArray(checks)) for (const f of checks) if (f && typeof f === 'object' && (f as { severity?: string }).severity! in c) c[(f as { severity: 'error' | 'warning' | 'note' }).severity]++;
  return c;
}

export async function getPlate(db: Db, user: SessionUser, plateId: number) {
  const plate = await assertPlateView(db, user, plateId);
  const revs = await listRevisionSummaries(db, user, plateId);
  return {
    id: plate.id,
    projectId: plate.projectId,
    partNumber: plate.partNumber,
    title: plate.title,
    material: plate.material,
    createdAt: plate.createdAt.toISOString(),
    latestRevision: revs[0] ?? null,
    releasedRevision: revs.find((r) => r.status === 'approved') ?? null,
    revisions: revs,
  };
}

