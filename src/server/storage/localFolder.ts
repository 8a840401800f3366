/** The local-folder store: `<dir>/<key>`, written to `<dir>/.incoming/` first and renamed on commit. */
import { createReadStream, createWriteStream, type WriteStream } from 'node:fs';
import { mkdir, readdir, rename, rm, stat } from 'node:fs/promises';
import { randomBytes } from 'node:crypto';
import { dirname, join, relative, resolve } from 'node:path';
import { BlobNotFound, checkKey, type BlobStore, type PendingBlob } from './types';

export function localFolderStore(folder: string): BlobStore & { dir: string } {
  const root = resolve(folder);
  const incoming = join(root, '.incoming');
  const pathOf = (key: string) => join(root, checkKey(key));

  return {
    dir: folder,
    async begin(): Promise<PendingBlob> {
      await mkdir(incoming, { recursive: true });
      const temp = join(incoming, `${randomBytes(12).toString('hex')}.part`);
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
