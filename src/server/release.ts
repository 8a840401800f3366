import { createHash } from 'node:crypto';
import { eq } from 'drizzle-orm';
import { getDb } from './db/client';
import { plates, users } from './db/schema';
import type { PlateSpec } from '~/domain';
import type { SessionUser } from './auth/types';
import { profileOf, runChecks } from './plateEngine';
import type { Finding } from './plateEngine';
import type { PlateProfile } from '~/domain/profileTypes';

/** What the files module needs to draw a revision's files. */
export interface RevisionFileInput {
  spec: PlateSpec;
  profile: PlateProfile;
  findings: Finding[];
  meta: {
    partNumber: string;
    revision: number;
    status: string;
    title: string;
    material: string;
    author: string;
    approver?: string;
    approvedAt?: string;
    specSha256: string;
    fileHashes: { name: string; sha256: string }[];
  };
}

type Renderer = (name: FileName, input: RevisionFileInput) => Promise<{ bytes: Uint8Array; kernelVersion: string }>;
// Resolved when the module exists (the glob is empty otherwise, so the build never breaks on it).
const filesModules = import.meta.glob<{ renderFile: Renderer }>('./files/index.ts');
async function renderFile(name: FileName, input: RevisionFileInput) {
  const load = filesModules['./files/index.ts'];
  if (!load) throw new Error('the files module is not installed');
  return (await load()).renderFile(name, input);
}
import { CONTENT_TYPES, FILE_NAMES, type FileName } from './fileNames';
import type { ReleaseFile, RevisionRow } from './repos/revisions';

const sha256 = (b: Uint8Array) => createHash('sha256').update(b).digest('hex');

interface RenderContext {
  revision: Pick<RevisionRow, 'id' | 'number' | 'status' | 'specSha256' | 'authorId' | 'plateId'>;
  spec: PlateSpec;
  partNumber: string;
  approver?: { name: string } | null;
  approvedAt?: Date | null;
}

async function inputFor(ctx: RenderContext, fileHashes: { name: string; sha256: string }[], status: string): Promise<RevisionFileInput> {
  const [plate] = await getDb().select({ title: plates.title, material: plates.material }).from(plates).where(eq(plates.id, ctx.revision.plateId));
  const [author] = await getDb().select({ name: users.name }).from(users).where(eq(users.id, ctx.revision.authorId));
  return {
    spec: ctx.spec,
    profile: profileOf(ctx.spec),
    findings: runChecks(ctx.spec),
    meta: {
      partNumber: ctx.partNumber,
      revision: ctx.revision.number,
      status,
      title: plate?.title ?? '',
      material: plate?.material ?? ctx.spec.material.name,
      author: author?.name ?? '',
      approver: ctx.approver?.name,
      approvedAt: ctx.approvedAt?.toISOString(),
      specSha256: ctx.revision.specSha256,
      fileHashes,
    },
  };
}

/**
 * Every file of a revision, made from the stored spec. The drawing goes last: it prints the other
 * files' hashes. Used at approval (the files are then stored and served as they are ever after)
 * and for previews of unreleased revisions.
 */
export async function renderAll(ctx: RenderContext, status: string): Promise<ReleaseFile[]> {
  const out: ReleaseFile[] = [];
  const order: FileName[] = [...FILE_NAMES.filter((n) => n !== 'drawing.pdf'), 'drawing.pdf'];
  for (const name of order) {
    const input = await inputFor(ctx, out.map((f) => ({ name: f.name, sha256: f.sha256 })), status);
    const r = await renderFile(name, input);
    out.push({ name, contentType: CONTENT_TYPES[name], bytes: r.bytes, sha256: sha256(r.bytes), kernelVersion: r.kernelVersion });
  }
  return out;
}

export async function renderOne(ctx: RenderContext, name: FileName): Promise<ReleaseFile> {
  if (name === 'drawing.pdf') {
    const all = await renderAll(ctx, ctx.revision.status);
    return all.find((f) => f.name === name)!;
  }
  const r = await renderFile(name, await inputFor(ctx, [], ctx.revision.status));
  return { name, contentType: CONTENT_TYPES[name], bytes: r.bytes, sha256: sha256(r.bytes), kernelVersion: r.kernelVersion };
}

/** The approval hook: files made once, stored with their hashes by approveRevision. */
export function makeReleaseFiles(ctx: { revision: RevisionRow; spec: PlateSpec; partNumber: string; approver: SessionUser; approvedAt: Date }): Promise<ReleaseFile[]> {
  return renderAll(ctx, 'approved');
}
