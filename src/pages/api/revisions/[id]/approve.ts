import type { APIRoute } from 'astro';
import { z } from 'zod';
import { requireRole } from '~/server/auth/guard';
import { getDb } from '~/server/db/client';
import { handle, idParam, readBody } from '~/server/errors';
import { json } from '~/server/http';
import { approveRevision, getRevision } from '~/server/repos/revisions';
import { makeReleaseFiles } from '~/server/release';
import { notifyReleased } from '~/server/notify';

const waiverSchema = z.strictObject({
  code: z.string().min(1).max(80),
  featureIds: z.array(z.string().max(40)).max(200).default([]),
  reason: z.string().trim().min(5, 'A waiver needs a written reason (at least a few words)').max(5000),
});
const bodySchema = z.strictObject({
  comment: z.string().trim().max(10000).default(''),
  waivers: z.array(waiverSchema).max(200).optional(),
});

export const POST: APIRoute = ({ locals, params, request }) =>
  handle(async () => {
    const g = requireRole(locals, 'engineer', 'admin');
    if (!g.ok) return g.response;
    const body = await readBody(request, bodySchema);
    const result = await approveRevision(getDb(), g.user, idParam(params.id, 'Revision'), body, makeReleaseFiles);
    const notified = await notifyReleased(result, g.user);
    return json({ revision: await getRevision(getDb(), g.user, result.revisionId), notified });
  });
