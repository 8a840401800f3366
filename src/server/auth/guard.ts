import type { AstroGlobal, APIContext } from 'astro';
import type { Role } from '../db/schema';
import type { SessionUser } from './types';
import { json, jsonError } from '../http';

const databaseUnavailable = () =>
  json({ error: { code: 'database_unavailable', message: 'The database is not reachable right now; nothing was changed. Try again in a moment.' } }, 503, { 'retry-after': '5' });

type WithLocals = Pick<APIContext, 'locals'>;

export type Guarded = { ok: true; user: SessionUser } | { ok: false; response: Response };

/**
 * The one access helper every endpoint uses: signed in (401) and, when roles are given, one of
 * them (403). `const g = requireRole(ctx.locals, 'engineer', 'admin'); if (!g.ok) return g.response;`
 */
export function requireRole(locals: WithLocals['locals'], ...roles: Role[]): Guarded {
  const user = locals.user;
  if (!user && locals.sessionUnavailable) return { ok: false, response: databaseUnavailable() };
  if (!user) return { ok: false, response: jsonError(401, 'unauthenticated', 'Sign in first.') };
  if (roles.length > 0 && !roles.includes(user.role)) {
    return { ok: false, response: jsonError(403, 'forbidden', `This needs the role ${roles.join(' or ')}; you are signed in as ${user.role}.`) };
  }
  return { ok: true, user };
}

/**
 * The same rule for pages: anonymous → redirect to /sign-in?next=…, wrong role → the 403 page.
 * `const g = requirePageRole(Astro, 'admin'); if (!g.ok) return g.response;`
 */
export function requirePageRole(astro: Pick<AstroGlobal, 'locals' | 'url' | 'redirect'>, ...roles: Role[]): Guarded {
  const user = astro.locals.user;
  if (!user && astro.locals.sessionUnavailable) {
    return {
      ok: false,
      response: new Response('<!doctype html><meta charset="utf-8"><title>Platewright — database unavailable</title><p style="font-family:sans-serif">The database is not answering right now; nothing was changed. Try again in a moment.</p>', {
        status: 503,
        headers: { 'content-type': 'text/html; charset=utf-8', 'retry-after': '5' },
      }),
    };
  }
  if (!user) {
    const next = astro.url.pathname + astro.url.search;
    return { ok: false, response: astro.redirect(`/sign-in?next=${encodeURIComponent(next)}`, 302) };
  }
  if (roles.length > 0 && !roles.includes(user.role)) {
    return { ok: false, response: astro.redirect(`/forbidden?need=${encodeURIComponent(roles.join(','))}`, 302) };
  }
  return { ok: true, user };
}
