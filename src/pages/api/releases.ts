import type { APIRoute } from 'astro';
import { requireRole } from '~/server/auth/guard';
import { getDb } from '~/server/db/client';
import { handle } from '~/server/errors';
import { json } from '~/server/http';
import { listReleases } from '~/server/repos/revisions';

export const GET: APIRoute = ({ locals }) =>
  handle(async () => {
    const g = requireRole(locals, 'machinist', 'engineer', 'admin');
    if (!g.ok) return g.response;
    return json({ releases: await listReleases(getDb(), g.user) });
  });
