import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startServer, testAppPort, type RunningServer } from '../support/server';
import { testDb } from '../support/db';

let server: RunningServer;

beforeAll(async () => {
  server = await startServer(testAppPort(1));
});
afterAll(async () => {
  try {
    testDb('start'); // whatever happened, leave the test database running for the next file
  } finally {
    await server?.stop();
  }
});

async function health() {
  const r = await fetch(`${server.baseUrl}/api/health`);
  return { status: r.status, body: (await r.json()) as Record<string, unknown> };
}

describe('/api/health on the built server', () => {
  it('reports up, then down (503) while MariaDB is stopped, then up again without restarting the app', async () => {
    const up = await health();
    expect(up.status).toBe(200);
    expect(up.body).toMatchObject({ ok: true, db: 'up' });
    expect(typeof up.body.version).toBe('string');

    testDb('stop');
    const down = await health();
    expect(down.status).toBe(503);
    expect(down.body).toMatchObject({ ok: false, db: 'down' });

    testDb('start');
    let again = await health();
    for (let i = 0; i < 20 && again.status !== 200; i++) {
      await new Promise((r) => setTimeout(r, 250));
      again = await health();
    }
    expect(again.status).toBe(200);
    expect(again.body).toMatchObject({ ok: true, db: 'up' });
  });
});
