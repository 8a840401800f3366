/**
 * The app killed in the middle of an upload (SIGKILL while the body streams in) leaves nothing
 * behind once it starts again: no `uploads` row, no stored file, no pending part — and a file
 * stored earlier, with its row, is kept. Also: a stored file without a row (a kill between the
 * file's commit and the row's insert) is removed once past its grace period.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { spawn, type ChildProcess } from 'node:child_process';
import { request } from 'node:http';
import { mkdirSync, mkdtempSync, rmSync, statSync, utimesSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { eq, sql } from 'drizzle-orm';
import { closeDb, getDb } from '../../src/server/db/client';
import { uploads, users } from '../../src/server/db/schema';
import { createProject } from '../../src/server/repos/projects';
import { localFolderStore, pendingFiles } from '../../src/server/storage';
import { startServer, testAppPort, type RunningServer } from '../support/server';
import { ApiClient, makeUser, tag } from '../support/auth';
import { postUpload } from '../support/measureUploads';

const ROOT = fileURLToPath(new URL('../..', import.meta.url));
const PORT = testAppPort(11);
const PASSWORD = `Bell-Face-${tag()}-Scan`;
const uploadDir = mkdtempSync(join(tmpdir(), 'platewright-killed-upload-'));
const store = localFolderStore(uploadDir);
const env = { UPLOAD_DIR: uploadDir };
let child: ChildProcess | null = null;
let childLog = '';
let restarted: RunningServer | null = null;
let projectId: number;
let email: string;

/** The built app as a child of our own, so it can be killed hard. */
async function startKillable(): Promise<string> {
  child = spawn(process.execPath, [`${process.env.PLATEWRIGHT_DIST ?? 'dist'}/server/entry.mjs`], {
    cwd: ROOT,
    env: { ...process.env, HOST: '127.0.0.1', PORT: String(PORT), ...env },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  child.stdout!.on('data', (d) => (childLog += d));
  child.stderr!.on('data', (d) => (childLog += d));
  const base = `http://127.0.0.1:${PORT}`;
  const deadline = Date.now() + 30_000;
  for (;;) {
    if (child.exitCode !== null) throw new Error(`server exited (${child.exitCode}):\n${childLog}`);
    try {
      if ((await fetch(`${base}/api/health`)).status === 200) return base;
    } catch {
      /* not listening yet */
    }
    if (Date.now() > deadline) throw new Error(`server did not answer within 30 s:\n${childLog}`);
    await new Promise((r) => setTimeout(r, 150));
  }
}

const uploadRows = async () => {
  const [{ n }] = await getDb().select({ n: sql<number>`count(*)` }).from(uploads).where(eq(uploads.projectId, projectId));
  return Number(n);
};

const partBytes = async () => {
  let total = 0;
  for (const name of await pendingFiles(uploadDir)) total += statSync(join(uploadDir, '.incoming', name)).size;
  return total;
};

async function waitFor(what: string, ok: () => boolean | Promise<boolean>, ms = 20_000) {
  const deadline = Date.now() + ms;
  while (!(await ok())) {
    if (Date.now() > deadline) throw new Error(`timed out waiting for ${what}\n${childLog}${restarted?.output() ?? ''}`);
    await new Promise((r) => setTimeout(r, 50));
  }
}

beforeAll(async () => {
  const db = getDb();
  const u = await makeUser(db, { role: 'designer', password: PASSWORD });
  email = u.email;
  const [me] = await db.select().from(users).where(eq(users.id, u.id));
  ({ id: projectId } = await createProject(db, { id: u.id, email: u.email, name: me!.name, role: 'designer' }, { name: `Killed upload ${tag()}`, swapDescription: 'invented swap, scan cut off by a crash' }));
});

afterAll(async () => {
  if (child && child.exitCode === null && child.signalCode === null) child.kill('SIGKILL');
  await restarted?.stop();
  await closeDb();
  rmSync(uploadDir, { recursive: true, force: true });
});

describe('an app killed mid-upload', () => {
  it('leaves no row, no stored file and no part after it starts again; earlier uploads stay', { timeout: 150_000 }, async () => {
    const base = await startKillable();
    const client = new ApiClient(base);
    expect((await client.signIn(email, PASSWORD)).status).toBe(200);

    // one good upload first: it must survive the crash and the clean-up
    const good = await postUpload(client, projectId, { name: 'kept.xyz', bytes: '0 0 0\n10 0 0\n0 10 0\n10 10 0.01\n' });
    expect(good.status, JSON.stringify(good.body)).toBe(201);
    const keptKeys = await store.list();
    expect(keptKeys).toHaveLength(1);

    // a stored file nobody recorded, from long ago (killed between commit and row), and its fresh twin
    const oldOrphan = `projects/${projectId}/00000000-dead-4000-8000-000000000001.xyz`;
    const freshOrphan = `projects/${projectId}/00000000-dead-4000-8000-000000000002.xyz`;
    mkdirSync(join(uploadDir, 'projects', String(projectId)), { recursive: true });
    writeFileSync(join(uploadDir, oldOrphan), '1 2 3\n');
    writeFileSync(join(uploadDir, freshOrphan), '1 2 3\n');
    const hoursAgo = new Date(Date.now() - 3 * 3600_000);
    utimesSync(join(uploadDir, oldOrphan), hoursAgo, hoursAgo);

    // a large scan streams in, chunk by chunk, over a raw connection
    const boundary = `----scan${tag()}`;
    const cookie = [...client.cookies].map(([k, v]) => `${k}=${v}`).join('; ');
    const req = request(`${base}/api/projects/${projectId}/uploads`, {
      method: 'POST',
      headers: { 'content-type': `multipart/form-data; boundary=${boundary}`, origin: base, cookie, accept: 'application/json', 'transfer-encoding': 'chunked' },
    });
    let answered: number | null = null;
    req.on('response', (r) => (answered = r.statusCode ?? 0));
    const dropped = new Promise<string>((resolve) => {
      req.on('error', (e) => resolve((e as NodeJS.ErrnoException).code ?? e.message));
      req.on('close', () => setTimeout(() => resolve('closed without an error'), 1000));
    });
    req.write(`--${boundary}\r\nContent-Disposition: form-data; name="units"\r\n\r\nmm\r\n--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="bell-face-cut.xyz"\r\nContent-Type: application/octet-stream\r\n\r\n`);
    const rows = Array.from({ length: 20_000 }, (_, i) => `${(i % 300) - 150}.125 ${Math.floor(i / 300) - 30}.25 0.0${i % 10}\n`).join('');
    let sent = 0;
    const pump = async () => {
      while (sent < 40_000_000 && answered === null && !req.destroyed) {
        if (!req.write(rows)) {
          await new Promise<void>((r) => {
            const done = () => {
              req.off('drain', done);
              req.off('close', done);
              r();
            };
            req.once('drain', done);
            req.once('close', done);
          });
        }
        sent += rows.length;
      }
    };
    const pumping = pump();
    // the part is on disk and growing: the app is mid-upload
    await waitFor('a growing pending part', async () => (await partBytes()) > 3_000_000);
    expect(answered).toBeNull();
    child!.kill('SIGKILL');
    await new Promise<void>((r) => (child!.exitCode !== null || child!.signalCode !== null ? r() : child!.once('exit', () => r())));
    expect(child!.signalCode).toBe('SIGKILL');
    expect(await dropped).toMatch(/ECONNRESET|EPIPE|socket hang up/);
    await pumping;

    // what the crash left: a part, no row
    const left = await pendingFiles(uploadDir);
    expect(left).toHaveLength(1);
    expect(left[0]).toMatch(new RegExp(`-${child!.pid}-[0-9a-f]+\\.part$`));
    expect(await uploadRows()).toBe(1);

    // start again: the first request runs the clean-up
    restarted = await startServer(PORT, env);
    await waitFor('the start-up clean-up', () => /upload store checked/.test(restarted!.output()));
    expect(restarted.output()).toMatch(/upload store checked: 1 unfinished upload part\(s\) removed, 1 stored file\(s\) without an upload row removed/);
    expect(await pendingFiles(uploadDir)).toEqual([]);
    expect(await uploadRows()).toBe(1);
    // the recorded upload and the orphan still inside its grace period stay; the old orphan is gone
    expect(await store.list()).toEqual([...keptKeys, freshOrphan].sort());
    const again = new ApiClient(restarted.baseUrl);
    expect((await again.signIn(email, PASSWORD)).status).toBe(200);
    const list = await again.get(`/api/projects/${projectId}/uploads`);
    expect(list.body.uploads.map((u: { fileName: string }) => u.fileName)).toEqual(['kept.xyz']);
  });
});
