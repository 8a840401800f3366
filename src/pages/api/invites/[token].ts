import type { APIRoute } from 'astro';
import { getDb } from '~/server/db/client';
import { json } from '~/server/http';
import { errorResponse } from '~/server/auth/errors';
import { acceptInviteSchema, readJson } from '~/server/auth/validation';
import { acceptInvitation, lookUpInvitation } from '~/server/auth/invitations';
import { endSession, startSession } from '~/server/auth/session';

/** GET → what the invitation is for (e-mail, role, expiry) or why it no longer works (404 / 410). */
export const GET: APIRoute = async (ctx) => {
  try {
    const found = await lookUpInvitation(getDb(), ctx.params.token);
    if (!found.ok) throw found.error;
    const { email, role, expiresAt, invitedBy } = found.invitation;
    return json({ invite: { email, role, invitedBy, expiresAt: expiresAt.toISOString() } });
  } catch (err) {
    return errorResponse(err);
  }
};

/** POST {name,password} → 201 {user} + session cookie. The link works once. */
export const POST: APIRoute = async (ctx) => {
  try {
    const input = await readJson(ctx.request, acceptInviteSchema);
    const user = await acceptInvitation(getDb(), ctx.params.token, input);
    if (ctx.locals.session) await endSession(ctx.cookies, ctx.locals.session.id);
    await startSession(ctx.cookies, user.id);
    return json({ user }, 201);
  } catch (err) {
    return errorResponse(err);
  }
};
