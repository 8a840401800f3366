/** JSON responses with the house error shape `{ error: { code, message, fields? } }`. */
export function json(body: unknown, status = 200, headers: Record<string, string> = {}): Response {
  return new Response(JSON.stringify(body), {
    status,
    headers: { 'content-type': 'application/json; charset=utf-8', 'cache-control': 'no-store', ...headers },
  });
}

export function jsonError(
  status: number,
  code: string,
  message: string,
  fields?: Record<string, string>,
): Response {
  return json({ error: fields ? { code, message, fields } : { code, message } }, status);
}
