import type { APIRoute } from 'astro';
import { getDb } from '~/server/db/client';
import { json } from '~/server/http';
import { requireRole } from '~/server/auth/guard';
import { errorResponse } from '~/server/auth/errors';
import { accountSchema, readJson } from '~/server/auth/validation';
import { renameSelf } from '~/server/auth/users';

/** PATCH {name} → 200 {user}: the signed-in user's own display name. */
export const PATCH: APIRoute = async ({ locals, request }) => {
  const g = requireRole(locals);
  if (!g.ok) return g.response;
  try {
    const { name } = await readJson(request, accountSchema);
    await renameSelf(getDb(), g.user, name);
    return json({ user: { ...g.user, name } });
  } catch (err) {
    return errorResponse(err);
  }
};
