import { eq } from 'drizzle-orm';
import { randomBytes } from 'node:crypto';
import type { Db } from './db/client';
import { projects, users, type Role } from './db/schema';
import { hashPassword } from './auth/password';

/**
 * The invented demo shop. Every name here is made up: the shop, the people, the vehicles.
 * Idempotent: a second run finds what exists and changes nothing (it never wipes).
 */
export const DEMO_USERS: readonly { email: string; name: string; role: Role }[] = [
  { email: 'designer@example.test', name: 'Dana Ortley', role: 'designer' },
  { email: 'engineer@example.test', name: 'Ravi Halden', role: 'engineer' },
  { email: 'machinist@example.test', name: 'Mo Treadwell', role: 'machinist' },
  { email: 'admin@example.test', name: 'Sam Okonkwo-Reyes', role: 'admin' },
];

export const DEMO_PROJECT = {
  name: 'Fennick coupe swap',
  swapDescription:
    'Invented demo: a Harrowgate H4 2.3 L inline-four into a Fennick coupe, behind a Corvane C5 five-speed — ' +
    'the plate spaces the box back and re-centres its input shaft on the crank axis.',
};

export function newId(): string {
  return randomBytes(15).toString('base64url');
}

export interface SeedResult {
  created: string[];
}

export async function seedDemo(db: Db, password: string): Promise<SeedResult> {
  const created: string[] = [];
  let passwordHash: string | undefined;
  for (const u of DEMO_USERS) {
    const [existing] = await db.select({ id: users.id }).from(users).where(eq(users.email, u.email)).limit(1);
    if (existing) continue;
    passwordHash ??= await hashPassword(password);
    await db.insert(users).values({ id: newId(), email: u.email, name: u.name, role: u.role, active: true, passwordHash });
    created.push(`user ${u.email}`);
  }
  const [designer] = await db.select({ id: users.id }).from(users).where(eq(users.email, 'designer@example.test')).limit(1);
  const [project] = await db.select({ id: projects.id }).from(projects).where(eq(projects.name, DEMO_PROJECT.name)).limit(1);
  if (!project && designer) {
    await db.insert(projects).values({ ...DEMO_PROJECT, ownerId: designer.id });
    created.push(`project ${DEMO_PROJECT.name}`);
  }
  return { created };
}
