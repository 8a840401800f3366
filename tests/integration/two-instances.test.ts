/**
 * Two app instances behind nginx on loopback: nothing a request needs lives in one process.
 * Sign in on instance A, save on instance B with the same cookie, download the released DXF
 * through either (and through nginx, which spreads requests over both), upload on one and read
 * it back on the other, sign out on one and be signed out on both.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import { createHash } from 'node:crypto';
import { mkdtempSync, mkdirSync, readFileSync, rmSync, writeFileSync, existsSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { closeDb, getDb } from '../../src/server/db/client';
import { startServer, testAppPort, type RunningServer } from '../support/server';
import { ApiClient } from '../support/auth';
import { makeUser, TEST_PASSWORD } from '../support/users';
import { postUpload } from '../support/measureUploads';

const NGINX = ['/usr/sbin/nginx', '/usr/bin/nginx'].find((p) => existsSync(p));
const demo = JSON.parse(readFileSync(new URL('../../templates/plates/demo.json', import.meta.url), 'utf8'));

let a: RunningServer;
let b: RunningServer;
let nginx: ChildProcess | undefined;
let dir: string;
let front: string;
let nginxLog = '';

/** an nginx of our own: loopback only, no daemon, its own pid, logs and temp folders */
function nginxConfig(port: number, upstreams: number[]): string {
  const t = (n: string) => join(dir, n);
  return `daemon off;
worker_processes 1;
pid ${t('nginx.pid')};
error_log ${t('error.log')} warn;
events { worker_connections 512; }
http {
  access_log ${t('access.log')};
  client_body_temp_path ${t('body')};
  proxy_temp_path ${t('proxy')};
  fastcgi_temp_path ${t('fastcgi')};
  uwsgi_temp_path ${t('uwsgi')};
  scgi_temp_path ${t('scgi')};
  client_max_body_size 64m;
  upstream platewright {
${upstreams.map((p) => `    server 127.0.0.1:${p} max_fails=0;`).join('\n')}
    keepalive 16;
  }
  server {
    listen 127.0.0.1:${port};
    location / {
      proxy_pass http://platewright;
      proxy_http_version 1.1;
      proxy_set_header Connection "";
      proxy_set_header Host $http_host;
      proxy_set_header X-Forwarded-For $proxy_add_x_forwarded_for;
      proxy_set_header X-Forwarded-Proto $scheme;
      add_header X-Upstream $upstream_addr always;
    }
  }
}
`;
}

async function waitFor(url: string, ms = 15_000) {
  const deadline = Date.now() + ms;
  for (;;) {
    try {
      const r = await fetch(url);
      await r.text();
      if (r.status < 500) return;
    } catch {
      /* not yet */
    }
    if (nginx?.exitCode != null) throw new Error(`nginx exited (${nginx.exitCode}): ${nginxLog}`);
    if (Date.now() > deadline) throw new Error(`no answer from ${url}: ${nginxLog}`);
    await new Promise((r) => setTimeout(r, 100));
  }
}

beforeAll(async () => {
  if (!NGINX) throw new Error('nginx is not installed: bash scripts/prepare.sh --with-browser installs nginx-light');
  [a, b] = await Promise.all([startServer(testAppPort(25)), startServer(testAppPort(26))]);
  dir = mkdtempSync(join(tmpdir(), 'platewright-nginx-'));
  for (const d of ['body', 'proxy', 'fastcgi', 'uwsgi', 'scgi']) mkdirSync(join(dir, d));
  const port = testAppPort(28);
  writeFileSync(join(dir, 'nginx.conf'), nginxConfig(port, [testAppPort(25), testAppPort(26)]));
  const t = spawnSync(NGINX, ['-t', '-p', dir, '-e', join(dir, 'error.log'), '-c', join(dir, 'nginx.conf')], { encoding: 'utf8' });
  if (t.status !== 0) throw new Error(`nginx -t: ${t.stderr}`);
  nginx = spawn(NGINX, ['-p', dir, '-e', join(dir, 'error.log'), '-c', join(dir, 'nginx.conf')], { stdio: ['ignore', 'pipe', 'pipe'] });
  nginx.stdout?.on('data', (d) => (nginxLog += d));
  nginx.stderr?.on('data', (d) => (nginxLog += d));
  front = `http://127.0.0.1:${port}`;
  await waitFor(`${front}/api/health`);
}, 120_000);

afterAll(async () => {
  if (nginx && nginx.exitCode === null) {
    const done = new Promise((r) => nginx!.once('exit', r));
    nginx.kill('SIGQUIT');
    setTimeout(() => nginx?.exitCode === null && nginx.kill('SIGKILL'), 5000).unref();
    await done;
  }
  await Promise.all([a?.stop(), b?.stop()]);
  await closeDb();
  if (dir) rmSync(dir, { recursive: true, force: true });
});

/** a client of one instance that shares the cookie jar of another */
function sameJar(base: string, from: ApiClient): ApiClient {
  const c = new ApiClient(base);
  c.cookies = from.cookies;
  return c;
}

describe('two instances behind nginx', () => {
  it('nginx spreads requests over both instances', async () => {
    const seen = new Set<string>();
    for (let i = 0; i < 8; i++) {
      const r = await fetch(`${front}/api/health`);
      await r.text();
      expect(r.status).toBe(200);
      seen.add(r.headers.get('x-upstream') ?? '');
    }
    expect([...seen].sort()).toEqual([`127.0.0.1:${testAppPort(25)}`, `127.0.0.1:${testAppPort(26)}`].sort());
  });

  it('sign in on A, save and submit on B, approve through nginx, download the same DXF from A, B and nginx', async () => {
    const db = getDb();
    const designer = await makeUser(db, 'designer', 'twin');
    const engineer = await makeUser(db, 'engineer', 'twinreviewer');
    const onA = new ApiClient(a.baseUrl);
    expect((await onA.signIn(designer.email, TEST_PASSWORD)).status).toBe(200);
    const onB = sameJar(b.baseUrl, onA);
    expect((await onB.get('/api/me')).body.user.email, 'the session made on A is known to B').toBe(designer.email);

    const project = (await onB.post('/api/projects', { name: 'Twin swap', swapDescription: 'invented' })).body.project.id;
    const plate = (await onA.post(`/api/projects/${project}/plates`, { title: 'Twin plate', material: '6061-T6 aluminium' })).body.plate.id;
    const saved = await onB.post(`/api/plates/${plate}/revisions`, { spec: demo, message: 'saved on B', parentRevisionId: null });
    expect(saved.status).toBe(201);
    const rev = saved.body.revision.id;
    // the save made on B is the parent A must name: a stale save through A is refused the same way
    expect((await onA.post(`/api/plates/${plate}/revisions`, { spec: demo, message: 'stale on A', parentRevisionId: null })).status).toBe(409);
    expect((await onA.post(`/api/revisions/${rev}/submit`, {})).status).toBe(200);

    const reviewer = new ApiClient(front);
    expect((await reviewer.signIn(engineer.email, TEST_PASSWORD)).status).toBe(200);
    const approved = await reviewer.post(`/api/revisions/${rev}/approve`, { comment: 'approved through nginx' });
    expect(approved.status).toBe(200);
    const dxf = approved.body.revision.files.find((f: { name: string }) => f.name === 'plate.dxf');
    expect(dxf).toBeDefined();

    const hashes: string[] = [];
    for (const base of [a.baseUrl, b.baseUrl, front, front]) {
      const r = await fetch(`${base}/api/revisions/${rev}/files/plate.dxf`, { headers: { cookie: `platewright_session=${onA.sessionCookie}` } });
      expect(r.status, base).toBe(200);
      hashes.push(createHash('sha256').update(Buffer.from(await r.arrayBuffer())).digest('hex'));
    }
    expect(new Set(hashes)).toEqual(new Set([dxf.sha256]));
  });

  it('an upload made on one instance is read back on the other', async () => {
    const designer = await makeUser(getDb(), 'designer', 'twinupload');
    const onA = new ApiClient(a.baseUrl);
    await onA.signIn(designer.email, TEST_PASSWORD);
    const project = (await onA.post('/api/projects', { name: 'Twin upload', swapDescription: 'invented' })).body.project.id;
    const text = '0 0 0\n10 0 0\n0 10 0\n10 10 0.01\n5 5 0.002\n';
    const up = await postUpload(onA, project, { name: 'face.xyz', bytes: text });
    expect(up.status).toBe(201);
    const onB = sameJar(b.baseUrl, onA);
    const meta = await onB.get(`/api/uploads/${up.body.upload.id}`);
    expect(meta.status).toBe(200);
    expect(meta.body.upload.pointCount ?? meta.body.upload.summary?.pointCount).toBe(5);
    const file = await fetch(`${b.baseUrl}/api/uploads/${up.body.upload.id}/file`, { headers: { cookie: `platewright_session=${onA.sessionCookie}` } });
    expect(file.status).toBe(200);
    expect(await file.text()).toBe(text);
  });

  it('signing out on B ends the session on A too', async () => {
    const u = await makeUser(getDb(), 'designer', 'twinout');
    const onA = new ApiClient(a.baseUrl);
    await onA.signIn(u.email, TEST_PASSWORD);
    const id = onA.sessionCookie!;
    const onB = new ApiClient(b.baseUrl);
    onB.cookies.set('platewright_session', id);
    expect((await onB.post('/api/auth/sign-out', {})).status).toBe(204);
    const replay = new ApiClient(a.baseUrl);
    replay.cookies.set('platewright_session', id);
    expect((await replay.get('/api/me')).status).toBe(401);
  });

  it('nginx logged no upstream errors', () => {
    const log = readFileSync(join(dir, 'error.log'), 'utf8');
    expect(log).not.toMatch(/\[(error|crit|alert|emerg)\]/);
  });
});
