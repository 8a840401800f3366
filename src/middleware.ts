import { defineMiddleware, sequence } from 'astro:middleware';
import { authConfig, ConfigError } from './server/config';
import { identify } from './server/auth/session';
import { withSecurityHeaders } from './server/securityHeaders';
import { cleanUploadStoreOnce } from './server/measure/housekeeping';

// Works out WHO is asking (locals.user / locals.session) and nothing else: every page and endpoint
// enforces its own rule with requireRole / requirePageRole (src/server/auth/guard.ts).

let configChecked = false;

/** Settings that cannot work stop the server at once, with the reason, rather than half-serving. */
const settings = defineMiddleware((_ctx, next) => {
  if (!configChecked) {
    try {
      authConfig();
      configChecked = true;
      void cleanUploadStoreOnce(); // what a killed process left in the upload store (runs in the background)
    } catch (err) {
      if (err instanceof ConfigError) {
        console.error(`[platewright] ${err.message}`);
        process.exit(1);
      }
      throw err;
    }
  }
  return next();
});

const who = defineMiddleware(async (ctx, next) => {
  ctx.locals.user = null;
  ctx.locals.session = null;
  ctx.locals.sessionUnavailable = false;
  try {
    const found = await identify(ctx.cookies);
    ctx.locals.user = found.user;
    ctx.locals.session = found.session;
  } catch (err) {
    // Database unreachable: treat the caller as anonymous for this request and keep the cookie;
    // guarded routes answer 503 (not 401) so nobody is sent to sign in again for nothing.
    ctx.locals.sessionUnavailable = !!ctx.cookies.get('platewright_session')?.value;
    console.error(`[platewright] could not check the session: ${err instanceof Error ? err.message : String(err)}`);
  }
  return next();
});

/**
 * Cross-site requests that change state are refused whatever their content type. Astro's own
 * origin check covers form posts; this also covers JSON and other bodies. Requests without an
 * Origin header are refused when the browser marks them Sec-Fetch-Site: cross-site; others
 * (server-to-server, such as the payment webhook) are left to their endpoint.
 */
const sameOrigin = defineMiddleware((ctx, next) => {
  const method = ctx.request.method;
  if (method === 'GET' || method === 'HEAD' || method === 'OPTIONS') return next();
  const origin = ctx.request.headers.get('origin');
  // A browser that leaves out Origin still says where the request comes from in Sec-Fetch-Site.
  const crossSite = origin ? origin !== ctx.url.origin : ctx.request.headers.get('sec-fetch-site') === 'cross-site';
  if (crossSite) {
    return new Response(JSON.stringify({ error: { code: 'cross_site', message: 'Cross-site requests that change data are refused.' } }), {
      status: 403,
      headers: { 'content-type': 'application/json; charset=utf-8' },
    });
  }
  return next();
});

/** Security headers on every answer (CSP, nosniff, referrer policy, no framing). */
const secure = defineMiddleware(async (_ctx, next) => withSecurityHeaders(await next()));

export const onRequest = sequence(secure, sameOrigin, settings, who);
