/**
 * Loaded measurements for the fit API: the stored file parsed again with every point kept,
 * scaled to mm, in a MeasureSession. A few recent ones stay in memory (by total points) so a
 * series of fits on one scan parses it once.
 */
import { MeasureFileParser } from '~/domain/measure/formats';
import { MeasureSession, scaleToMm } from '~/domain/measure/session';
import { MM_SCALE } from '~/domain/measure/unitsHint';
import type { BlobStore } from '~/server/storage';
import { measureError } from './ingest';
import type { UploadView } from './repo';

const MAX_CACHED_POINTS = 8_000_000;
const cache = new Map<string, { session: MeasureSession; points: number }>();

export async function loadSession(upload: UploadView & { storageKey: string }, store: BlobStore): Promise<MeasureSession> {
  const key = `${upload.id}:${upload.sha256}`;
  const hit = cache.get(key);
  if (hit) {
    cache.delete(key);
    cache.set(key, hit);
    return hit.session;
  }
  const parser = new MeasureFileParser({ fileName: upload.fileName, keep: true, maxPoints: Math.max(upload.summary.pointCount, 1), sizeHint: upload.summary.pointCount });
  try {
    for await (const chunk of store.read(upload.storageKey)) parser.push(chunk);
  } catch (e) {
    throw measureError(e, upload.fileName);
  }
  const parsed = parser.end();
  const points = scaleToMm(parsed.points!, MM_SCALE[upload.summary.units]);
  const session = new MeasureSession(points, { names: parsed.labels, index: parsed.labelIndex });
  cache.set(key, { session, points: parsed.count });
  let total = 0;
  for (const v of cache.values()) total += v.points;
  for (const [k, v] of cache) {
    if (total <= MAX_CACHED_POINTS || cache.size <= 1) break;
    cache.delete(k);
    total -= v.points;
  }
  return session;
}
