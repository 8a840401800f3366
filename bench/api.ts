/**
 * API load benchmark (not a test): `npm run bench:api`.
 *
 * Starts a private MariaDB of its own (DB_PORT 3468, .data/bench-mariadb, database
 * platewright_bench), migrates and seeds the demo, builds the app into .data/dist-bench when
 * sources changed, and starts the built server on loopback. Then autocannon, 50 connections:
 *   baseline  GET  /api/health                         (same run; every figure is also a ratio to it)
 *   sign-in   POST /api/auth/sign-in                   (argon2id per request; bounded by count)
 *   projects  GET  /api/projects                       (designer)
 *   revision  GET  /api/revisions/:id                  (designer, the released demo revision)
 *   dxf       GET  /api/revisions/:id/files/plate.dxf  (machinist, the released DXF)
 * Each scenario: 1 s warm-up, then at most DURATION_S seconds or MAX_REQUESTS requests.
 * Prints throughput, p50/p99 latency, errors and SQL statements per request (MariaDB's own
 * `Questions` counter before and after the scenario, divided by the requests); the last line is
 * one JSON object.
 */
import autocannon from 'autocannon';
import { spawnSync } from 'node:child_process';
import { cpus, loadavg } from 'node:os';
import { fileURLToPath } from 'node:url';
import { startServer } from '../tests/support/server';

const ROOT = fileURLToPath(new URL('..', import.meta.url));
const CONNECTIONS = 50;
const DURATION_S = Number(process.env.BENCH_DURATION_S ?? 6);
const MAX_REQUESTS = 20_000;
const SIGN_INS = 300;
const PORT = Number(process.env.BENCH_APP_PORT ?? 4397);
const DEMO_PASSWORD = process.env.DEMO_PASSWORD ?? 'platewright-demo';

const env: Record<string, string> = {
  DB_PORT: process.env.BENCH_DB_PORT ?? '3468',
  DB_DIR: process.env.BENCH_DB_DIR ?? `${ROOT}.data/bench-mariadb`,
  DB_NAME: 'platewright_bench',
  DB_USER: 'platewright',
  DB_PASSWORD: 'platewright-bench',
  PLATEWRIGHT_DIST: process.env.BENCH_DIST ?? `${ROOT}.data/dist-bench`,
  NODE_ENV: 'test',
  MAIL_FAKE_PORT: '2597',
  SMTP_URL: 'smtp://127.0.0.1:2597',
  UPLOAD_DIR: `${ROOT}.data/bench-uploads`,
  DB_POOL_SIZE: '20',
  // app processes on the port (scripts/serve.mjs, node:cluster); BENCH_WORKERS=2 to compare
  WEB_CONCURRENCY: process.env.BENCH_WORKERS ?? '1',
};
Object.assign(process.env, env);
delete process.env.DATABASE_URL;

function sh(cmd: string) {
  const r = spawnSync('bash', ['-c', cmd], { cwd: ROOT, env: process.env, encoding: 'utf8' });
  if (r.status !== 0) throw new Error(`${cmd} failed:\n${r.stdout}\n${r.stderr}`);
  return r.stdout;
}

interface Figures {
  name: string;
  requests: number;
  /** SQL statements the server sent per request in this scenario (MariaDB `Questions`) */
  queriesPerRequest: number;
  throughputPerS: number;
  p50Ms: number;
  p99Ms: number;
  errors: number;
  non2xx: number;
}

/** MariaDB's count of statements received (the two reads of it add one each). */
function questions(): number {
  const out = sh(`mariadb --no-defaults --socket="${env.DB_DIR}/mysqld.sock" -uroot -N -B -e "SHOW GLOBAL STATUS LIKE 'Questions'"`);
  return Number(out.trim().split(/\s+/)[1]);
}

async function run(name: string, opts: autocannon.Options & { warm?: boolean }): Promise<Figures> {
  if (opts.warm !== false) await autocannon({ ...opts, connections: CONNECTIONS, duration: 1 });
  const q0 = questions();
  const r = await autocannon({ connections: CONNECTIONS, duration: DURATION_S, ...opts });
  const q1 = questions();
  const f: Figures = {
    name,
    requests: r.requests.total,
    queriesPerRequest: +((q1 - q0 - 1) / Math.max(1, r.requests.sent ?? r.requests.total)).toFixed(2), // sent: requests still in flight at the end queried too
    throughputPerS: Math.round(r.requests.average),
    p50Ms: r.latency.p50,
    p99Ms: r.latency.p99,
    errors: r.errors + r.timeouts,
    non2xx: r.non2xx,
  };
  console.log(`${name.padEnd(9)} ${String(f.throughputPerS).padStart(6)} req/s  p50 ${String(f.p50Ms).padStart(4)} ms  p99 ${String(f.p99Ms).padStart(4)} ms  errors ${f.errors}  non-2xx ${f.non2xx}  SQL/request ${f.queriesPerRequest}  (${f.requests} requests)`);
  return f;
}

async function signIn(base: string, email: string): Promise<string> {
  const r = await fetch(`${base}/api/auth/sign-in`, { method: 'POST', headers: { 'content-type': 'application/json', origin: base }, body: JSON.stringify({ email, password: DEMO_PASSWORD }) });
  if (r.status !== 200) throw new Error(`sign-in of ${email}: ${r.status} ${await r.text()}`);
  const cookie = r.headers.getSetCookie().find((c) => c.startsWith('platewright_session='));
  return cookie!.split(';')[0]!;
}

async function main() {
  const dbWasRunning = spawnSync('bash', ['scripts/db.sh', 'status'], { cwd: ROOT, env: process.env }).status === 0;
  sh('bash scripts/db.sh start >/dev/null');
  let server: Awaited<ReturnType<typeof startServer>> | undefined;
  try {
    sh('npx tsx scripts/migrate.ts >/dev/null && npx tsx scripts/seed.ts >/dev/null');
    sh('source scripts/lib.sh && ensure_build');
    server = await startServer(PORT, env);
    const base = server.baseUrl;
    const designer = await signIn(base, 'designer@example.test');
    const machinist = await signIn(base, 'machinist@example.test');
    const rel = await (await fetch(`${base}/api/releases`, { headers: { cookie: machinist } })).json();
    const released = rel.releases.find((x: { files: { name: string }[] }) => x.files.some((f) => f.name === 'plate.dxf'));
    if (!released) throw new Error('no released revision with a DXF in the demo data');
    const rev = released.revisionId as number;

    console.log(`API benchmark — ${cpus().length} cores, load ${loadavg()[0].toFixed(2)}, ${CONNECTIONS} connections, ≤ ${DURATION_S} s or ${MAX_REQUESTS} requests each`);
    const health = await run('health', { url: `${base}/api/health`, maxOverallRequests: MAX_REQUESTS });
    const signin = await run('sign-in', {
      url: `${base}/api/auth/sign-in`,
      method: 'POST',
      headers: { 'content-type': 'application/json', origin: base },
      body: JSON.stringify({ email: 'designer@example.test', password: DEMO_PASSWORD }),
      amount: SIGN_INS,
      warm: false,
    });
    const projects = await run('projects', { url: `${base}/api/projects`, headers: { cookie: designer }, maxOverallRequests: MAX_REQUESTS });
    const revision = await run('revision', { url: `${base}/api/revisions/${rev}`, headers: { cookie: designer }, maxOverallRequests: MAX_REQUESTS });
    const dxf = await run('dxf', { url: `${base}/api/revisions/${rev}/files/plate.dxf`, headers: { cookie: machinist }, maxOverallRequests: MAX_REQUESTS });
    const all = [health, signin, projects, revision, dxf];
    const ratios = Object.fromEntries(
      all.slice(1).map((f) => [f.name, { throughput: +(f.throughputPerS / health.throughputPerS).toFixed(3), p50: +(f.p50Ms / Math.max(health.p50Ms, 0.5)).toFixed(2), p99: +(f.p99Ms / Math.max(health.p99Ms, 0.5)).toFixed(2) }]),
    );
    const reads = [projects, revision, dxf];
    const verdict = { readsP99Under100Ms: reads.every((f) => f.p99Ms < 100), zeroErrors: all.every((f) => f.errors === 0 && f.non2xx === 0) };
    console.log(JSON.stringify({ bench: 'api', cores: cpus().length, load1: +loadavg()[0].toFixed(2), connections: CONNECTIONS, durationS: DURATION_S, baseline: 'GET /api/health', results: all, ratiosToBaseline: ratios, ...verdict }));
  } finally {
    await server?.stop();
    if (!dbWasRunning) sh('bash scripts/db.sh stop >/dev/null 2>&1 || true');
  }
}

main().catch((e) => {
  console.error(e);
  process.exit(1);
});
