/** Uploads of a project: rows in `uploads`, files in the upload store. */
import { desc, eq } from 'drizzle-orm';
import { randomUUID } from 'node:crypto';
import { z } from 'zod';
import type { UploadSummary } from '~/domain/measure/summary';
import { uploadSummary } from '~/domain/measure/summary';
import type { SessionUser } from '~/server/auth/types';
import type { Db } from '~/server/db/client';
import { uploads, users } from '~/server/db/schema';
import { AppError, notFound } from '~/server/errors';
import { audit } from '~/server/repos/audit';
import { assertProject } from '~/server/repos/projects';
import type { BlobStore } from '~/server/storage';
import { receiveUpload, uploadLimits } from './ingest';

export interface UploadView {
  id: number;
  projectId: number;
  fileName: string;
  format: string;
  sizeBytes: number;
  sha256: string;
  summary: UploadSummary;
  uploadedBy: { id: string; name: string };
  createdAt: string;
}

const unitsSchema = z.enum(['mm', 'in'], { error: 'choose the units of the file: "mm" or "in"' });

function view(r: { id: number; projectId: number; fileName: string; kind: string; sizeBytes: number; sha256: string; summary: unknown; uploaderId: string; uploaderName: string; createdAt: Date }): UploadView {
  const summary = (typeof r.summary === 'string' ? JSON.parse(r.summary) : r.summary) as UploadSummary;
  return {
    id: r.id,
    projectId: r.projectId,
    fileName: r.fileName,
    format: r.kind,
    sizeBytes: Number(r.sizeBytes),
    sha256: r.sha256,
    summary,
    uploadedBy: { id: r.uploaderId, name: r.uploaderName },
    createdAt: r.createdAt.toISOString(),
  };
}

const columns = {
  id: uploads.id,
  projectId: uploads.projectId,
  fileName: uploads.fileName,
  kind: uploads.kind,
  sizeBytes: uploads.sizeBytes,
  sha256: uploads.sha256,
  summary: uploads.summary,
  uploaderId: users.id,
  uploaderName: users.name,
  createdAt: uploads.createdAt,
};

export async function listUploads(db: Db, user: SessionUser, projectId: number): Promise<UploadView[]> {
  await assertProject(db, user, projectId, 'view');
  const rows = await db.select(columns).from(uploads).innerJoin(users, eq(users.id, uploads.uploadedById)).where(eq(uploads.projectId, projectId)).orderBy(desc(uploads.createdAt), desc(uploads.id));
  return rows.map(view);
}

/** The upload and its storage key, if the user may see its project (404 otherwise). */
export async function getUpload(db: Db, user: SessionUser, id: number): Promise<UploadView & { storageKey: string }> {
  const [r] = await db.select({ ...columns, storageKey: uploads.storageKey }).from(uploads).innerJoin(users, eq(users.id, uploads.uploadedById)).where(eq(uploads.id, id)).limit(1);
  if (!r) throw notFound('Upload');
  await assertProject(db, user, r.projectId, 'view').catch((e) => {
    throw e instanceof AppError && e.status === 404 ? notFound('Upload') : e;
  });
  return { ...view(r), storageKey: r.storageKey };
}

/**
 * Streams the request's file into the store, checks it, and records it. On any failure the
 * pending file is aborted (or the committed one removed) and no row is written.
 */
export async function createUpload(db: Db, user: SessionUser, projectId: number, request: Request, store: BlobStore): Promise<UploadView> {
  if (user.role === 'machinist') throw new AppError(403, 'forbidden', 'Machinists see released plates; measurements are uploaded by designers and engineers.');
  await assertProject(db, user, projectId, 'edit');
  const received = await receiveUpload(request, uploadLimits(), store);
  let committedKey: string | null = null;
  try {
    const units = unitsSchema.safeParse(received.fields.units);
    if (!units.success) {
      throw new AppError(400, 'units_required', `Choose the units of ${received.fileName}: "mm" or "in" (field "units"). Nothing was saved.`, { fields: { units: 'choose mm or in' } });
    }
    const summary = uploadSummary(received.parsed, units.data);
    const key = `projects/${projectId}/${randomUUID()}.${received.parsed.format}`;
    await received.pending.commit(key);
    committedKey = key;
    const id = await db.transaction(async (tx) => {
      const [row] = await tx
        .insert(uploads)
        .values({
          projectId,
          fileName: received.fileName,
          kind: received.parsed.format,
          sizeBytes: received.sizeBytes,
          sha256: received.sha256,
          storageKey: key,
          summary,
          uploadedById: user.id,
        })
        .$returningId();
      await audit(tx, user.id, 'upload.created', { type: 'upload', id: row!.id }, { projectId, fileName: received.fileName, format: received.parsed.format, points: summary.pointCount, sizeBytes: received.sizeBytes });
      return row!.id;
    });
    const { storageKey: _key, ...saved } = await getUpload(db, user, id);
    return saved;
  } catch (e) {
    await received.pending.abort();
    if (committedKey) await store.remove(committedKey).catch(() => undefined);
    throw e;
  }
}
