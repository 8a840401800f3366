import type { APIRoute } from 'astro';
import { requireRole } from '~/server/auth/guard';
import { getDb } from '~/server/db/client';
import { handle, idParam } from '~/server/errors';
import { json } from '~/server/http';
import { getRevision } from '~/server/repos/revisions';

export const GET: APIRoute = ({ locals, params }) =>
  handle(async () => {
    const g = requireRole(locals);
    if (!g.ok) return g.response;
    return json({ revision: await getRevision(getDb(), g.user, idParam(params.id, 'Revision')) });
  });
