import type { APIRoute } from 'astro';
import { requireRole } from '~/server/auth/guard';
import { getDb } from '~/server/db/client';
import { handle, idParam } from '~/server/errors';
import { json } from '~/server/http';
import { createUpload, listUploads } from '~/server/measure/repo';
import { uploadStore } from '~/server/storage';

/** The project's measurement uploads, newest first. */
export const GET: APIRoute = ({ locals, params }) =>
  handle(async () => {
    const g = requireRole(locals);
    if (!g.ok) return g.response;
    return json({ uploads: await listUploads(getDb(), g.user, idParam(params.id, 'Project')) });
  });

/** multipart/form-data: `units` (mm | in), then `file` (.xyz .txt .csv .ply .stl). */
export const POST: APIRoute = ({ locals, params, request }) =>
  handle(async () => {
    const g = requireRole(locals, 'designer', 'engineer', 'admin');
    if (!g.ok) return g.response;
    const upload = await createUpload(getDb(), g.user, idParam(params.id, 'Project'), request, uploadStore());
    return json({ upload }, 201);
  });
