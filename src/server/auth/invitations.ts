import { and, asc, eq, gt, isNull, ne } from 'drizzle-orm';
import type { Db } from '../db/client';
import { invitations, users, type Role } from '../db/schema';
import { newId } from '../seed';
import { audit } from '../audit';
import { sendTemplate, MailError } from '../mail/mailer';
import { AuthError } from './errors';
import { formatWhen } from './format';
import { hashPassword } from './password';
import { ROLE_DUTY, ROLE_LABEL } from './roles';
import { looksLikeToken, newToken, tokenHash } from './tokens';
import type { SessionUser } from './types';

export const INVITATION_DAYS = 7;

export interface InvitationSummary {
  id: number;
  email: string;
  role: Role;
  invitedBy: string;
  expiresAt: string;
  createdAt: string;
}

/** Invitations not yet accepted, replaced or expired, oldest first. */
export async function pendingInvitations(db: Db): Promise<InvitationSummary[]> {
  const rows = await db
    .select({ id: invitations.id, email: invitations.email, role: invitations.role, invitedBy: users.name, expiresAt: invitations.expiresAt, createdAt: invitations.createdAt })
    .from(invitations)
    .innerJoin(users, eq(users.id, invitations.invitedById))
    .where(and(isNull(invitations.acceptedAt), isNull(invitations.revokedAt), gt(invitations.expiresAt, new Date())))
    .orderBy(asc(invitations.createdAt));
  return rows.map((r) => ({ ...r, expiresAt: r.expiresAt.toISOString(), createdAt: r.createdAt.toISOString() }));
}

/**
 * Invite someone: a one-time link valid for INVITATION_DAYS, e-mailed to them. A newer invitation to
 * the same address replaces older pending ones — but only once the e-mail went out, so a mail
 * failure leaves the earlier invitation as it was.
 */
export async function createInvitation(db: Db, actor: SessionUser, input: { email: string; role: Role }, baseUrl: string): Promise<InvitationSummary> {
  const [existing] = await db.select({ id: users.id }).from(users).where(eq(users.email, input.email)).limit(1);
  if (existing) {
    throw new AuthError(409, 'user_exists', `${input.email} already has a Platewright account; change its role in the table instead.`, { email: 'This address already has an account.' });
  }
  const token = newToken();
  const expiresAt = new Date(Date.now() + INVITATION_DAYS * 24 * 3600 * 1000);
  const [row] = await db
    .insert(invitations)
    .values({ email: input.email, role: input.role, tokenHash: tokenHash(token), invitedById: actor.id, expiresAt })
    .$returningId();
  try {
    await sendTemplate(input.email, 'invitation', {
      inviterName: actor.name,
      roleLabel: ROLE_LABEL[input.role],
      roleDuty: ROLE_DUTY[input.role],
      link: `${baseUrl}/invite/${token}`,
      expiresAt: formatWhen(expiresAt),
    });
  } catch (err) {
    await db.delete(invitations).where(eq(invitations.id, row.id));
    const reason = err instanceof MailError ? err.message : 'the mail server could not be reached';
    throw new AuthError(502, 'mail_failed', `The invitation could not be e-mailed: ${reason}. Nothing was sent; try again.`);
  }
  await db.transaction(async (tx) => {
    await tx
      .update(invitations)
      .set({ revokedAt: new Date() })
      .where(and(eq(invitations.email, input.email), ne(invitations.id, row.id), isNull(invitations.acceptedAt), isNull(invitations.revokedAt)));
    await audit(tx, { actorId: actor.id, action: 'user.invited', targetType: 'invitation', targetId: String(row.id), details: { email: input.email, role: input.role } });
  });
  return { id: row.id, email: input.email, role: input.role, invitedBy: actor.name, expiresAt: expiresAt.toISOString(), createdAt: new Date().toISOString() };
}

export type InvitationLookup =
  | { ok: true; invitation: { id: number; email: string; role: Role; expiresAt: Date; invitedBy: string } }
  | { ok: false; error: AuthError };

/** What an invitation link stands for, or why it no longer works. */
export async function lookUpInvitation(db: Db, token: string | undefined): Promise<InvitationLookup> {
  const notFound = new AuthError(404, 'invite_not_found', 'This invitation link is not valid. Check that the whole link was copied, or ask your admin for a new invitation.');
  if (!looksLikeToken(token)) return { ok: false, error: notFound };
  const [row] = await db
    .select({ id: invitations.id, email: invitations.email, role: invitations.role, expiresAt: invitations.expiresAt, acceptedAt: invitations.acceptedAt, revokedAt: invitations.revokedAt, invitedBy: users.name })
    .from(invitations)
    .innerJoin(users, eq(users.id, invitations.invitedById))
    .where(eq(invitations.tokenHash, tokenHash(token)))
    .limit(1);
  if (!row) return { ok: false, error: notFound };
  if (row.acceptedAt) return { ok: false, error: new AuthError(410, 'invite_used', 'This invitation has already been used. Sign in with the account it created, or ask your admin for a new invitation.') };
  if (row.revokedAt) return { ok: false, error: new AuthError(410, 'invite_replaced', 'A newer invitation was sent to this address; use the link in the latest e-mail.') };
  if (row.expiresAt.getTime() <= Date.now()) {
    return { ok: false, error: new AuthError(410, 'invite_expired', `This invitation expired on ${formatWhen(row.expiresAt)}. Ask your admin for a new one.`) };
  }
  return { ok: true, invitation: { id: row.id, email: row.email, role: row.role, expiresAt: row.expiresAt, invitedBy: row.invitedBy } };
}

/** Accept an invitation: creates the user with the invited role. The link works exactly once. */
export async function acceptInvitation(db: Db, token: string | undefined, input: { name: string; password: string }): Promise<SessionUser> {
  const found = await lookUpInvitation(db, token);
  if (!found.ok) throw found.error;
  const inv = found.invitation;
  const passwordHash = await hashPassword(input.password);
  const userId = newId();
  return db.transaction(async (tx) => {
    const [taken] = await tx.select({ id: users.id }).from(users).where(eq(users.email, inv.email)).limit(1);
    if (taken) throw new AuthError(409, 'user_exists', `${inv.email} already has an account; sign in instead.`);
    await tx.insert(users).values({ id: userId, email: inv.email, name: input.name, role: inv.role, active: true, passwordHash });
    // Claim the invitation only if it is still open: a second use of the same link finds nothing to claim.
    const [result] = await tx
      .update(invitations)
      .set({ acceptedAt: new Date(), acceptedUserId: userId })
      .where(and(eq(invitations.id, inv.id), isNull(invitations.acceptedAt), isNull(invitations.revokedAt), gt(invitations.expiresAt, new Date())));
    if (result.affectedRows !== 1) throw new AuthError(410, 'invite_used', 'This invitation has already been used.');
    await audit(tx, { actorId: userId, action: 'invite.accepted', targetType: 'invitation', targetId: String(inv.id), details: { email: inv.email, role: inv.role, userId } });
    return { id: userId, email: inv.email, name: input.name, role: inv.role };
  });
}
