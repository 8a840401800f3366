import type { APIRoute } from 'astro';
import { getDb } from '~/server/db/client';
import { json } from '~/server/http';
import { requireRole } from '~/server/auth/guard';
import { errorResponse } from '~/server/auth/errors';
import { listUsers } from '~/server/auth/users';

/** GET → {users:[{id,email,name,role,active,lastSignInAt,createdAt}]} — admins only. */
export const GET: APIRoute = async ({ locals }) => {
  const g = requireRole(locals, 'admin');
  if (!g.ok) return g.response;
  try {
    return json({ users: await listUsers(getDb()) });
  } catch (err) {
    return errorResponse(err);
  }
};
