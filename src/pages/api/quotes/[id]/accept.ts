import type { APIRoute } from 'astro';
import { z } from 'zod';
import { requireRole } from '~/server/auth/guard';
import { getDb } from '~/server/db/client';
import { handle, idParam, readBody } from '~/server/errors';
import { json } from '~/server/http';
import { acceptQuote } from '~/server/repos/orders';
import { paymentsConfig } from '~/server/payments/config';
import { appBase } from '~/server/appBase';

/** Accept a quote → an order awaiting payment and the checkout page to pay it on: `{ checkoutUrl }`. */
export const POST: APIRoute = ({ params, locals, request }) =>
  handle(async () => {
    const g = requireRole(locals, 'designer', 'engineer', 'admin');
    if (!g.ok) return g.response;
    paymentsConfig(); // 503 when payments are not set up
    const quoteId = idParam(params.id, 'Quote');
    await readBody(request, z.object({}).strict());
    const r = await acceptQuote(getDb(), g.user, quoteId, appBase(request));
    return json({ orderId: r.orderId, checkoutUrl: r.checkoutUrl }, 200);
  });
