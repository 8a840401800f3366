import { createHash } from 'node:crypto';
import { LRUCache } from 'lru-cache';

/**
 * Released files' bytes kept in memory by their sha256, bounded in bytes.
 *
 * Safe to share between users and requests: a stored file never changes (database triggers
 * refuse updates and deletes of artifacts) and the key is the hash of the bytes themselves, so a
 * hit is byte-identical to the row. The cache holds no access decision — every download still
 * checks the caller against the database first — and nothing another instance would need (a
 * miss just reads MariaDB).
 */

const MAX_BYTES = Number(process.env.ARTIFACT_CACHE_BYTES ?? 64 * 1024 * 1024);
/** Larger files are never cached, so one big STEP cannot push every DXF out. */
const MAX_ENTRY_BYTES = Math.min(8 * 1024 * 1024, MAX_BYTES);

const cache = new LRUCache<string, Uint8Array>({
  maxSize: Math.max(1, MAX_BYTES),
  maxEntrySize: Math.max(1, MAX_ENTRY_BYTES),
  sizeCalculation: (b) => Math.max(1, b.byteLength),
});

/** Bytes for this sha256 from memory, or from `load` (kept when the bytes really hash to it). */
export async function artifactBytes(sha256: string, load: () => Promise<Uint8Array | undefined>): Promise<Uint8Array | undefined> {
  const hit = cache.get(sha256);
  if (hit) return hit;
  const bytes = await load();
  if (!bytes) return undefined;
  if (MAX_BYTES > 0 && createHash('sha256').update(bytes).digest('hex') === sha256) cache.set(sha256, bytes);
  return bytes;
}

/** For tests and the benchmark: how full the cache is. */
export function artifactCacheStats(): { entries: number; bytes: number; maxBytes: number } {
  return { entries: cache.size, bytes: cache.calculatedSize, maxBytes: MAX_BYTES };
}

export function clearArtifactCache(): void {
  cache.clear();
}
