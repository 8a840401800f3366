import { spawn, type ChildProcess } from 'node:child_process';
import { fileURLToPath } from 'node:url';

const ROOT = fileURLToPath(new URL('../..', import.meta.url));

export interface RunningServer {
  baseUrl: string;
  stop(): Promise<void>;
  output(): string;
  /** the server's process id (with WEB_CONCURRENCY > 1: the primary's) */
  pid(): number;
}

/** Start the built app (dist/server/entry.mjs) against the test database and wait until it answers. */
export async function startServer(port: number, env: Record<string, string> = {}): Promise<RunningServer> {
  let log = '';
  // with WEB_CONCURRENCY > 1, through scripts/serve.mjs (several processes on one port)
  const script = Number(env.WEB_CONCURRENCY ?? 1) > 1 ? 'scripts/serve.mjs' : `${process.env.PLATEWRIGHT_DIST ?? 'dist'}/server/entry.mjs`;
  const child: ChildProcess = spawn(process.execPath, [script], {
    cwd: ROOT,
    env: { ...process.env, HOST: '127.0.0.1', PORT: String(port), ...env },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  child.stdout?.on('data', (d) => (log += d));
  child.stderr?.on('data', (d) => (log += d));
  const baseUrl = `http://127.0.0.1:${port}`;
  const deadline = Date.now() + 30_000;
  for (;;) {
    if (child.exitCode !== null) throw new Error(`server exited (${child.exitCode}):\n${log}`);
    try {
      const r = await fetch(`${baseUrl}/api/health`);
      if (r.status === 200 || r.status === 503) break;
    } catch {
      /* not listening yet */
    }
    if (Date.now() > deadline) {
      child.kill('SIGKILL');
      throw new Error(`server did not answer within 30 s:\n${log}`);
    }
    await new Promise((r) => setTimeout(r, 150));
  }
  return {
    baseUrl,
    output: () => log,
    pid: () => child.pid!,
    stop: () =>
      new Promise<void>((resolve) => {
        if (child.exitCode !== null) return resolve();
        child.once('exit', () => resolve());
        child.kill('SIGTERM');
        setTimeout(() => child.kill('SIGKILL'), 5000).unref();
      }),
  };
}

export function testAppPort(offset = 0): number {
  return Number(process.env.TEST_APP_PORT ?? 4327) + offset;
}
