import type { APIRoute } from 'astro';
import { z } from 'zod';
import { requireRole } from '~/server/auth/guard';
import { getDb } from '~/server/db/client';
import { handle, idParam, readBody } from '~/server/errors';
import { json } from '~/server/http';
import { listRevisionSummaries } from '~/server/repos/plates';
import { saveRevision } from '~/server/repos/revisions';

const saveSchema = z.strictObject({
  spec: z.unknown().refine((v) => v !== undefined, 'The plate spec is required'),
  message: z.string().trim().max(2000).default(''),
  parentRevisionId: z.number().int().positive().nullable(),
  asBranch: z.boolean().optional(),
});

export const GET: APIRoute = ({ locals, params }) =>
  handle(async () => {
    const g = requireRole(locals);
    if (!g.ok) return g.response;
    return json({ revisions: await listRevisionSummaries(getDb(), g.user, idParam(params.id, 'Plate')) });
  });

export const POST: APIRoute = ({ locals, params, request }) =>
  handle(async () => {
    const g = requireRole(locals, 'designer', 'engineer', 'admin');
    if (!g.ok) return g.response;
    const body = await readBody(request, saveSchema, 5_000_000);
    const saved = await saveRevision(getDb(), g.user, idParam(params.id, 'Plate'), {
      spec: body.spec,
      message: body.message,
      parentRevisionId: body.parentRevisionId,
      asBranch: body.asBranch,
    });
    return json({ revision: saved }, 201);
  });
