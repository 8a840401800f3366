import type { APIRoute } from 'astro';
import { z } from 'zod';
import { requireRole } from '~/server/auth/guard';
import { getDb } from '~/server/db/client';
import { handle, idParam, readBody } from '~/server/errors';
import { json } from '~/server/http';
import { acceptInspection, getInspection } from '~/server/repos/inspections';
import { notifyInspection } from '~/server/inspectionNotify';

const bodySchema = z.strictObject({
  comment: z.string({ error: 'is required: say why the deviation is acceptable' }).trim().min(5, 'is required: say why the deviation is acceptable (a few words at least)').max(5000),
});

/** Accept a failed inspection with deviation (engineers, admins; written reason required). */
export const POST: APIRoute = ({ locals, params, request }) =>
  handle(async () => {
    const g = requireRole(locals, 'engineer', 'admin');
    if (!g.ok) return g.response;
    const id = idParam(params.id, 'Inspection');
    const body = await readBody(request, bodySchema);
    await acceptInspection(getDb(), g.user, id, body.comment);
    const { profile: _profile, ...inspection } = await getInspection(getDb(), g.user, id);
    const notified = await notifyInspection({ inspectionId: id, revisionId: inspection.revision.id, partNumber: inspection.plate.partNumber, revision: inspection.revision.number, state: inspection.state, failing: inspection.result.failing });
    return json({ inspection, notified });
  });
