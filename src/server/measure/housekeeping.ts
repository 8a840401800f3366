/**
 * Upload housekeeping at start: what a process killed in the middle of an upload can leave.
 *
 * - a pending part in the store (the body was still streaming): removed when the process that
 *   wrote it is gone, or when nobody touched it for a day;
 * - a stored file without its `uploads` row (killed between the file's commit and the row's
 *   insert): removed once it is older than a grace period, so an upload another instance is
 *   committing right now is left alone.
 *
 * Runs once per process, on its first request (the server loads its request handling then); it
 * never blocks a request, and a database that is down only postpones the orphan check to the
 * next start.
 */
import { inArray } from 'drizzle-orm';
import type { Db } from '~/server/db/client';
import { getDb } from '~/server/db/client';
import { uploads } from '~/server/db/schema';
import { uploadStore, type BlobStore } from '~/server/storage';

export interface HousekeepingReport {
  readonly partsRemoved: string[];
  readonly orphansRemoved: string[];
  /** why the orphan check did not run, if it did not */
  readonly orphanCheckSkipped?: string;
}

/** Stored files under these prefixes belong to an `uploads` row. */
const UPLOAD_KEY_RE = /^projects\/\d+\/[^/]+$/;

export async function cleanUploadStore(db: Db, store: BlobStore, opts: { orphanGraceMs?: number; partStaleMs?: number } = {}): Promise<HousekeepingReport> {
  const graceMs = opts.orphanGraceMs ?? 15 * 60_000;
  const partsRemoved = await store.removeStalePending({ olderThanMs: opts.partStaleMs });
  const orphansRemoved: string[] = [];
  let orphanCheckSkipped: string | undefined;
  try {
    const keys = (await store.list()).filter((k) => UPLOAD_KEY_RE.test(k));
    const known = new Set<string>();
    for (let i = 0; i < keys.length; i += 500) {
      const batch = keys.slice(i, i + 500);
      const rows = await db.select({ key: uploads.storageKey }).from(uploads).where(inArray(uploads.storageKey, batch));
      for (const r of rows) known.add(r.key);
    }
    for (const key of keys) {
      if (known.has(key)) continue;
      const at = await store.modifiedAt(key);
      if (!at || Date.now() - at.getTime() < graceMs) continue;
      await store.remove(key);
      orphansRemoved.push(key);
    }
  } catch (e) {
    orphanCheckSkipped = e instanceof Error ? e.message : String(e);
  }
  return { partsRemoved, orphansRemoved, ...(orphanCheckSkipped ? { orphanCheckSkipped } : {}) };
}

let once: Promise<HousekeepingReport | null> | null = null;

/** Starts the clean-up of the upload store once per process; logs one line with what it did. */
export function cleanUploadStoreOnce(): Promise<HousekeepingReport | null> {
  once ??= cleanUploadStore(getDb(), uploadStore()).then(
    (r) => {
      const skipped = r.orphanCheckSkipped ? `; stored files not checked (${r.orphanCheckSkipped})` : '';
      console.log(`[platewright] upload store checked: ${r.partsRemoved.length} unfinished upload part(s) removed, ${r.orphansRemoved.length} stored file(s) without an upload row removed${skipped}`);
      return r;
    },
    (e) => {
      console.error(`[platewright] upload store check failed: ${e instanceof Error ? e.message : String(e)}`);
      return null;
    },
  );
  return once;
}
