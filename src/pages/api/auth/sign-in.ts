import type { APIRoute } from 'astro';
import { getDb } from '~/server/db/client';
import { json } from '~/server/http';
import { errorResponse } from '~/server/auth/errors';
import { signInSchema, readJson } from '~/server/auth/validation';
import { signIn } from '~/server/auth/signIn';
import { endSession, startSession } from '~/server/auth/session';
import { clientIp } from '~/server/auth/request';

/** POST {email,password} → 200 {user} + session cookie; 401 (one message for every reason); 429 when rate-limited. */
export const POST: APIRoute = async (ctx) => {
  try {
    const input = await readJson(ctx.request, signInSchema);
    const user = await signIn(getDb(), { ...input, ip: clientIp(ctx) });
    if (ctx.locals.session) await endSession(ctx.cookies, ctx.locals.session.id);
    await startSession(ctx.cookies, user.id);
    return json({ user });
  } catch (err) {
    return errorResponse(err);
  }
};
