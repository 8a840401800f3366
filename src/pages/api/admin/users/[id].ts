import type { APIRoute } from 'astro';
import { getDb } from '~/server/db/client';
import { json } from '~/server/http';
import { requireRole } from '~/server/auth/guard';
import { errorResponse } from '~/server/auth/errors';
import { readJson, userPatchSchema } from '~/server/auth/validation';
import { updateUser } from '~/server/auth/users';

/**
 * PATCH {role?, active?} → 200 {user}. Deactivating ends that user's sessions at once; the last
 * active admin cannot be demoted or deactivated (409). Admins only.
 */
export const PATCH: APIRoute = async ({ locals, params, request }) => {
  const g = requireRole(locals, 'admin');
  if (!g.ok) return g.response;
  try {
    const patch = await readJson(request, userPatchSchema);
    return json({ user: await updateUser(getDb(), g.user, params.id ?? '', patch) });
  } catch (err) {
    return errorResponse(err);
  }
};
