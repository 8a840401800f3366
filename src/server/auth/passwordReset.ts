import { and, eq, gt, isNull } from 'drizzle-orm';
import type { Db } from '../db/client';
import { passwordResetTokens, sessions, signInAttempts, users } from '../db/schema';
import { audit } from '../audit';
import { sendTemplate } from '../mail/mailer';
import { AuthError } from './errors';
import { formatWhen } from './format';
import { hashPassword } from './password';
import { looksLikeToken, newToken, tokenHash } from './tokens';

export const RESET_MINUTES = 60;

/**
 * Someone asked for a reset link for this address. Sends one only to an active account, and answers
 * the same way either way (no account enumeration): the caller always says "if an account exists…".
 * The e-mail is sent in the background so a known address does not take longer to answer.
 */
export async function requestPasswordReset(db: Db, email: string, baseUrl: string, ip: string | null): Promise<void> {
  const [user] = await db.select({ id: users.id, name: users.name, active: users.active }).from(users).where(eq(users.email, email)).limit(1);
  if (!user || !user.active) {
    await audit(db, { actorId: null, action: 'auth.password_reset_requested', targetType: 'user', targetId: user?.id ?? 'unknown', details: { email, sent: false, ip } });
    return;
  }
  const token = newToken();
  const expiresAt = new Date(Date.now() + RESET_MINUTES * 60 * 1000);
  await db.transaction(async (tx) => {
    await tx.insert(passwordResetTokens).values({ userId: user.id, tokenHash: tokenHash(token), expiresAt });
    await audit(tx, { actorId: null, action: 'auth.password_reset_requested', targetType: 'user', targetId: user.id, details: { email, sent: true, ip } });
  });
  void sendTemplate(email, 'password-reset', {
    name: user.name,
    email,
    link: `${baseUrl}/reset-password/${token}`,
    validMinutes: RESET_MINUTES,
    expiresAt: formatWhen(expiresAt),
  }).catch((err: unknown) => {
    console.error(`[platewright] password reset e-mail for user ${user.id} not sent: ${err instanceof Error ? err.message : String(err)}`);
  });
}

export type ResetLookup = { ok: true; reset: { id: number; userId: string; email: string } } | { ok: false; error: AuthError };

export async function lookUpPasswordReset(db: Db, token: string | undefined): Promise<ResetLookup> {
  const notFound = new AuthError(404, 'reset_not_found', 'This password link is not valid. Check that the whole link was copied, or ask for a new one.');
  if (!looksLikeToken(token)) return { ok: false, error: notFound };
  const [row] = await db
    .select({ id: passwordResetTokens.id, userId: passwordResetTokens.userId, expiresAt: passwordResetTokens.expiresAt, usedAt: passwordResetTokens.usedAt, email: users.email, active: users.active })
    .from(passwordResetTokens)
    .innerJoin(users, eq(users.id, passwordResetTokens.userId))
    .where(eq(passwordResetTokens.tokenHash, tokenHash(token)))
    .limit(1);
  if (!row || !row.active) return { ok: false, error: notFound };
  if (row.usedAt) return { ok: false, error: new AuthError(410, 'reset_used', 'This password link has already been used. Ask for a new one if you need to change the password again.') };
  if (row.expiresAt.getTime() <= Date.now()) {
    return { ok: false, error: new AuthError(410, 'reset_expired', `This password link expired at ${formatWhen(row.expiresAt)}. Ask for a new one.`) };
  }
  return { ok: true, reset: { id: row.id, userId: row.userId, email: row.email } };
}

/** Set the new password; the link is spent, every session of the account ends, the failed-attempt count clears. */
export async function completePasswordReset(db: Db, token: string | undefined, password: string): Promise<{ email: string }> {
  const found = await lookUpPasswordReset(db, token);
  if (!found.ok) throw found.error;
  const { reset } = found;
  const passwordHash = await hashPassword(password);
  await db.transaction(async (tx) => {
    const [claimed] = await tx
      .update(passwordResetTokens)
      .set({ usedAt: new Date() })
      .where(and(eq(passwordResetTokens.id, reset.id), isNull(passwordResetTokens.usedAt), gt(passwordResetTokens.expiresAt, new Date())));
    if (claimed.affectedRows !== 1) throw new AuthError(410, 'reset_used', 'This password link has already been used.');
    await tx.update(users).set({ passwordHash }).where(eq(users.id, reset.userId));
    // Any other open link for this account is spent too.
    await tx.update(passwordResetTokens).set({ usedAt: new Date() }).where(and(eq(passwordResetTokens.userId, reset.userId), isNull(passwordResetTokens.usedAt)));
    await tx.delete(sessions).where(eq(sessions.userId, reset.userId));
    await tx.delete(signInAttempts).where(and(eq(signInAttempts.email, reset.email), eq(signInAttempts.succeeded, false)));
    await audit(tx, { actorId: reset.userId, action: 'auth.password_reset_done', targetType: 'user', targetId: reset.userId, details: { email: reset.email } });
  });
  return { email: reset.email };
}
