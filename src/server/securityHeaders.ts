import { createHash } from 'node:crypto';

/**
 * Headers every response carries, and the content security policy of HTML pages.
 *
 * Scripts: only our own files, plus the exact inline scripts Astro writes into a page (each
 * allowed by its SHA-256, computed here from the page itself), plus 'wasm-unsafe-eval' so the
 * CAD kernel's WebAssembly can be compiled — nothing broader (no 'unsafe-inline', no 'unsafe-eval').
 * Styles allow inline style attributes, which the React drawings use for sizes.
 */
export const BASE_HEADERS: Record<string, string> = {
  'x-content-type-options': 'nosniff',
  'referrer-policy': 'strict-origin-when-cross-origin',
  'x-frame-options': 'DENY',
  'cross-origin-opener-policy': 'same-origin',
  'permissions-policy': 'camera=(), microphone=(), geolocation=(), payment=()',
};

export function contentSecurityPolicy(scriptHashes: readonly string[]): string {
  const scripts = ["'self'", "'wasm-unsafe-eval'", ...scriptHashes.map((h) => `'sha256-${h}'`)];
  return [
    "default-src 'self'",
    `script-src ${scripts.join(' ')}`,
    "style-src 'self' 'unsafe-inline'",
    "img-src 'self' data: blob:",
    "font-src 'self'",
    "connect-src 'self'",
    "worker-src 'self' blob:",
    "object-src 'none'",
    "base-uri 'self'",
    "form-action 'self'",
    "frame-ancestors 'none'",
  ].join('; ');
}

const INLINE_SCRIPT = /<script\b(?![^>]*\bsrc=)[^>]*>([\s\S]*?)<\/script>/gi;

/** SHA-256 (base64) of every inline script of a page, as CSP wants them. */
export function inlineScriptHashes(html: string): string[] {
  const out = new Set<string>();
  for (const m of html.matchAll(INLINE_SCRIPT)) {
    if (!m[1]) continue;
    out.add(createHash('sha256').update(m[1], 'utf8').digest('base64'));
  }
  return [...out];
}

/** The same response with the house headers (HTML bodies are read to hash their inline scripts). */
export async function withSecurityHeaders(response: Response): Promise<Response> {
  const headers = new Headers(response.headers);
  for (const [k, v] of Object.entries(BASE_HEADERS)) if (!headers.has(k)) headers.set(k, v);
  const type = headers.get('content-type') ?? '';
  if (!type.includes('text/html') || !response.body) {
    if (!headers.has('content-security-policy')) headers.set('content-security-policy', "default-src 'none'; frame-ancestors 'none'");
    return new Response(response.body, { status: response.status, statusText: response.statusText, headers });
  }
  const html = await response.text();
  headers.set('content-security-policy', contentSecurityPolicy(inlineScriptHashes(html)));
  headers.delete('content-length');
  return new Response(html, { status: response.status, statusText: response.statusText, headers });
}
