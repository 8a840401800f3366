import type { APIRoute } from 'astro';
import { z } from 'zod';
import { requireRole } from '~/server/auth/guard';
import { getDb } from '~/server/db/client';
import { handle, idParam, readBody } from '~/server/errors';
import { json } from '~/server/http';
import { getProject, updateProject } from '~/server/repos/projects';

const patchSchema = z
  .strictObject({
    name: z.string().trim().min(1).max(200).optional(),
    swapDescription: z.string().trim().max(5000).optional(),
  })
  .refine((v) => v.name !== undefined || v.swapDescription !== undefined, 'Nothing to change: send name or swapDescription');

export const GET: APIRoute = ({ locals, params }) =>
  handle(async () => {
    const g = requireRole(locals, 'designer', 'engineer', 'admin');
    if (!g.ok) return g.response;
    return json({ project: await getProject(getDb(), g.user, idParam(params.id, 'Project')) });
  });

export const PATCH: APIRoute = ({ locals, params, request }) =>
  handle(async () => {
    const g = requireRole(locals, 'designer', 'engineer', 'admin');
    if (!g.ok) return g.response;
    const id = idParam(params.id, 'Project');
    const body = await readBody(request, patchSchema);
    await updateProject(getDb(), g.user, id, body);
    return json({ project: await getProject(getDb(), g.user, id) });
  });
