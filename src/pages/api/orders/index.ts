import type { APIRoute } from 'astro';
import { requireRole } from '~/server/auth/guard';
import { getDb } from '~/server/db/client';
import { handle } from '~/server/errors';
import { json } from '~/server/http';
import { listOrders } from '~/server/repos/orders';

/** Designers: their own orders; machinists, engineers, admins: every order. */
export const GET: APIRoute = ({ locals }) =>
  handle(async () => {
    const g = requireRole(locals, 'designer', 'machinist', 'engineer', 'admin');
    if (!g.ok) return g.response;
    return json({ orders: await listOrders(getDb(), g.user) });
  });
