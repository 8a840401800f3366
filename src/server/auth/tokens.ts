import { createHmac, randomBytes } from 'node:crypto';
import { authConfig } from '../config';

/** A new one-time token for an e-mailed link: 32 random bytes, URL-safe (43 characters). */
export function newToken(): string {
  return randomBytes(32).toString('base64url');
}

/** What the database keeps instead of the token: HMAC-SHA-256 under APP_SECRET, 64 hex digits. */
export function tokenHash(token: string): string {
  return createHmac('sha256', authConfig().secret).update(token, 'utf8').digest('hex');
}

/** Tokens we hand out are exactly this shape; anything else is refused before touching the database. */
export function looksLikeToken(token: string | undefined): token is string {
  return typeof token === 'string' && /^[A-Za-z0-9_-]{43}$/.test(token);
}
