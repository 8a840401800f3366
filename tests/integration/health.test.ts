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
    // A kept-alive socket the server closed while MariaDB restarted can fail one fetch
    // ("other side closed"); that is the client's socket, not the app: ask again on a new one.
    const healthOrRetry = () => health().catch(() => ({ status: 0, body: {} as Record<string, unknown> }));
    let again = await healthOrRetry();
    for (let i = 0; i < 20 && again.status !== 200; i++) {
      await new Promise((r) => setTimeout(r, 250));
      again = await healthOrRetry();
    }
    expect(again.status).toBe(200);
    expect(again.body).toMatchObject({ ok: true, db: 'up' });
  });
});

describe('security headers on the built server', () => {
  it('pages carry the CSP (wasm allowed, no inline script, no framing), nosniff and a referrer policy', async () => {
    const r = await fetch(`${server.baseUrl}/`);
    const csp = r.headers.get('content-security-policy') ?? '';
    expect(csp).toContain("'wasm-unsafe-eval'");
    expect(csp).toContain("frame-ancestors 'none'");
    expect(csp.split('; ').find((d) => d.startsWith('script-src'))).not.toMatch(/unsafe-inline|'unsafe-eval'/);
    expect(r.headers.get('x-content-type-options')).toBe('nosniff');
    expect(r.headers.get('referrer-policy')).toBe('strict-origin-when-cross-origin');
    const api = await fetch(`${server.baseUrl}/api/me`);
    expect(api.status).toBe(401);
    expect(api.headers.get('x-content-type-options')).toBe('nosniff');
    const body = await api.text();
    expect(body).not.toMatch(/\bat .+:\d+:\d+/); // no stack trace
  });
});
