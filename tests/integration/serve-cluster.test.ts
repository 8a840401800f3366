/**
 * scripts/serve.mjs with WEB_CONCURRENCY=2: two app processes answer on one port, a process that
 * dies is replaced, and SIGTERM stops them all.
 */
import { readdirSync, readFileSync } from 'node:fs';
import { afterAll, describe, expect, it } from 'vitest';
import { startServer, testAppPort, type RunningServer } from '../support/server';

let server: RunningServer | undefined;
afterAll(async () => {
  await server?.stop();
});

/** pids of processes whose parent is `parent` (Linux /proc) */
function childrenOf(parent: number): number[] {
  const out: number[] = [];
  for (const d of readdirSync('/proc')) {
    if (!/^\d+$/.test(d)) continue;
    try {
      const stat = readFileSync(`/proc/${d}/stat`, 'utf8');
      const ppid = Number(stat.slice(stat.lastIndexOf(')') + 2).split(' ')[1]);
      if (ppid === parent) out.push(Number(d));
    } catch {
      /* gone */
    }
  }
  return out;
}

describe('serving with several processes', () => {
  it('answers from two processes on one port and replaces one that dies', async () => {
    server = await startServer(testAppPort(21), { WEB_CONCURRENCY: '2' });
    const primary = server.pid();
    const waitForChildren = async (n: number, not: number[] = []) => {
      for (let i = 0; i < 100; i++) {
        const kids = childrenOf(primary).filter((p) => !not.includes(p));
        if (kids.length >= n) return childrenOf(primary);
        await new Promise((r) => setTimeout(r, 100));
      }
      return childrenOf(primary);
    };
    const kids = await waitForChildren(2);
    expect(kids).toHaveLength(2);
    const answers = await Promise.all(Array.from({ length: 20 }, () => fetch(`${server!.baseUrl}/api/health`).then((r) => r.status)));
    expect(answers.every((s) => s === 200)).toBe(true);

    process.kill(kids[0]!, 'SIGKILL');
    const after = await waitForChildren(2, [kids[0]!]);
    expect(after).not.toContain(kids[0]);
    expect(after).toHaveLength(2);
    let status = 0;
    for (let i = 0; i < 50 && status !== 200; i++) {
      status = await fetch(`${server.baseUrl}/api/health`).then((r) => r.status).catch(() => 0);
      if (status !== 200) await new Promise((r) => setTimeout(r, 100));
    }
    expect(status).toBe(200);
    expect(server.output()).toMatch(/ended \(SIGKILL\); starting another/);

    await server.stop();
    server = undefined;
    expect(childrenOf(primary)).toHaveLength(0);
  });
});
