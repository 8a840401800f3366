import type { APIRoute } from 'astro';
import { pingDb } from '~/server/db/client';
import { json } from '~/server/http';
import { APP_VERSION } from '~/server/version';

/** Liveness + database reachability. Public; reveals nothing but up/down and the version. */
export const GET: APIRoute = async () => {
  const up = await pingDb();
  return up
    ? json({ ok: true, db: 'up', version: APP_VERSION })
    : json({ ok: false, db: 'down', version: APP_VERSION }, 503);
};
