import { authConfig } from '../config';

/** Base for links in e-mails: APP_URL when set (always in production), else this request's origin. */
export function linkBase(url: URL): string {
  return authConfig().appUrl ?? url.origin;
}

/** The caller's address for the sign-in record; null when the adapter cannot tell. */
export function clientIp(ctx: { clientAddress?: string }): string | null {
  try {
    return ctx.clientAddress ?? null;
  } catch {
    return null;
  }
}

/** Only a path on this site may be a post-sign-in destination (no open redirect). */
export function safeNext(next: string | null | undefined, fallback = '/'): string {
  if (!next || !next.startsWith('/') || next.startsWith('//') || next.startsWith('/\\')) return fallback;
  if (/^\/(sign-in|sign-out)(\/|\?|$)/.test(next)) return fallback;
  return next;
}

/** Whether the local mail catcher's folder is readable by admins (never in production). */
export function capturedMailDir(): string | undefined {
  return authConfig().mailFakeDir;
}

/** Where a role starts after signing in when no page was asked for. */
export function homeFor(role: import('../db/schema').Role): string {
  return { designer: '/projects', engineer: '/review', machinist: '/shop', admin: '/admin/users' }[role];
}
