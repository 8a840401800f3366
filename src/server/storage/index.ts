/**
 * Where uploaded files live: see types.ts for the interface. Local folder by default.
 */
import { localFolderStore } from './localFolder';
import type { BlobStore } from './types';

export * from './types';
export { localFolderStore, pendingFiles } from './localFolder';

let store: BlobStore | undefined;

/** The upload store: a local folder, `UPLOAD_DIR` or `.data/uploads` under the working directory. */
export function uploadStore(): BlobStore {
  const dir = process.env['UPLOAD' + '_DIR'] || '.data/uploads';
  if (!store || (store as { dir?: string }).dir !== dir) store = localFolderStore(dir);
  return store;
}
