import type { APIRoute } from 'astro';
import { z } from 'zod';
import { requireRole } from '~/server/auth/guard';
import { getDb } from '~/server/db/client';
import { handle, idParam, readBody } from '~/server/errors';
import { json } from '~/server/http';
import { getInspection, startInspection } from '~/server/repos/inspections';

const bodySchema = z.strictObject({ note: z.string().trim().max(2000).optional() });

/** Start an inspection of a released revision (machinists). */
export const POST: APIRoute = ({ locals, params, request }) =>
  handle(async () => {
    const g = requireRole(locals, 'machinist');
    if (!g.ok) return g.response;
    const body = await readBody(request, bodySchema);
    const id = await startInspection(getDb(), g.user, idParam(params.id, 'Revision'), body.note);
    const { profile: _profile, ...inspection } = await getInspection(getDb(), g.user, id);
    return json({ id, inspection }, 201);
  });
