import type { APIRoute } from 'astro';
import { getDb } from '~/server/db/client';
import { endSession } from '~/server/auth/session';
import { audit } from '~/server/audit';

/** The header's sign-out button (a form POST): end the session, then show the sign-in page. */
export const POST: APIRoute = async (ctx) => {
  const { user, session } = ctx.locals;
  await endSession(ctx.cookies, session?.id);
  if (user) await audit(getDb(), { actorId: user.id, action: 'auth.sign_out', targetType: 'user', targetId: user.id, details: {} });
  return ctx.redirect('/sign-in?signed_out=1', 303);
};

export const GET: APIRoute = ({ redirect }) => redirect('/account', 302);
