import type { APIRoute } from 'astro';
import { requireRole } from '~/server/auth/guard';
import { getDb } from '~/server/db/client';
import { handle, idParam } from '~/server/errors';
import { json } from '~/server/http';
import { getQuote } from '~/server/repos/orders';

export const GET: APIRoute = ({ params, locals }) =>
  handle(async () => {
    const g = requireRole(locals, 'designer', 'engineer', 'admin');
    if (!g.ok) return g.response;
    return json({ quote: await getQuote(getDb(), g.user, idParam(params.id, 'Quote')) });
  });
