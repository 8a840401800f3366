import type { APIRoute } from 'astro';
import { z } from 'zod';
import { requireRole } from '~/server/auth/guard';
import { getDb } from '~/server/db/client';
import { AppError, handle, idParam, readBody } from '~/server/errors';
import { getPlate } from '~/server/repos/plates';
import { profileOf, runChecks, specSha256, validateSpec } from '~/server/plateEngine';

/**
 * The drawing of the editor's current (possibly unsaved) state, always marked
 * "DRAFT — not released": it is a preview, never a released file.
 */
const previewSchema = z.strictObject({
  spec: z.unknown().refine((v) => v !== undefined, 'The plate spec is required'),
  basedOnRevisionId: z.number().int().positive().nullable().default(null),
  paper: z.enum(['A3', 'tabloid']).default('A3'),
});

/** What this endpoint needs of the drawing module (server/files/drawing.ts). */
interface DrawingModule {
  drawingPdf(input: Record<string, unknown>): Promise<Uint8Array>;
}
// loaded lazily: the drawing module is optional at build time
const drawingModules = import.meta.glob<DrawingModule>('../../../../../server/files/drawing.ts');

export const POST: APIRoute = ({ locals, params, request }) =>
  handle(async () => {
    const g = requireRole(locals, 'designer', 'engineer', 'admin');
    if (!g.ok) return g.response;
    const plate = await getPlate(getDb(), g.user, idParam(params.id, 'Plate'));
    const body = await readBody(request, previewSchema, 5_000_000);
    const spec = validateSpec(body.spec);
    const load = Object.values(drawingModules)[0];
    if (!load) throw new AppError(503, 'drawing_unavailable', 'The drawing module is not part of this build; export the DXF or SVG instead.');
    const { drawingPdf } = await load();
    const based = body.basedOnRevisionId ? plate.revisions.find((r) => r.id === body.basedOnRevisionId) : undefined;
    const bytes = await drawingPdf({
      profile: profileOf(spec),
      findings: runChecks(spec),
      paper: body.paper,
      meta: {
        partNumber: plate.partNumber,
        revision: based ? `DRAFT (from rev ${based.number})` : 'DRAFT',
        status: 'DRAFT — not released',
        title: plate.title,
        material: spec.material.name,
        author: g.user.name,
        approver: null,
        approvedAt: null,
        specSha256: specSha256(spec),
        fileHashes: [],
      },
    });
    return new Response(bytes as unknown as BodyInit, {
      status: 200,
      headers: {
        'content-type': 'application/pdf',
        'content-disposition': `attachment; filename="${plate.partNumber}-DRAFT-not-released.pdf"`,
        'cache-control': 'no-store',
      },
    });
  });
