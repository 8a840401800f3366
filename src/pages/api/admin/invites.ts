import type { APIRoute } from 'astro';
import { getDb } from '~/server/db/client';
import { json } from '~/server/http';
import { requireRole } from '~/server/auth/guard';
import { errorResponse } from '~/server/auth/errors';
import { inviteSchema, readJson } from '~/server/auth/validation';
import { createInvitation, pendingInvitations } from '~/server/auth/invitations';
import { linkBase } from '~/server/auth/request';

/** GET → {invites:[…]} still open. Admins only. */
export const GET: APIRoute = async ({ locals }) => {
  const g = requireRole(locals, 'admin');
  if (!g.ok) return g.response;
  try {
    return json({ invites: await pendingInvitations(getDb()) });
  } catch (err) {
    return errorResponse(err);
  }
};

/** POST {email, role} → 201 {invite}; the one-time link (7 days) goes out by e-mail. Admins only. */
export const POST: APIRoute = async ({ locals, request, url }) => {
  const g = requireRole(locals, 'admin');
  if (!g.ok) return g.response;
  try {
    const input = await readJson(request, inviteSchema);
    return json({ invite: await createInvitation(getDb(), g.user, input, linkBase(url)) }, 201);
  } catch (err) {
    return errorResponse(err);
  }
};
