import { z } from 'zod';
import { json, jsonError } from './http';
import { isFatalKernelError, isPlateBuildError } from '../cad/errors';

/** A failure the caller can act on, with its HTTP status. Thrown by repositories, answered by `handle`. */
export class AppError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly extra: Record<string, unknown> = {},
  ) {
    super(message);
    this.name = 'AppError';
  }
}

export const notFound = (what: string) => new AppError(404, 'not_found', `${what} not found.`);
export const forbidden = (message: string) => new AppError(403, 'forbidden', message);

/** The message for a field the endpoint does not know (a typo, or a field of another endpoint). */
export function unknownFieldMessage(key: string): string {
  return `unknown field "${key.length > 60 ? key.slice(0, 60) + '…' : key}": this request does not take it; remove it or check its spelling`;
}

/** MariaDB went away (stopped, restarting, pool exhausted): the request fails cleanly with 503. */
function isDatabaseDown(e: unknown): boolean {
  const code = (e as { code?: string })?.code ?? (e as { cause?: { code?: string } })?.cause?.code;
  return ['ECONNREFUSED', 'PROTOCOL_CONNECTION_LOST', 'ETIMEDOUT', 'ECONNRESET', 'ER_CON_COUNT_ERROR', 'EPIPE'].includes(code ?? '');
}

/** Run an endpoint body; AppError → its status, zod errors → 400 with fields, anything else → 500 without internals. */
export async function handle(fn: () => Promise<Response>): Promise<Response> {
  try {
    return await fn();
  } catch (e) {
    if (e instanceof AppError) return json({ error: { code: e.code, message: e.message, ...e.extra } }, e.status);
    if (e instanceof z.ZodError) {
      const fields: Record<string, string> = {};
      const parts: string[] = [];
      for (const issue of e.issues) {
        if (issue.code === 'unrecognized_keys') {
          for (const k of issue.keys) {
            const where = [...issue.path, k].map(String).join('.');
            fields[where] = unknownFieldMessage(where);
            parts.unshift(fields[where]); // named first: the list below may be cut short
          }
        } else {
          const where = issue.path.join('.') || '(body)';
          fields[where] = issue.message;
          parts.push(`${where}: ${issue.message}`);
        }
      }
      return jsonError(400, 'invalid_input', 'The request is not valid: ' + parts.slice(0, 10).join('; '), fields);
    }
    // the CAD kernel: a plate it cannot build answers what to change; a kernel that broke (out of
    // memory, crash) has been restarted, so the request can simply be repeated
    if (isPlateBuildError(e)) {
      return isFatalKernelError(e)
        ? jsonError(503, 'kernel_unavailable', e.message)
        : json({ error: { code: 'plate_not_buildable', message: e.message, featureIds: [...e.featureIds] } }, 422);
    }
    if (isDatabaseDown(e)) return jsonError(503, 'database_unavailable', 'The database is not reachable right now; nothing was changed. Try again in a moment.');
    console.error('[platewright] unexpected error:', e instanceof Error ? e.message : String(e));
    return jsonError(500, 'internal', 'Something went wrong on our side; nothing was changed.');
  }
}

/** Read a JSON body with a zod schema; bad JSON and unknown fields answer 400 with a message. */
export async function readBody<T extends z.ZodType>(request: Request, schema: T, maxBytes = 2_000_000): Promise<z.infer<T>> {
  const length = Number(request.headers.get('content-length') ?? 0);
  if (length > maxBytes) throw new AppError(413, 'too_large', `The request body is larger than ${Math.round(maxBytes / 1000)} kB.`);
  const text = await request.text();
  if (text.length > maxBytes) throw new AppError(413, 'too_large', `The request body is larger than ${Math.round(maxBytes / 1000)} kB.`);
  let data: unknown;
  try {
    data = text.length ? JSON.parse(text) : {};
  } catch {
    throw new AppError(400, 'invalid_json', 'The request body is not valid JSON.');
  }
  return schema.parse(data);
}

/** Route parameter as a positive integer id, or 404. */
export function idParam(value: string | undefined, what: string): number {
  const n = Number(value);
  if (!value || !Number.isSafeInteger(n) || n <= 0) throw notFound(what);
  return n;
}
