import { jsonError } from '../http';

/** A refusal the caller can act on: HTTP status, stable code, a sentence for people, field messages. */
export class AuthError extends Error {
  constructor(
    public readonly status: number,
    public readonly code: string,
    message: string,
    public readonly fields?: Record<string, string>,
    public readonly headers: Record<string, string> = {},
  ) {
    super(message);
    this.name = 'AuthError';
  }
}

function isDbDown(err: unknown): boolean {
  const code = (err as { code?: string } | null)?.code ?? (err as { cause?: { code?: string } } | null)?.cause?.code;
  return ['ECONNREFUSED', 'PROTOCOL_CONNECTION_LOST', 'ETIMEDOUT', 'ER_CON_COUNT_ERROR'].includes(code ?? '');
}

/** Turn anything a service threw into the house JSON error. Unexpected errors are logged (never the body). */
export function errorResponse(err: unknown): Response {
  if (err instanceof AuthError) {
    const r = jsonError(err.status, err.code, err.message, err.fields);
    for (const [k, v] of Object.entries(err.headers)) r.headers.set(k, v);
    return r;
  }
  if (isDbDown(err)) return jsonError(503, 'unavailable', 'The database is not answering; nothing was changed. Try again in a moment.');
  console.error(`[platewright] unexpected error: ${err instanceof Error ? err.stack ?? err.message : String(err)}`);
  return jsonError(500, 'internal', 'Something went wrong on the server; nothing was changed.');
}

/** The same, as a sentence for a page. */
export function errorMessage(err: unknown): { status: number; message: string; fields?: Record<string, string> } {
  if (err instanceof AuthError) return { status: err.status, message: err.message, fields: err.fields };
  if (isDbDown(err)) return { status: 503, message: 'The database is not answering; nothing was changed. Try again in a moment.' };
  console.error(`[platewright] unexpected error: ${err instanceof Error ? err.stack ?? err.message : String(err)}`);
  return { status: 500, message: 'Something went wrong on the server; nothing was changed.' };
}
