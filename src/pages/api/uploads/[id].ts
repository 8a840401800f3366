import type { APIRoute } from 'astro';
import { requireRole } from '~/server/auth/guard';
import { getDb } from '~/server/db/client';
import { handle, idParam } from '~/server/errors';
import { json } from '~/server/http';
import { getUpload } from '~/server/measure/repo';

/** One upload's summary: format, points, bounding box, units and their plausibility. */
export const GET: APIRoute = ({ locals, params }) =>
  handle(async () => {
    const g = requireRole(locals);
    if (!g.ok) return g.response;
    const { storageKey: _key, ...upload } = await getUpload(getDb(), g.user, idParam(params.id, 'Upload'));
    return json({ upload });
  });
