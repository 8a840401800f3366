import type { APIRoute } from 'astro';
import { requireRole } from '~/server/auth/guard';
import { getDb } from '~/server/db/client';
import { handle, idParam } from '~/server/errors';
import { json } from '~/server/http';
import { getInspection } from '~/server/repos/inspections';

export const GET: APIRoute = ({ locals, params }) =>
  handle(async () => {
    const g = requireRole(locals);
    if (!g.ok) return g.response;
    const { profile: _profile, ...inspection } = await getInspection(getDb(), g.user, idParam(params.id, 'Inspection'));
    return json({ inspection });
  });
