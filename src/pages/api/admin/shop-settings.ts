import type { APIRoute } from 'astro';
import { requireRole } from '~/server/auth/guard';
import { getDb } from '~/server/db/client';
import { handle, readBody } from '~/server/errors';
import { json } from '~/server/http';
import { getShopRates, updateShopRates } from '~/server/repos/shopSettings';
import { shopRatesSchema } from '~/domain/quote';

export const GET: APIRoute = ({ locals }) =>
  handle(async () => {
    const g = requireRole(locals, 'admin');
    if (!g.ok) return g.response;
    return json(await getShopRates(getDb()));
  });

/** Replace the shop's rates (the whole document, checked; nothing saved when any field is wrong). */
export const PATCH: APIRoute = ({ locals, request }) =>
  handle(async () => {
    const g = requireRole(locals, 'admin');
    if (!g.ok) return g.response;
    const rates = await readBody(request, shopRatesSchema);
    return json({ rates: await updateShopRates(getDb(), g.user, rates) });
  });
