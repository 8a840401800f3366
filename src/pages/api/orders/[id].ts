import type { APIRoute } from 'astro';
import { z } from 'zod';
import { requireRole } from '~/server/auth/guard';
import { getDb } from '~/server/db/client';
import { handle, idParam, readBody } from '~/server/errors';
import { json } from '~/server/http';
import { advanceOrder, getOrder } from '~/server/repos/orders';
import { mailOrderShipped } from '~/server/orderMail';
import { appBase } from '~/server/appBase';

const bodySchema = z
  .object({
    state: z.enum(['in_production', 'inspected', 'shipped'], { error: 'state must be "in_production", "inspected" or "shipped" (payment is set by the payment service only)' }),
    note: z.string().trim().max(500).optional(),
  })
  .strict();

export const GET: APIRoute = ({ params, locals }) =>
  handle(async () => {
    const g = requireRole(locals, 'designer', 'machinist', 'engineer', 'admin');
    if (!g.ok) return g.response;
    return json({ order: await getOrder(getDb(), g.user, idParam(params.id, 'Order')) });
  });

/** The shop moves an order one step: paid → in_production → inspected → shipped. */
export const PATCH: APIRoute = ({ params, locals, request }) =>
  handle(async () => {
    const g = requireRole(locals, 'machinist', 'engineer', 'admin');
    if (!g.ok) return g.response;
    const body = await readBody(request, bodySchema);
    const order = await advanceOrder(getDb(), g.user, idParam(params.id, 'Order'), body);
    const mailed = order.state === 'shipped' ? await mailOrderShipped(order, appBase(request)) : undefined;
    return json({ order, ...(mailed ? { mailed } : {}) });
  });
