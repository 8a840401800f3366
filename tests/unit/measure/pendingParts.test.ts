import { afterAll, describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, readdirSync, rmSync, utimesSync, writeFileSync } from 'node:fs';
import { hostname, tmpdir } from 'node:os';
import { join } from 'node:path';
import { localFolderStore } from '../../../src/server/storage';

// Which pending upload parts the local store forgets: those of a process that is gone, and any
// untouched for longer than the limit; never those of a live process (this one, or another
// instance sharing the folder).

const dir = mkdtempSync(join(tmpdir(), 'platewright-parts-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));
const host = hostname().replace(/[^A-Za-z0-9]/g, '').slice(0, 40) || 'host';

describe('local store: stale pending parts', () => {
  it('removes the parts of a dead process and old ones, keeps those of live processes', async () => {
    const store = localFolderStore(dir);
    const mine = await store.begin(); // this process, still writing
    await mine.write(new Uint8Array([1, 2, 3]));
    const dead = spawnSync(process.execPath, ['-e', 'process.stdout.write(String(process.pid))'], { encoding: 'utf8' });
    const deadPid = Number(dead.stdout);
    expect(deadPid).toBeGreaterThan(0);
    const incoming = join(dir, '.incoming');
    mkdirSync(incoming, { recursive: true });
    const name = (h: string, pid: number, n: number) => `${h}-${pid}-${n.toString(16).padStart(24, '0')}.part`;
    const files = {
      deadHere: name(host, deadPid, 1),
      liveParent: name(host, process.ppid, 2),
      otherHostFresh: name('otherhost', deadPid, 3),
      otherHostOld: name('otherhost', deadPid, 4),
      oddNameOld: 'left-over.part',
    };
    for (const f of Object.values(files)) writeFileSync(join(incoming, f), 'x');
    const old = new Date(Date.now() - 2 * 3600_000);
    utimesSync(join(incoming, files.otherHostOld), old, old);
    utimesSync(join(incoming, files.oddNameOld), old, old);

    const removed = await store.removeStalePending({ olderThanMs: 3600_000 });
    expect(removed.sort()).toEqual([files.deadHere, files.otherHostOld, files.oddNameOld].sort());
    const left = readdirSync(incoming);
    expect(left).toContain(files.liveParent);
    expect(left).toContain(files.otherHostFresh);
    expect(left.filter((f) => f.startsWith(`${host}-${process.pid}-`))).toHaveLength(1);
    // the live upload still commits
    await mine.commit('projects/1/a.xyz');
    expect(await store.list()).toEqual(['projects/1/a.xyz']);
    expect((await store.modifiedAt('projects/1/a.xyz'))!.getTime()).toBeGreaterThan(Date.now() - 60_000);
    expect(await store.modifiedAt('projects/1/none.xyz')).toBeNull();
  });
});
