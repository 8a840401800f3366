import { and, count, desc, eq, gt, lt, min } from 'drizzle-orm';
import { randomBytes } from 'node:crypto';
import type { Db } from '../db/client';
import { sessions, signInAttempts, users } from '../db/schema';
import { audit } from '../audit';
import { AuthError } from './errors';
import { hashPassword, verifyPassword } from './password';
import type { SessionUser } from './types';

export const MAX_FAILED_SIGN_INS = 5;
export const FAILED_SIGN_IN_WINDOW_MS = 15 * 60 * 1000;

/** One message for a wrong password, an unknown address and a deactivated account. */
export const SIGN_IN_REFUSED = 'That e-mail and password do not match an active Platewright account.';

let dummyHash: Promise<string> | undefined;
/** Verify against a throw-away hash for unknown addresses, so they take as long as known ones. */
function dummy(): Promise<string> {
  dummyHash ??= hashPassword(randomBytes(16).toString('hex'));
  return dummyHash;
}

let lastPrune = 0;
/** At most hourly: forget attempts older than a day and sessions past their expiry. */
async function prune(db: Db, now: Date): Promise<void> {
  if (now.getTime() - lastPrune < 3600_000) return;
  lastPrune = now.getTime();
  await db.delete(signInAttempts).where(lt(signInAttempts.at, new Date(now.getTime() - 24 * 3600_000)));
  await db.delete(sessions).where(lt(sessions.expiresAt, now));
}

/** Failed attempts for this address in the window, counting only those after its last success. */
async function recentFailures(db: Db, email: string, now: Date): Promise<{ failures: number; oldest: Date | null }> {
  let since = new Date(now.getTime() - FAILED_SIGN_IN_WINDOW_MS);
  const [lastOk] = await db
    .select({ at: signInAttempts.at })
    .from(signInAttempts)
    .where(and(eq(signInAttempts.email, email), eq(signInAttempts.succeeded, true), gt(signInAttempts.at, since)))
    .orderBy(desc(signInAttempts.at))
    .limit(1);
  if (lastOk) since = lastOk.at;
  const [row] = await db
    .select({ failures: count(), oldest: min(signInAttempts.at) })
    .from(signInAttempts)
    .where(and(eq(signInAttempts.email, email), eq(signInAttempts.succeeded, false), gt(signInAttempts.at, since)));
  return { failures: Number(row?.failures ?? 0), oldest: row?.oldest ? new Date(row.oldest) : null };
}

/**
 * Check an e-mail + password. Refuses (401, one message for every reason) or rate-limits (429 after
 * MAX_FAILED_SIGN_INS failures for one address in 15 minutes). Records the attempt and an audit event.
 */
export async function signIn(db: Db, input: { email: string; password: string; ip?: string | null }): Promise<SessionUser> {
  const email = input.email;
  const now = new Date();
  await prune(db, now);
  const { failures, oldest } = await recentFailures(db, email, now);
  const [user] = await db.select().from(users).where(eq(users.email, email)).limit(1);
  if (failures >= MAX_FAILED_SIGN_INS) {
    const retryMs = (oldest ? oldest.getTime() + FAILED_SIGN_IN_WINDOW_MS : now.getTime() + FAILED_SIGN_IN_WINDOW_MS) - now.getTime();
    const minutes = Math.max(1, Math.ceil(retryMs / 60000));
    await audit(db, { actorId: null, action: 'auth.sign_in_failed', targetType: 'user', targetId: user?.id ?? 'unknown', details: { email, reason: 'rate_limited' } });
    throw new AuthError(
      429,
      'rate_limited',
      `Too many failed sign-ins for ${email}. Try again in ${minutes} minute${minutes === 1 ? '' : 's'}, or choose a new password with “Forgot your password?”.`,
      undefined,
      { 'retry-after': String(Math.max(1, Math.ceil(retryMs / 1000))) },
    );
  }

  const passwordOk = user?.passwordHash ? await verifyPassword(user.passwordHash, input.password) : (await verifyPassword(await dummy(), input.password), false);
  const reason = !user ? 'unknown_email' : !passwordOk ? 'wrong_password' : !user.active ? 'inactive' : null;
  await db.insert(signInAttempts).values({ email, succeeded: reason === null, ip: input.ip?.slice(0, 64) ?? null, at: now });
  if (reason !== null || !user) {
    await audit(db, { actorId: null, action: 'auth.sign_in_failed', targetType: 'user', targetId: user?.id ?? 'unknown', details: { email, reason } });
    throw new AuthError(401, 'invalid_credentials', SIGN_IN_REFUSED);
  }
  await db.update(users).set({ lastSignInAt: now }).where(eq(users.id, user.id));
  await audit(db, { actorId: user.id, action: 'auth.sign_in', targetType: 'user', targetId: user.id, details: { email } });
  return { id: user.id, email: user.email, name: user.name, role: user.role };
}
