import type { APIRoute } from 'astro';
import { z } from 'zod';
import { requireRole } from '~/server/auth/guard';
import { getDb } from '~/server/db/client';
import { handle, readBody } from '~/server/errors';
import { json } from '~/server/http';
import { createProject, getProject, listProjects } from '~/server/repos/projects';

const createSchema = z.strictObject({
  name: z.string().trim().min(1, 'Give the project a name').max(200),
  swapDescription: z.string().trim().max(5000).default(''),
});

export const GET: APIRoute = ({ locals, url }) =>
  handle(async () => {
    const g = requireRole(locals, 'designer', 'engineer', 'admin');
    if (!g.ok) return g.response;
    const q = url.searchParams.get('q')?.slice(0, 100) || undefined;
    return json({ projects: await listProjects(getDb(), g.user, { q }) });
  });

export const POST: APIRoute = ({ locals, request }) =>
  handle(async () => {
    const g = requireRole(locals, 'designer', 'engineer', 'admin');
    if (!g.ok) return g.response;
    const body = await readBody(request, createSchema);
    const { id } = await createProject(getDb(), g.user, body);
    return json({ project: await getProject(getDb(), g.user, id) }, 201);
  });
