import { describe, expect, it } from 'vitest';
import { createHash } from 'node:crypto';
import { contentSecurityPolicy, inlineScriptHashes, withSecurityHeaders } from '../../src/server/securityHeaders';

describe('content security policy', () => {
  it('allows our scripts, WebAssembly compilation and the page’s own inline scripts by hash — nothing broader', () => {
    const csp = contentSecurityPolicy(['abc=']);
    const script = csp.split('; ').find((d) => d.startsWith('script-src '))!;
    expect(script.split(' ').slice(1).sort()).toEqual(["'self'", "'sha256-abc='", "'wasm-unsafe-eval'"].sort());
    expect(csp).not.toMatch(/'unsafe-eval'/);
    expect(script).not.toMatch(/unsafe-inline/);
    expect(csp).toContain("frame-ancestors 'none'");
    expect(csp).toContain("object-src 'none'");
  });

  it('hashes exactly the inline scripts of a page (CSP Level 3: base64 SHA-256 of the script text)', () => {
    const html = '<html><script type="module" src="/_astro/a.js"></script><script>console.log(1)</script><script type="module">import "x"</script></html>';
    const expected = ['console.log(1)', 'import "x"'].map((t) => createHash('sha256').update(t).digest('base64'));
    expect(inlineScriptHashes(html).sort()).toEqual(expected.sort());
  });

  it('puts the headers on HTML and on other answers', async () => {
    const page = await withSecurityHeaders(new Response('<p>x</p><script>go()</script>', { headers: { 'content-type': 'text/html' } }));
    expect(page.headers.get('content-security-policy')).toContain(`'sha256-${createHash('sha256').update('go()').digest('base64')}'`);
    expect(page.headers.get('x-content-type-options')).toBe('nosniff');
    expect(page.headers.get('referrer-policy')).toBe('strict-origin-when-cross-origin');
    expect(await page.text()).toBe('<p>x</p><script>go()</script>');
    const api = await withSecurityHeaders(new Response('{}', { headers: { 'content-type': 'application/json' } }));
    expect(api.headers.get('content-security-policy')).toBe("default-src 'none'; frame-ancestors 'none'");
    expect(api.headers.get('x-frame-options')).toBe('DENY');
  });
});
