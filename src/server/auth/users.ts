import { and, asc, desc, eq, ne } from 'drizzle-orm';
import type { Db } from '../db/client';
import { sessions, users, type Role } from '../db/schema';
import { audit } from '../audit';
import { AuthError } from './errors';
import { hashPassword, verifyPassword } from './password';
import { endOtherSessions } from './session';
import type { SessionUser } from './types';

/** A user as the admin pages and endpoints show them (never the password hash). */
export interface UserSummary {
  id: string;
  email: string;
  name: string;
  role: Role;
  active: boolean;
  lastSignInAt: string | null;
  createdAt: string;
}

const summaryColumns = {
  id: users.id,
  email: users.email,
  name: users.name,
  role: users.role,
  active: users.active,
  lastSignInAt: users.lastSignInAt,
  createdAt: users.createdAt,
};

function toSummary(r: { id: string; email: string; name: string; role: Role; active: boolean; lastSignInAt: Date | null; createdAt: Date }): UserSummary {
  return { ...r, active: Boolean(r.active), lastSignInAt: r.lastSignInAt?.toISOString() ?? null, createdAt: r.createdAt.toISOString() };
}

export async function listUsers(db: Db): Promise<UserSummary[]> {
  const rows = await db.select(summaryColumns).from(users).orderBy(desc(users.active), asc(users.name), asc(users.email));
  return rows.map(toSummary);
}

/**
 * Change a user's role and/or active flag. Deactivating ends their sessions in the same
 * transaction. Refuses (409) to demote or deactivate the last active admin.
 */
export async function updateUser(db: Db, actor: SessionUser, userId: string, patch: { role?: Role; active?: boolean }): Promise<UserSummary> {
  return db.transaction(async (tx) => {
    // Lock every active admin row first, so two admins cannot demote each other at the same moment.
    const admins = await tx.select({ id: users.id }).from(users).where(and(eq(users.role, 'admin'), eq(users.active, true))).for('update');
    const [target] = await tx.select(summaryColumns).from(users).where(eq(users.id, userId)).for('update');
    if (!target) throw new AuthError(404, 'user_not_found', 'There is no user with that id.');
    const before = toSummary(target);
    const role = patch.role ?? before.role;
    const active = patch.active ?? before.active;
    const losesAdmin = before.role === 'admin' && before.active && (role !== 'admin' || !active);
    if (losesAdmin && admins.filter((a) => a.id !== userId).length === 0) {
      throw new AuthError(
        409,
        'last_admin',
        `${before.name} is the last active admin, so nothing was changed. Make someone else an admin first.`,
        patch.role !== undefined ? { role: 'The shop needs at least one active admin.' } : { active: 'The shop needs at least one active admin.' },
      );
    }
    if (role === before.role && active === before.active) return before;
    await tx.update(users).set({ role, active }).where(eq(users.id, userId));
    if (role !== before.role) {
      await audit(tx, { actorId: actor.id, action: 'user.role_changed', targetType: 'user', targetId: userId, details: { email: before.email, from: before.role, to: role } });
    }
    if (active !== before.active) {
      if (!active) await tx.delete(sessions).where(eq(sessions.userId, userId));
      await audit(tx, { actorId: actor.id, action: active ? 'user.activated' : 'user.deactivated', targetType: 'user', targetId: userId, details: { email: before.email } });
    }
    return { ...before, role, active };
  });
}

export async function renameSelf(db: Db, user: SessionUser, name: string): Promise<void> {
  await db.update(users).set({ name }).where(eq(users.id, user.id));
  await audit(db, { actorId: user.id, action: 'user.name_changed', targetType: 'user', targetId: user.id, details: { from: user.name, to: name } });
}

/** Change one's own password (the current one must be right); every other session of the user ends. */
export async function changeOwnPassword(db: Db, user: SessionUser, sessionId: string, currentPassword: string, newPassword: string): Promise<void> {
  const [row] = await db.select({ passwordHash: users.passwordHash }).from(users).where(eq(users.id, user.id)).limit(1);
  if (!row?.passwordHash || !(await verifyPassword(row.passwordHash, currentPassword))) {
    throw new AuthError(400, 'wrong_password', 'Your current password is not right; nothing was changed.', { currentPassword: 'That is not your current password.' });
  }
  if (currentPassword === newPassword) {
    throw new AuthError(400, 'same_password', 'The new password is the same as the current one.', { newPassword: 'Choose a password different from the current one.' });
  }
  const passwordHash = await hashPassword(newPassword);
  await db.update(users).set({ passwordHash }).where(eq(users.id, user.id));
  await endOtherSessions(user.id, sessionId);
  await audit(db, { actorId: user.id, action: 'auth.password_changed', targetType: 'user', targetId: user.id, details: {} });
}

export async function findUserByEmail(db: Db, email: string) {
  const [u] = await db.select(summaryColumns).from(users).where(eq(users.email, email)).limit(1);
  return u ? toSummary(u) : null;
}

export async function otherActiveAdmins(db: Db, userId: string): Promise<number> {
  const rows = await db.select({ id: users.id }).from(users).where(and(eq(users.role, 'admin'), eq(users.active, true), ne(users.id, userId)));
  return rows.length;
}
