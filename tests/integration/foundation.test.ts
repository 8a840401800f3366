import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createHash, randomBytes } from 'node:crypto';
import { eq, sql } from 'drizzle-orm';
import { closeDb, getDb } from '../../src/server/db/client';
import { runMigrations } from '../../src/server/db/migrate';
import * as t from '../../src/server/db/schema';
import { newId } from '../../src/server/seed';

const db = () => getDb();
const sha = (b: string | Buffer) => createHash('sha256').update(b).digest('hex');

beforeAll(async () => {
  // Applying again must be a no-op (already applied by scripts/test.sh).
  await runMigrations();
});
afterAll(async () => {
  await closeDb();
});

describe('migrations', () => {
  it('created every table of the schema on the real MariaDB instance', async () => {
    const [rows] = (await db().execute(sql`SHOW TABLES`)) as unknown as [Record<string, string>[]];
    const names = rows.map((r) => Object.values(r)[0]);
    for (const table of ['users', 'sessions', 'projects', 'project_members', 'plates', 'revisions', 'reviews', 'artifacts', 'uploads', 'audit_events']) {
      expect(names).toContain(table);
    }
    const [version] = (await db().execute(sql`SELECT VERSION() AS v`)) as unknown as [{ v: string }[]];
    expect(version[0].v).toMatch(/MariaDB/);
  });
});

describe('a row round-trips through each table', () => {
  it('users, sessions, projects, members, plates, revisions, reviews, artifacts, uploads, audit events', async () => {
    const tag = randomBytes(4).toString('hex');
    const userId = newId();
    await db().insert(t.users).values({ id: userId, email: `rt-${tag}@example.test`, name: 'Round Trip', role: 'designer' });
    const [u] = await db().select().from(t.users).where(eq(t.users.id, userId));
    expect(u).toMatchObject({ email: `rt-${tag}@example.test`, role: 'designer', active: true });

    const expiresAt = new Date(Math.floor(Date.now() / 1000 + 3600) * 1000);
    await db().insert(t.sessions).values({ id: `s-${tag}`, userId, expiresAt });
    const [s] = await db().select().from(t.sessions).where(eq(t.sessions.id, `s-${tag}`));
    expect(s.expiresAt.getTime()).toBe(expiresAt.getTime());

    const [p] = await db().insert(t.projects).values({ name: `RT ${tag}`, swapDescription: 'invented', ownerId: userId }).$returningId();
    await db().insert(t.projectMembers).values({ projectId: p.id, userId });
    const members = await db().select().from(t.projectMembers).where(eq(t.projectMembers.projectId, p.id));
    expect(members.map((m) => m.userId)).toEqual([userId]);

    const [pl] = await db().insert(t.plates).values({ projectId: p.id, partNumber: `RT-${tag}`, title: 'Round trip plate', material: '6061-T6' }).$returningId();
    const spec = { schemaVersion: 1, thicknessMm: 12.7, nested: { list: [1, 2.5, 'x'], unicode: 'Ø 10 H7 — µm' } };
    const specText = JSON.stringify(spec);
    const [rev] = await db()
      .insert(t.revisions)
      .values({ plateId: pl.id, number: 1, spec, specSha256: sha(specText), specSchemaVersion: 1, checks: [{ code: 'x', severity: 'note' }], authorId: userId, message: 'first' })
      .$returningId();
    const [r] = await db().select().from(t.revisions).where(eq(t.revisions.id, rev.id));
    expect(r.spec).toEqual(spec); // JSON column comes back as the same document
    expect(r.checks).toEqual([{ code: 'x', severity: 'note' }]);
    expect(r.status).toBe('draft');

    await db().insert(t.reviews).values({ revisionId: rev.id, reviewerId: userId, decision: 'comment', comment: 'ok', waivers: [{ code: 'a', reason: 'b' }] });
    const [rv] = await db().select().from(t.reviews).where(eq(t.reviews.revisionId, rev.id));
    expect(rv.waivers).toEqual([{ code: 'a', reason: 'b' }]);

    const bytes = randomBytes(300_000); // LONGBLOB, binary-safe, bigger than a BLOB's 64 KiB
    bytes[0] = 0;
    await db().insert(t.artifacts).values({ revisionId: rev.id, kind: 'plate.step', contentType: 'model/step', sha256: sha(bytes), sizeBytes: bytes.length, bytes, kernelVersion: 'test' });
    const [a] = await db().select().from(t.artifacts).where(eq(t.artifacts.revisionId, rev.id));
    expect(Buffer.compare(a.bytes, bytes)).toBe(0);
    expect(sha(a.bytes)).toBe(a.sha256);

    await db().insert(t.uploads).values({ projectId: p.id, fileName: 'face.xyz', kind: 'xyz', sizeBytes: 5_000_000_000, sha256: sha('x'), storageKey: `k-${tag}`, summary: { points: 3, bbox: [0, 0, 0, 1, 1, 1] }, uploadedById: userId });
    const [up] = await db().select().from(t.uploads).where(eq(t.uploads.storageKey, `k-${tag}`));
    expect(up.sizeBytes).toBe(5_000_000_000);
    expect(up.summary).toEqual({ points: 3, bbox: [0, 0, 0, 1, 1, 1] });

    await db().insert(t.auditEvents).values({ actorId: userId, action: 'test.roundtrip', targetType: 'plate', targetId: String(pl.id), details: { tag } });
    const [ev] = await db().select().from(t.auditEvents).where(eq(t.auditEvents.action, 'test.roundtrip'));
    expect(ev.details).toEqual({ tag });
    expect(ev.at).toBeInstanceOf(Date);
  });

  it('rejects a second plate with the same part number and a duplicate revision number', async () => {
    const tag = randomBytes(4).toString('hex');
    const userId = newId();
    await db().insert(t.users).values({ id: userId, email: `dup-${tag}@example.test`, name: 'Dup', role: 'designer' });
    const [p] = await db().insert(t.projects).values({ name: `Dup ${tag}`, swapDescription: '', ownerId: userId }).$returningId();
    const [pl] = await db().insert(t.plates).values({ projectId: p.id, partNumber: `DUP-${tag}`, title: 'a', material: 'm' }).$returningId();
    await expect(db().insert(t.plates).values({ projectId: p.id, partNumber: `DUP-${tag}`, title: 'b', material: 'm' })).rejects.toThrow();
    const rev = { plateId: pl.id, number: 1, spec: {}, specSha256: sha('{}'), specSchemaVersion: 1, checks: [], authorId: userId, message: '' };
    await db().insert(t.revisions).values(rev);
    await expect(db().insert(t.revisions).values(rev)).rejects.toThrow();
  });
});
