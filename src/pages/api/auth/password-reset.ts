import type { APIRoute } from 'astro';
import { getDb } from '~/server/db/client';
import { json } from '~/server/http';
import { errorResponse } from '~/server/auth/errors';
import { readJson, resetRequestSchema } from '~/server/auth/validation';
import { requestPasswordReset, RESET_MINUTES } from '~/server/auth/passwordReset';
import { clientIp, linkBase } from '~/server/auth/request';

/** POST {email} → always 202 for a well-formed address, whether or not an account uses it. */
export const POST: APIRoute = async (ctx) => {
  try {
    const { email } = await readJson(ctx.request, resetRequestSchema);
    await requestPasswordReset(getDb(), email, linkBase(ctx.url), clientIp(ctx));
    return json(
      { ok: true, message: `If an active account uses ${email}, a link to choose a new password is on its way. It works once, for ${RESET_MINUTES} minutes.` },
      202,
    );
  } catch (err) {
    return errorResponse(err);
  }
};
