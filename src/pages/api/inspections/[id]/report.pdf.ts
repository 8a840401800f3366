import type { APIRoute } from 'astro';
import { requireRole } from '~/server/auth/guard';
import { getDb } from '~/server/db/client';
import { handle, idParam } from '~/server/errors';
import { getInspection } from '~/server/repos/inspections';
import { inspectionReportPdf } from '~/server/files/inspectionReport';
import { contentDisposition } from '~/server/files';

export const GET: APIRoute = ({ locals, params }) =>
  handle(async () => {
    const g = requireRole(locals);
    if (!g.ok) return g.response;
    const v = await getInspection(getDb(), g.user, idParam(params.id, 'Inspection'));
    const bytes = await inspectionReportPdf({
      inspectionId: v.id,
      state: v.state,
      partNumber: v.plate.partNumber,
      title: v.plate.title,
      material: v.plate.material,
      revision: v.revision.number,
      revisionAuthor: v.revision.author,
      specSha256: v.revision.specSha256,
      fileHashes: v.artifactHashes,
      machinist: v.machinist.name,
      engineer: v.acceptedBy?.name ?? null,
      acceptComment: v.acceptComment,
      startedAt: v.createdAt,
      completedAt: v.completedAt,
      acceptedAt: v.acceptedAt,
      profile: v.profile,
      result: v.result,
    });
    return new Response(Buffer.from(bytes), {
      status: 200,
      headers: {
        'content-type': 'application/pdf',
        'content-disposition': contentDisposition(`${v.plate.partNumber}-rev${v.revision.number}-inspection-${v.id}.pdf`),
        'cache-control': 'no-store',
      },
    });
  });
