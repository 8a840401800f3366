/** Helpers for the measurement upload tests: multipart posts with the session cookie and Origin. */
import type { ApiClient } from './auth';

export async function postUpload(
  client: ApiClient,
  projectId: number,
  file: { name: string; bytes: Uint8Array | string } | null,
  fields: Record<string, string> = { units: 'mm' },
): Promise<{ status: number; body: any }> {
  const form = new FormData();
  for (const [k, v] of Object.entries(fields)) form.append(k, v);
  if (file) form.append('file', new Blob([(typeof file.bytes === 'string' ? new TextEncoder().encode(file.bytes) : file.bytes) as BlobPart]), file.name);
  const headers: Record<string, string> = { origin: client.base, accept: 'application/json' };
  if (client.cookies.size) headers.cookie = [...client.cookies].map(([k, v]) => `${k}=${v}`).join('; ');
  const r = await fetch(`${client.base}/api/projects/${projectId}/uploads`, { method: 'POST', headers, body: form });
  const text = await r.text();
  let body: unknown = text;
  try {
    body = JSON.parse(text);
  } catch {
    /* keep text */
  }
  return { status: r.status, body };
}
