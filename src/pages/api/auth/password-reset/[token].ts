import type { APIRoute } from 'astro';
import { getDb } from '~/server/db/client';
import { json } from '~/server/http';
import { errorResponse } from '~/server/auth/errors';
import { readJson, resetSchema } from '~/server/auth/validation';
import { completePasswordReset } from '~/server/auth/passwordReset';

/** POST {password} → 200; 404 unknown link, 410 used or expired; every session of the account ends. */
export const POST: APIRoute = async (ctx) => {
  try {
    const { password } = await readJson(ctx.request, resetSchema);
    const { email } = await completePasswordReset(getDb(), ctx.params.token, password);
    return json({ ok: true, email, message: 'Password changed. Sign in with the new password.' });
  } catch (err) {
    return errorResponse(err);
  }
};
