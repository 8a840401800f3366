import type { APIRoute } from 'astro';
import { getDb } from '~/server/db/client';
import { errorResponse } from '~/server/auth/errors';
import { endSession } from '~/server/auth/session';
import { audit } from '~/server/audit';

/** POST → 204; the session is deleted and the cookie blanked. Signing out twice is not an error. */
export const POST: APIRoute = async (ctx) => {
  try {
    const { user, session } = ctx.locals;
    await endSession(ctx.cookies, session?.id);
    if (user) await audit(getDb(), { actorId: user.id, action: 'auth.sign_out', targetType: 'user', targetId: user.id, details: {} });
    return new Response(null, { status: 204, headers: { 'cache-control': 'no-store' } });
  } catch (err) {
    return errorResponse(err);
  }
};
