import { authConfig } from './config';

/** The app's public address for links (APP_URL when set, else the address the request came to). */
export function appBase(request: Request): string {
  try {
    const configured = authConfig().appUrl;
    if (configured) return configured;
  } catch {
    /* config problems are reported at start */
  }
  return new URL(request.url).origin;
}
