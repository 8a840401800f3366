/**
 * Where uploaded files live. A small interface so an S3-compatible store can take the local
 * folder's place later: a blob is written as a pending upload, then committed under its key in
 * one step, or aborted — a failed upload leaves nothing behind.
 */

export interface PendingBlob {
  /** Appends bytes (waits when the store is busy). */
  write(chunk: Uint8Array): Promise<void>;
  /** Makes the bytes visible under `key`. */
  commit(key: string): Promise<void>;
  /** Forgets the bytes. Safe to call after a failure, twice, or after commit is refused. */
  abort(): Promise<void>;
}

export interface BlobStore {
  begin(): Promise<PendingBlob>;
  /** The blob's bytes as a stream of chunks; throws `BlobNotFound` if absent. */
  read(key: string): AsyncIterable<Uint8Array>;
  size(key: string): Promise<number | null>;
  remove(key: string): Promise<void>;
  /** every committed key (for tests and housekeeping) */
  list(): Promise<string[]>;
  /** when the blob was last written, null if absent (housekeeping: orphans get a grace period) */
  modifiedAt(key: string): Promise<Date | null>;
  /**
   * Forgets pending uploads nobody will finish: those of a process that is gone (killed in the
   * middle of an upload) and any untouched for longer than `olderThanMs`. Pending uploads of a
   * live process — this one or another instance sharing the store — are kept.
   * Returns what it removed.
   */
  removeStalePending(opts?: { olderThanMs?: number }): Promise<string[]>;
}

export class BlobNotFound extends Error {
  constructor(readonly key: string) {
    super(`No stored file under "${key}".`);
    this.name = 'BlobNotFound';
  }
}

const KEY_RE = /^[a-z0-9][a-z0-9/_.-]{0,200}$/;

export function checkKey(key: string): string {
  if (!KEY_RE.test(key) || key.includes('..') || key.includes('//')) throw new Error(`Invalid storage key "${key}".`);
  return key;
}

