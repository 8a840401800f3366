import type { APIRoute } from 'astro';
import { json } from '~/server/http';
import { requireRole } from '~/server/auth/guard';

/** GET → 200 {user} for the signed-in caller, 401 otherwise. */
export const GET: APIRoute = async ({ locals }) => {
  const g = requireRole(locals);
  if (!g.ok) return g.response;
  return json({ user: g.user, session: { expiresAt: locals.session?.expiresAt.toISOString() ?? null } });
};
