import type { APIRoute } from 'astro';
import { requireRole } from '~/server/auth/guard';
import { getDb } from '~/server/db/client';
import { AppError, handle, idParam, notFound } from '~/server/errors';
import { findRevision, storedFileForViewer } from '~/server/repos/revisions';
import { isFileName } from '~/server/fileNames';
import { contentDisposition, downloadFileName } from '~/server/files/index';
import { renderOne } from '~/server/release';
import { validateSpec } from '~/server/plateEngine';

/**
 * A file of a revision. Released (approved or superseded) revisions answer their stored bytes,
 * byte-identical to what was approved; other revisions get a preview made from the spec on
 * request (never for machinists, who only see releases).
 */
export const GET: APIRoute = ({ locals, params }) =>
  handle(async () => {
    const g = requireRole(locals);
    if (!g.ok) return g.response;
    const id = idParam(params.id, 'Revision');
    const name = params.name ?? '';
    if (!isFileName(name)) throw new AppError(404, 'not_found', `No file called ${name}; a revision has drawing.pdf, plate.dxf, plate.step, plate.svg and holes.csv.`);
    // access rules read fresh (machinists: released only) and the stored file, in one query
    const { rev, file: stored } = await storedFileForViewer(getDb(), g.user, id, name);
    let bytes: Uint8Array;
    let contentType: string;
    let sha: string;
    let preview = false;
    if (stored) {
      bytes = stored.bytes;
      contentType = stored.contentType;
      sha = stored.sha256;
    } else {
      if (rev.status === 'approved' || rev.status === 'superseded' || g.user.role === 'machinist') throw notFound('File');
      const row = (await findRevision(getDb(), id))!;
      const f = await renderOne({ revision: row, spec: validateSpec(row.spec), partNumber: rev.partNumber }, name);
      bytes = f.bytes;
      contentType = f.contentType;
      sha = f.sha256;
      preview = true;
    }
    return new Response(bytes as unknown as BodyInit, {
      status: 200,
      headers: {
        'content-type': contentType,
        'content-length': String(bytes.byteLength),
        'content-disposition': contentDisposition(downloadFileName(rev.partNumber, rev.number, name)),
        'x-content-sha256': sha,
        'x-platewright-preview': preview ? 'yes' : 'no',
        'cache-control': preview ? 'no-store' : 'private, max-age=31536000, immutable',
      },
    });
  });
