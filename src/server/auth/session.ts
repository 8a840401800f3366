import type { AstroCookies } from 'astro';
import type { Cookie } from 'lucia';
import { lucia, SESSION_COOKIE } from './lucia';
import type { SessionInfo, SessionUser } from './types';

export { SESSION_COOKIE };

function writeCookie(cookies: AstroCookies, cookie: Cookie): void {
  cookies.set(cookie.name, cookie.value, cookie.attributes as Parameters<AstroCookies['set']>[2]);
}

/** Start a session for the user and set its cookie (httpOnly, SameSite=Lax, Secure in production). */
export async function startSession(cookies: AstroCookies, userId: string): Promise<SessionInfo> {
  const session = await lucia().createSession(userId, {});
  writeCookie(cookies, lucia().createSessionCookie(session.id));
  return { id: session.id, expiresAt: session.expiresAt };
}

export interface Identified {
  user: SessionUser | null;
  session: SessionInfo | null;
}

/**
 * Who holds this session cookie. Extends a session past half its life (sliding expiry) and
 * re-sends the cookie; blanks the cookie of an unknown, expired or deactivated session.
 */
export async function identify(cookies: AstroCookies): Promise<Identified> {
  const sessionId = cookies.get(SESSION_COOKIE)?.value;
  if (!sessionId) return { user: null, session: null };
  const { session, user } = await lucia().validateSession(sessionId);
  if (!session || !user) {
    writeCookie(cookies, lucia().createBlankSessionCookie());
    return { user: null, session: null };
  }
  if (!user.active) {
    await lucia().invalidateUserSessions(user.id);
    writeCookie(cookies, lucia().createBlankSessionCookie());
    return { user: null, session: null };
  }
  if (session.fresh) writeCookie(cookies, lucia().createSessionCookie(session.id));
  return {
    user: { id: user.id, email: user.email, name: user.name, role: user.role },
    session: { id: session.id, expiresAt: session.expiresAt },
  };
}

/** End one session and blank its cookie. */
export async function endSession(cookies: AstroCookies, sessionId: string | undefined | null): Promise<void> {
  if (sessionId) await lucia().invalidateSession(sessionId);
  writeCookie(cookies, lucia().createBlankSessionCookie());
}

/** End every session of a user at once (deactivation, password reset). */
export async function endUserSessions(userId: string): Promise<void> {
  await lucia().invalidateUserSessions(userId);
}

/** End every session of a user except the one in use (password change from the account page). */
export async function endOtherSessions(userId: string, keepSessionId: string): Promise<void> {
  for (const s of await lucia().getUserSessions(userId)) {
    if (s.id !== keepSessionId) await lucia().invalidateSession(s.id);
  }
}
