import { randomBytes } from 'node:crypto';
import type { Db } from '../../src/server/db/client';
import { users, type Role } from '../../src/server/db/schema';
import type { SessionUser } from '../../src/server/auth/types';
import { newId } from '../../src/server/seed';
import { hashPassword } from '../../src/server/auth/password';

export const TEST_PASSWORD = 'correct horse battery staple';
let hashed: Promise<string> | undefined;

/** A fresh user of a role with a unique invented e-mail; returns the session view of it. */
export async function makeUser(db: Db, role: Role, label: string = role): Promise<SessionUser> {
  const id = newId();
  const email = `${label}-${randomBytes(4).toString('hex')}@example.test`;
  hashed ??= hashPassword(TEST_PASSWORD);
  const name = `${label[0].toUpperCase()}${label.slice(1)} Tester`;
  await db.insert(users).values({ id, email, name, role, active: true, passwordHash: await hashed });
  return { id, email, name, role };
}
