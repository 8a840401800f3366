import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { closeDb, getDb } from '../../src/server/db/client';
import { startServer, testAppPort, type RunningServer } from '../support/server';
import { testDb } from '../support/db';
import { ApiClient } from '../support/auth';
import { makeUser, TEST_PASSWORD } from '../support/users';

const demoSpec = JSON.parse(readFileSync(new URL('../../templates/plates/demo.json', import.meta.url), 'utf8'));
let server: RunningServer;
let designer: ApiClient;
let plateId: number;

beforeAll(async () => {
  server = await startServer(testAppPort(3));
  const u = await makeUser(getDb(), 'designer', 'fault');
  await closeDb();
  designer = new ApiClient(server.baseUrl);
  expect((await designer.signIn(u.email, TEST_PASSWORD)).status).toBe(200);
  const p = await designer.post('/api/projects', { name: 'Fault swap', swapDescription: '' });
  const pl = await designer.post(`/api/projects/${p.body.project.id}/plates`, { title: 'Fault plate' });
  plateId = pl.body.plate.id;
}, 120_000);

afterAll(async () => {
  try {
    testDb('start');
  } finally {
    await server?.stop();
  }
});

describe('MariaDB stopped and restarted under load', () => {
  it('requests fail cleanly with 503 while it is down and succeed again without restarting the app', async () => {
    const statuses: { t: number; status: number; phase: string }[] = [];
    let phase = 'up';
    let running = true;
    const started = Date.now();
    const worker = async () => {
      // bounded: at most 400 requests per worker, and only while the test runs
      for (let i = 0; running && i < 400; i++) {
        const r = await designer.get('/api/projects').catch(() => ({ status: 0 }));
        statuses.push({ t: Date.now() - started, status: r.status, phase });
        await new Promise((res) => setTimeout(res, 20));
      }
    };
    const workers = Array.from({ length: 8 }, worker);
    await new Promise((r) => setTimeout(r, 1000));
    phase = 'down';
    testDb('stop');
    // a save while the database is down: refused cleanly, nothing half-done
    const save = await designer.post(`/api/plates/${plateId}/revisions`, { spec: demoSpec, message: 'during outage', parentRevisionId: null });
    expect(save.status).toBe(503);
    expect(save.body.error.message).toMatch(/nothing was changed/);
    await new Promise((r) => setTimeout(r, 1500));
    phase = 'restarting';
    testDb('start');
    phase = 'back';
    await new Promise((r) => setTimeout(r, 3000));
    running = false;
    await Promise.all(workers);

    const byPhase = (p: string) => statuses.filter((s) => s.phase === p).map((s) => s.status);
    // never a 500, a dropped connection or a sign-in prompt: 200 or 503 only
    expect([...new Set(statuses.map((s) => s.status))].sort()).toEqual(expect.arrayContaining([200, 503]));
    for (const s of statuses) expect([200, 503]).toContain(s.status);
    expect(byPhase('up').every((s) => s === 200)).toBe(true);
    expect(byPhase('down').filter((s) => s === 503).length).toBeGreaterThan(0);
    // recovered: the last second of requests all succeeded
    const last = statuses.filter((s) => s.t > Date.now() - started - 1000);
    expect(last.length).toBeGreaterThan(0);
    expect(last.every((s) => s.status === 200)).toBe(true);

    // and the save that was refused can be made now; nothing from the outage was stored
    const after = await designer.post(`/api/plates/${plateId}/revisions`, { spec: demoSpec, message: 'after outage', parentRevisionId: null });
    expect(after.status).toBe(201);
    expect(after.body.revision.number).toBe(1);
  }, 120_000);
});
