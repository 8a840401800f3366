/**
 * The machinist's files of a revision, all derived from its profile: plate.step, plate.dxf,
 * drawing.pdf, plate.svg, holes.csv. The revisions endpoint (GET /api/revisions/:id/files/:name)
 * calls renderFile for a draft, or serves the bytes stored at approval (renderRevisionFiles,
 * with their SHA-256 and the kernel version) for an approved revision.
 */
import { createHash } from 'node:crypto';
import type { Finding } from '../../domain/checks';
import type { PlateProfile } from '../../domain/profileTypes';
import { plateDxf } from '../../domain/exports/dxf';
import { plateSvg } from '../../domain/exports/svg';
import { holeTableCsv } from '../../domain/exports/csv';
import { PlateCache } from '../../cad/buildPlate';
import { kernelVersion, onKernelRecycle, withKernel } from '../../cad/kernel.node.ts';
import { plateStep } from '../../cad/step';
import { drawingPdf, type DrawingMeta, type Paper } from './drawing';
import { CONTENT_TYPES, isFileName, type FileName } from '../fileNames';

// The file names and their content types are stated once, in ../fileNames.
export const REVISION_FILE_NAMES = ['plate.step', 'plate.dxf', 'drawing.pdf', 'plate.svg', 'holes.csv'] as const satisfies readonly FileName[];
export type RevisionFileName = FileName;
export const isRevisionFileName = isFileName;

export interface RevisionFilesInput {
  readonly profile: PlateProfile;
  readonly findings: readonly Pick<Finding, 'severity' | 'code' | 'message' | 'featureIds'>[];
  /** fileHashes are filled in for the drawing when not given */
  readonly meta: Omit<DrawingMeta, 'fileHashes'> & { readonly fileHashes?: DrawingMeta['fileHashes'] };
  readonly paper?: Paper;
}

export interface RenderedFile {
  readonly name: RevisionFileName;
  readonly bytes: Uint8Array;
  readonly contentType: string;
  /** download name, e.g. PW-0042-rev3.dxf */
  readonly fileName: string;
  readonly sha256: string;
}

export { CONTENT_TYPES };

const SUFFIX: Record<RevisionFileName, string> = {
  'plate.step': '.step',
  'plate.dxf': '.dxf',
  'drawing.pdf': '.pdf',
  'plate.svg': '.svg',
  'holes.csv': '-holes.csv',
};

/** PW-0042 + 3 + plate.dxf → PW-0042-rev3.dxf (characters outside [A-Za-z0-9._-] become "_") */
export function downloadFileName(partNumber: string, revision: string | number, name: RevisionFileName): string {
  const safe = (s: string) => s.replace(/[^A-Za-z0-9._-]+/g, '_');
  return `${safe(partNumber)}-rev${safe(String(revision))}${SUFFIX[name]}`;
}

/** Content-Disposition for a download, ASCII name plus the RFC 6266 / 5987 form. */
export function contentDisposition(fileName: string): string {
  return `attachment; filename="${fileName.replace(/["\\]/g, '_')}"; filename*=UTF-8''${encodeURIComponent(fileName)}`;
}

export function sha256Hex(bytes: Uint8Array): string {
  return createHash('sha256').update(bytes).digest('hex');
}

const utf8 = (s: string) => new TextEncoder().encode(s);

// the server keeps the last built solid; a recycled kernel takes its objects with it
const cache = new PlateCache();
onKernelRecycle(() => cache.clear());

async function stepBytes(input: RevisionFilesInput): Promise<Uint8Array> {
  const { profile, meta } = input;
  return withKernel((oc) => {
    const { plate } = cache.get(oc, profile);
    return plateStep(oc, plate.shape, {
      partNumber: meta.partNumber,
      revision: meta.revision,
      author: meta.author,
      organization: 'Platewright',
      ...(meta.approvedAt ? { timestampIso: meta.approvedAt } : {}),
    });
  });
}

function finish(name: RevisionFileName, bytes: Uint8Array, input: RevisionFilesInput): RenderedFile {
  return {
    name,
    bytes,
    contentType: CONTENT_TYPES[name],
    fileName: downloadFileName(input.meta.partNumber, input.meta.revision, name),
    sha256: sha256Hex(bytes),
  };
}

async function renderOthers(input: RevisionFilesInput): Promise<RenderedFile[]> {
  const names = REVISION_FILE_NAMES.filter((n) => n !== 'drawing.pdf');
  const out: RenderedFile[] = [];
  for (const n of names) out.push(await renderFile(n, input));
  return out;
}

/** One file of a revision. The drawing lists the other files' hashes (rendered here if not given). */
export async function renderFile(name: RevisionFileName, input: RevisionFilesInput): Promise<RenderedFile> {
  const { profile, meta } = input;
  switch (name) {
    case 'plate.step':
      return finish(name, await stepBytes(input), input);
    case 'plate.dxf':
      return finish(name, utf8(plateDxf(profile, { partNumber: meta.partNumber, revision: meta.revision })), input);
    case 'plate.svg':
      return finish(name, utf8(plateSvg(profile, { partNumber: meta.partNumber, revision: meta.revision })), input);
    case 'holes.csv':
      return finish(name, utf8(holeTableCsv(profile)), input);
    case 'drawing.pdf': {
      const fileHashes = meta.fileHashes ?? (await renderOthers(input)).map((f) => ({ name: f.fileName, sha256: f.sha256 }));
      const pdf = await drawingPdf({ profile, findings: input.findings, meta: { ...meta, fileHashes }, ...(input.paper ? { paper: input.paper } : {}) });
      return finish(name, pdf, input);
    }
  }
}

/**
 * All five files, e.g. at approval: the drawing carries the SHA-256 of the four others; store
 * every file's bytes with its sha256 and `kernelVersion` and serve those bytes ever after.
 */
export async function renderRevisionFiles(input: RevisionFilesInput): Promise<{ files: RenderedFile[]; kernelVersion: string }> {
  const others = await renderOthers(input);
  const drawing = await renderFile('drawing.pdf', {
    ...input,
    meta: { ...input.meta, fileHashes: others.map((f) => ({ name: f.fileName, sha256: f.sha256 })) },
  });
  const files = [others[0]!, others[1]!, drawing, others[2]!, others[3]!];
  return { files, kernelVersion };
}
