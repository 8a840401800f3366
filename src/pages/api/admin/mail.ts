import type { APIRoute } from 'astro';
import { json, jsonError } from '~/server/http';
import { requireRole } from '~/server/auth/guard';
import { errorResponse } from '~/server/auth/errors';
import { listCapturedMail } from '~/server/mail/captured';
import { capturedMailDir } from '~/server/auth/request';

/** GET → {messages:[…]} caught by the local mail catcher, newest first. Admins only; 404 unless the app runs with the catcher. */
export const GET: APIRoute = async ({ locals }) => {
  const g = requireRole(locals, 'admin');
  if (!g.ok) return g.response;
  const dir = capturedMailDir();
  if (!dir) return jsonError(404, 'no_mail_catcher', 'This server sends real e-mail; there is no captured mail to show.');
  try {
    return json({ messages: await listCapturedMail(dir) });
  } catch (err) {
    return errorResponse(err);
  }
};
