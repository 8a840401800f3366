import { eq } from 'drizzle-orm';
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import type { Db } from './db/client';
import { plates, projects, users } from './db/schema';
import type { SessionUser } from './auth/types';
import { createPlate } from './repos/plates';
import { approveRevision, requestChanges, saveRevision, submitRevision, type ReleaseFile } from './repos/revisions';
import type { PlateSpec } from '~/domain';
import { DEMO_PROJECT } from './seed';

type MakeFiles = Parameters<typeof approveRevision>[4];

function demoSpec(): PlateSpec {
  const path = fileURLToPath(new URL('../../templates/plates/demo.json', import.meta.url));
  return JSON.parse(readFileSync(path, 'utf8')) as PlateSpec;
}

async function user(db: Db, email: string): Promise<SessionUser> {
  const [u] = await db.select({ id: users.id, email: users.email, name: users.name, role: users.role }).from(users).where(eq(users.email, email));
  if (!u) throw new Error(`demo user ${email} missing: seed the users first`);
  return u;
}

/**
 * The demo plates, with a real history so every screen has something to show:
 * PW-0001 at revision 3 (rev 1 superseded, rev 2 changes requested, rev 3 released) and
 * PW-0002 with revision 1 in review. Idempotent: skipped when PW-0001 exists.
 */
export async function seedDemoWorkflow(db: Db, makeFiles: MakeFiles): Promise<string[]> {
  const [exists] = await db.select({ id: plates.id }).from(plates).where(eq(plates.partNumber, 'PW-0001'));
  if (exists) return [];
  const [project] = await db.select({ id: projects.id }).from(projects).where(eq(projects.name, DEMO_PROJECT.name));
  if (!project) throw new Error('demo project missing');
  const designer = await user(db, 'designer@example.test');
  const engineer = await user(db, 'engineer@example.test');
  const admin = await user(db, 'admin@example.test');
  const final = demoSpec();

  const p1 = await createPlate(db, designer, project.id, { partNumber: 'PW-0001', title: 'H4 to C5 adapter plate', material: '6061-T651 aluminium' });
  // rev 1: the first layout with a generous edge margin — released for a trial fit, later superseded
  const rev1Spec: PlateSpec = { ...final, outline: { ...final.outline, edgeMarginMm: 16 } } as PlateSpec;
  const r1 = await saveRevision(db, designer, p1.id, { spec: rev1Spec, message: 'First layout from the measured flanges.', parentRevisionId: null });
  await submitRevision(db, designer, r1.id, 'Both patterns measured twice; please check the starter clearance.');
  await approveRevision(db, engineer, r1.id, { comment: 'Released for a trial fit in MDF before cutting aluminium.', waivers: waiversFor(r1.checks) }, makeFiles);
  // rev 2: thickness from the stack-up, but sent back
  const rev2Spec: PlateSpec = { ...final, thicknessMm: final.thicknessMm + 3 };
  const r2 = await saveRevision(db, designer, p1.id, { spec: rev2Spec, message: 'Thicker plate after the trial fit: clutch fork was at the end of its travel.', parentRevisionId: r1.id });
  await submitRevision(db, designer, r2.id);
  await requestChanges(db, engineer, r2.id, 'Too thick for the pilot: the input shaft barely reaches the pilot bearing. Recheck the stack-up and use the stock thickness it asks for.');
  // rev 3: the stack-up's thickness — released
  const r3 = await saveRevision(db, designer, p1.id, { spec: final, message: 'Thickness back to the stack-up value (1/2 in stock); edge margin trimmed to 12 mm after the trial fit.', parentRevisionId: r2.id });
  await submitRevision(db, designer, r3.id);
  await approveRevision(db, engineer, r3.id, { comment: 'Checks reviewed. Release.', waivers: waiversFor(r3.checks) }, makeFiles);

  const p2 = await createPlate(db, designer, project.id, { partNumber: 'PW-0002', title: 'H4 to C5 adapter plate, six-speed variant', material: '6061-T651 aluminium' });
  const v1 = await saveRevision(db, designer, p2.id, { spec: { ...final, thicknessMm: final.thicknessMm }, message: 'Variant for the six-speed bell housing.', parentRevisionId: null });
  await submitRevision(db, designer, v1.id, 'Same engine face as PW-0001; new transmission pattern.');
  void admin;
  return ['PW-0001 rev 1–3', 'PW-0002 rev 1 (in review)'];
}

function waiversFor(checks: unknown) {
  return (Array.isArray(checks) ? checks : [])
    .filter((f: { severity?: string }) => f.severity === 'error')
    .map((f: { code: string; featureIds: string[] }) => ({ code: f.code, featureIds: f.featureIds, reason: 'Demo data: waived so the demo has a release.' }));
}

export type { ReleaseFile };
