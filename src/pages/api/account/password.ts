import type { APIRoute } from 'astro';
import { getDb } from '~/server/db/client';
import { json } from '~/server/http';
import { requireRole } from '~/server/auth/guard';
import { errorResponse } from '~/server/auth/errors';
import { passwordChangeSchema, readJson } from '~/server/auth/validation';
import { changeOwnPassword } from '~/server/auth/users';

/** POST {currentPassword,newPassword} → 200; every other session of the user ends. */
export const POST: APIRoute = async ({ locals, request }) => {
  const g = requireRole(locals);
  if (!g.ok) return g.response;
  try {
    const input = await readJson(request, passwordChangeSchema);
    await changeOwnPassword(getDb(), g.user, locals.session!.id, input.currentPassword, input.newPassword);
    return json({ ok: true, message: 'Password changed. Other devices signed in to this account were signed out.' });
  } catch (err) {
    return errorResponse(err);
  }
};
