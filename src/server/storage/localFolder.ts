/**
 * The local-folder store: `<dir>/<key>`, written to `<dir>/.incoming/` first and renamed on commit.
 * A pending file is named `<host>-<pid>-<random>.part`, so housekeeping can tell the parts of a
 * process that is gone (killed mid-upload) from those of a live one sharing the folder.
 */
import { createReadStream, createWriteStream, type WriteStream } from 'node:fs';
import { mkdir, readdir, rename, rm, stat } from 'node:fs/promises';
import { randomBytes } from 'node:crypto';
import { hostname } from 'node:os';
import { dirname, join, relative, resolve } from 'node:path';
import { BlobNotFound, checkKey, type BlobStore, type PendingBlob } from './types';

const HOST = hostname().replace(/[^A-Za-z0-9]/g, '').slice(0, 40) || 'host';
const PART_RE = /^([A-Za-z0-9]+)-(\d+)-[0-9a-f]+\.part$/;
/** parts untouched this long are stale whoever wrote them */
const DEFAULT_STALE_MS = 24 * 3600_000;

function processAlive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (e) {
    return (e as NodeJS.ErrnoException).code === 'EPERM';
  }
}

export function localFolderStore(folder: string): BlobStore & { dir: string } {
  const root = resolve(folder);
  const incoming = join(root, '.incoming');
  const pathOf = (key: string) => join(root, checkKey(key));

  return {
    dir: folder,
    async begin(): Promise<PendingBlob> {
      await mkdir(incoming, { recursive: true });
      const temp = join(incoming, `${HOST}-${process.pid}-${randomBytes(12).toString('hex')}.part`);
      const out: WriteStream = createWriteStream(temp, { flags: 'wx' });
      let failed: Error | null = null;
      out.on('error', (e) => (failed = e));
      let done = false;
      const close = () =>
        new Promise<void>((res) => {
          if (out.closed) return res();
          out.end(() => res());
          out.once('error', () => res());
        });
      return {
        async write(chunk) {
          if (failed) throw failed;
          if (!out.write(chunk)) await new Promise<void>((res, rej) => {
            out.once('drain', res);
            out.once('error', rej);
          });
        },
        async commit(key) {
          if (failed) throw failed;
          await close();
          if (failed) throw failed;
          const target = pathOf(key);
          await mkdir(dirname(target), { recursive: true });
          await rename(temp, target);
          done = true;
        },
        async abort() {
          if (done) return;
          done = true;
          out.destroy();
          await rm(temp, { force: true });
        },
      };
    },
    async *read(key) {
      const path = pathOf(key);
      try {
        await stat(path);
      } catch {
        throw new BlobNotFound(key);
      }
      for await (const chunk of createReadStream(path, { highWaterMark: 1 << 20 })) yield chunk as Uint8Array;
    },
    async size(key) {
      try {
        return (await stat(pathOf(key))).size;
      } catch {
        return null;
      }
    },
    async remove(key) {
      await rm(pathOf(key), { force: true });
    },
    async modifiedAt(key) {
      try {
        return (await stat(pathOf(key))).mtime;
      } catch {
        return null;
      }
    },
    async removeStalePending(opts = {}) {
      const olderThanMs = opts.olderThanMs ?? DEFAULT_STALE_MS;
      let names: string[];
      try {
        names = await readdir(incoming);
      } catch {
        return [];
      }
      const removed: string[] = [];
      for (const name of names) {
        const path = join(incoming, name);
        const m = PART_RE.exec(name);
        let stale = false;
        if (m && m[1] === HOST && Number(m[2]) !== process.pid && !processAlive(Number(m[2]))) stale = true;
        else {
          try {
            stale = Date.now() - (await stat(path)).mtimeMs > olderThanMs;
          } catch {
            continue; // finished or removed meanwhile
          }
        }
        if (stale) {
          await rm(path, { force: true, recursive: true });
          removed.push(name);
        }
      }
      return removed;
    },
    async list() {
      const out: string[] = [];
      const walk = async (d: string) => {
        let entries;
        try {
          entries = await readdir(d, { withFileTypes: true });
        } catch {
          return;
        }
        for (const e of entries) {
          const p = join(d, e.name);
          if (e.isDirectory()) {
            if (p !== incoming) await walk(p);
          } else out.push(relative(root, p));
        }
      };
      await walk(root);
      return out.sort();
    },
  };
}

/** Files still waiting in the incoming folder (a failed upload must leave none). */
export async function pendingFiles(folder: string): Promise<string[]> {
  try {
    return await readdir(join(resolve(folder), '.incoming'));
  } catch {
    return [];
  }
}
