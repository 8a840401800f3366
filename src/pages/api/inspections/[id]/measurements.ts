import type { APIRoute } from 'astro';
import { z } from 'zod';
import { requireRole } from '~/server/auth/guard';
import { getDb } from '~/server/db/client';
import { AppError, handle, idParam, readBody } from '~/server/errors';
import { json } from '~/server/http';
import { measurementRowSchema, parseInspectionCsv } from '~/domain/inspection';
import { getInspection, RowsRejected, saveMeasurements } from '~/server/repos/inspections';
import { findRevision } from '~/server/repos/revisions';
import { planOfRevision } from '~/server/repos/inspections';
import { notifyInspection } from '~/server/inspectionNotify';

const bodySchema = z.strictObject({
  rows: z.array(measurementRowSchema).max(2000),
  /** close the inspection with this save: passed or failed */
  finish: z.boolean().default(false),
});

const MAX_CSV_BYTES = 2_000_000;

/**
 * Replace the inspection's measurements: JSON `{ rows, finish? }` or a `text/csv` body
 * (`?finish=1` to close). Answers the per-feature results and the overall result.
 */
export const PUT: APIRoute = ({ locals, params, request, url }) =>
  handle(async () => {
    const g = requireRole(locals, 'machinist');
    if (!g.ok) return g.response;
    const id = idParam(params.id, 'Inspection');
    const db = getDb();
    const type = (request.headers.get('content-type') ?? '').toLowerCase();
    let rows;
    let finish = false;
    let source: 'JSON' | 'CSV' = 'JSON';
    if (type.startsWith('text/csv') || type.startsWith('text/plain')) {
      source = 'CSV';
      const text = await request.text();
      if (text.length > MAX_CSV_BYTES) throw new AppError(413, 'too_large', `The CSV is larger than ${MAX_CSV_BYTES / 1000} kB.`);
      const view = await getInspection(db, g.user, id);
      const rev = await findRevision(db, view.revision.id);
      const parsed = parseInspectionCsv(text, planOfRevision(rev!.spec).plan);
      if (parsed.errors.length) throw new RowsRejected(parsed.errors, 'CSV');
      rows = [...parsed.rows];
      finish = ['1', 'true', 'yes'].includes(url.searchParams.get('finish') ?? '');
    } else {
      const body = await readBody(request, bodySchema);
      rows = body.rows;
      finish = body.finish;
    }
    const out = await saveMeasurements(db, g.user, id, rows, { finish, source });
    let notified = null;
    if (out.completed) {
      const view = await getInspection(db, g.user, id);
      notified = await notifyInspection({ inspectionId: id, revisionId: view.revision.id, partNumber: view.plate.partNumber, revision: view.revision.number, state: out.state, failing: out.result.failing });
    }
    return json({ id, state: out.state, overall: out.overall, results: out.results, counts: out.result.counts, failing: out.result.failing, features: out.result.features, notified });
  });
