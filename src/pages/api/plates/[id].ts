import type { APIRoute } from 'astro';
import { requireRole } from '~/server/auth/guard';
import { getDb } from '~/server/db/client';
import { handle, idParam } from '~/server/errors';
import { json } from '~/server/http';
import { getPlate } from '~/server/repos/plates';

export const GET: APIRoute = ({ locals, params }) =>
  handle(async () => {
    const g = requireRole(locals);
    if (!g.ok) return g.response;
    return json({ plate: await getPlate(getDb(), g.user, idParam(params.id, 'Plate')) });
  });
