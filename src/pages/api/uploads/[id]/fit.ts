import type { APIRoute } from 'astro';
import { isDomainError } from '~/domain/errors';
import { fitRequestSchema } from '~/domain/measure/fitRequest';
import { requireRole } from '~/server/auth/guard';
import { getDb } from '~/server/db/client';
import { AppError, handle, idParam, readBody } from '~/server/errors';
import { json } from '~/server/http';
import { loadSession } from '~/server/measure/clouds';
import { getUpload } from '~/server/measure/repo';
import { uploadStore } from '~/server/storage';

/**
 * Fits on an upload — the same code as the browser worker:
 * `{kind: 'plane'}`, `{kind: 'holes'}`, `{kind: 'circle', region | label}`, `{kind: 'cylinder', region | label}`.
 * Answers carry the face frame (origin, u, v, w) so results map back to the file's space.
 */
export const POST: APIRoute = ({ locals, params, request }) =>
  handle(async () => {
    const g = requireRole(locals);
    if (!g.ok) return g.response;
    const upload = await getUpload(getDb(), g.user, idParam(params.id, 'Upload'));
    const body = await readBody(request, fitRequestSchema, 200_000);
    const session = await loadSession(upload, uploadStore());
    try {
      return json({ uploadId: upload.id, units: 'mm', result: session.run(body) });
    } catch (e) {
      if (isDomainError(e)) throw new AppError(422, e.code, e.message, e.path ? { path: e.path } : {});
      throw e;
    }
  });
