import type { APIRoute } from 'astro';
import { z } from 'zod';
import { requireRole } from '~/server/auth/guard';
import { getDb } from '~/server/db/client';
import { handle, idParam, readBody } from '~/server/errors';
import { json } from '~/server/http';
import { listRevisionQuotes, requestQuote } from '~/server/repos/orders';
import { mailQuoteReady } from '~/server/orderMail';
import { appBase } from '~/server/appBase';

const bodySchema = z.object({ quantity: z.int({ error: 'quantity must be a whole number of plates' }).min(1, { error: 'quantity must be 1 or more' }) }).strict();

/** Quote an approved revision: designer of the project, engineer, admin. */
export const POST: APIRoute = ({ params, locals, request }) =>
  handle(async () => {
    const g = requireRole(locals, 'designer', 'engineer', 'admin');
    if (!g.ok) return g.response;
    const revisionId = idParam(params.id, 'Revision');
    const body = await readBody(request, bodySchema);
    const made = await requestQuote(getDb(), g.user, revisionId, body.quantity);
    const mail = await mailQuoteReady(made.quote, made.recipients, made.shopName, made.taxLabel, appBase(request));
    return json({ quote: made.quote, mailed: mail }, 201);
  });

export const GET: APIRoute = ({ params, locals }) =>
  handle(async () => {
    const g = requireRole(locals, 'designer', 'engineer', 'admin');
    if (!g.ok) return g.response;
    return json({ quotes: await listRevisionQuotes(getDb(), g.user, idParam(params.id, 'Revision')) });
  });
