import type { APIRoute } from 'astro';
import { z } from 'zod';
import { requireRole } from '~/server/auth/guard';
import { getDb } from '~/server/db/client';
import { handle, idParam, readBody } from '~/server/errors';
import { json } from '~/server/http';
import { addMember } from '~/server/repos/projects';

const memberSchema = z.strictObject({ email: z.email('Give the member’s e-mail address').max(254) });

export const POST: APIRoute = ({ locals, params, request }) =>
  handle(async () => {
    const g = requireRole(locals, 'designer', 'engineer', 'admin');
    if (!g.ok) return g.response;
    const body = await readBody(request, memberSchema);
    const member = await addMember(getDb(), g.user, idParam(params.id, 'Project'), body.email);
    return json({ member }, 201);
  });
