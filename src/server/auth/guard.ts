import type { AstroGlobal, APIContext } from 'astro';
import type { Role } from '../db/schema';
import type { SessionUser } from './types';
import { jsonError } from '../http';

type WithLocals = Pick<APIContext, 'locals'>;

export type Guarded = { ok: true; user: SessionUser } | { ok: false; response: Response };

/**
 * The one access helper every endpoint uses: signed in (401) and, when roles are given, one of
 * them (403). `const g = requireRole(ctx.locals, 'engineer', 'admin'); if (!g.ok) return g.response;`
 */
export function requireRole(locals: WithLocals['locals'], ...roles: Role[]): Guarded {
  const user = locals.user;
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
  if (!user) {
    const next = astro.url.pathname + astro.url.search;
    return { ok: false, response: astro.redirect(`/sign-in?next=${encodeURIComponent(next)}`, 302) };
  }
  if (roles.length > 0 && !roles.includes(user.role)) {
    return { ok: false, response: astro.redirect(`/forbidden?need=${encodeURIComponent(roles.join(','))}`, 302) };
  }
  return { ok: true, user };
}
