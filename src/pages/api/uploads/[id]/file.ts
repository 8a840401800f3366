import type { APIRoute } from 'astro';
import { requireRole } from '~/server/auth/guard';
import { getDb } from '~/server/db/client';
import { handle, idParam } from '~/server/errors';
import { getUpload } from '~/server/measure/repo';
import { uploadStore } from '~/server/storage';

/** The stored file as uploaded (the browser worker parses and fits it locally). */
export const GET: APIRoute = ({ locals, params }) =>
  handle(async () => {
    const g = requireRole(locals);
    if (!g.ok) return g.response;
    const upload = await getUpload(getDb(), g.user, idParam(params.id, 'Upload'));
    const iterator = uploadStore().read(upload.storageKey)[Symbol.asyncIterator]();
    const body = new ReadableStream<Uint8Array>({
      async pull(controller) {
        const { value, done } = await iterator.next();
        if (done) controller.close();
        else controller.enqueue(value);
      },
      async cancel() {
        await iterator.return?.();
      },
    });
    return new Response(body, {
      headers: {
        'content-type': 'application/octet-stream',
        'content-length': String(upload.sizeBytes),
        'content-disposition': `attachment; filename="${upload.fileName.replace(/[^\w.-]/g, '_')}"`,
        'cache-control': 'private, max-age=31536000, immutable',
        etag: `"${upload.sha256}"`,
      },
    });
  });
