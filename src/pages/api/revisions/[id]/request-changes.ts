import type { APIRoute } from 'astro';
import { z } from 'zod';
import { requireRole } from '~/server/auth/guard';
import { getDb } from '~/server/db/client';
import { handle, idParam, readBody } from '~/server/errors';
import { json } from '~/server/http';
import { getRevision, requestChanges } from '~/server/repos/revisions';
import { notifyChangesRequested } from '~/server/notify';

const bodySchema = z.strictObject({ comment: z.string().trim().min(1, 'Say what has to change').max(10000) });

export const POST: APIRoute = ({ locals, params, request }) =>
  handle(async () => {
    const g = requireRole(locals, 'engineer', 'admin');
    if (!g.ok) return g.response;
    const body = await readBody(request, bodySchema);
    const result = await requestChanges(getDb(), g.user, idParam(params.id, 'Revision'), body.comment);
    const notified = await notifyChangesRequested(result, g.user, body.comment);
    return json({ revision: await getRevision(getDb(), g.user, result.revisionId), notified });
  });
