import { eq } from 'drizzle-orm';
import { getDb } from './db/client';
import { plates, users } from './db/schema';
import type { PlateSpec } from '~/domain';
import type { SessionUser } from './auth/types';
import { profileOf, runChecks } from './plateEngine';
import { renderFile, renderRevisionFiles, type RevisionFilesInput } from './files/index';
import { KERNEL_VERSION } from '../cad/version';
import type { FileName } from './fileNames';
import type { ReleaseFile, RevisionRow } from './repos/revisions';


interface RenderContext {
  revision: Pick<RevisionRow, 'id' | 'number' | 'status' | 'specSha256' | 'authorId' | 'plateId'>;
  spec: PlateSpec;
  partNumber: string;
  approver?: { name: string } | null;
  approvedAt?: Date | null;
}

async function inputFor(ctx: RenderContext, status: string): Promise<RevisionFilesInput> {
  const [plate] = await getDb().select({ title: plates.title, material: plates.material }).from(plates).where(eq(plates.id, ctx.revision.plateId));
  const [author] = await getDb().select({ name: users.name }).from(users).where(eq(users.id, ctx.revision.authorId));
  return {
    profile: profileOf(ctx.spec),
    findings: runChecks(ctx.spec),
    meta: {
      partNumber: ctx.partNumber,
      revision: ctx.revision.number,
      status,
      title: plate?.title ?? '',
      material: plate?.material ?? ctx.spec.material.name,
      author: author?.name ?? '',
      approver: ctx.approver?.name ?? null,
      approvedAt: ctx.approvedAt?.toISOString() ?? null,
      specSha256: ctx.revision.specSha256,
    },
  };
}

const kernel = () => KERNEL_VERSION;

/**
 * Every file of a revision, made from the stored spec; the drawing prints the other files'
 * hashes. Used at approval (the files are then stored and served as they are ever after).
 */
export async function renderAll(ctx: RenderContext, status: string): Promise<ReleaseFile[]> {
  const { files, kernelVersion: kv } = await renderRevisionFiles(await inputFor(ctx, status));
  return files.map((f) => ({ name: f.name, contentType: f.contentType, bytes: f.bytes, sha256: f.sha256, kernelVersion: String(kv) }));
}

/** One file of an unreleased revision, made on request (a preview: nothing is stored). */
export async function renderOne(ctx: RenderContext, name: FileName): Promise<ReleaseFile> {
  const f = await renderFile(name, await inputFor(ctx, ctx.revision.status === 'approved' ? 'approved' : `${ctx.revision.status.replace('_', ' ')} — not released`));
  return { name, contentType: f.contentType, bytes: f.bytes, sha256: f.sha256, kernelVersion: kernel() };
}

/** The approval hook: files made once, stored with their hashes by approveRevision. */
export function makeReleaseFiles(ctx: { revision: RevisionRow; spec: PlateSpec; partNumber: string; approver: SessionUser; approvedAt: Date }): Promise<ReleaseFile[]> {
  return renderAll(ctx, 'approved');
}
