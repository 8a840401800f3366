import type { AstroCookies } from 'astro';

// A one-time message carried across a POST → redirect → GET (so a reload never repeats an action).
const NAME = 'platewright_flash';

export function setFlash(cookies: AstroCookies, message: string, path: string): void {
  cookies.set(NAME, encodeURIComponent(message.slice(0, 300)), { path, httpOnly: true, sameSite: 'lax', maxAge: 60 });
}

export function takeFlash(cookies: AstroCookies, path: string): string | null {
  const raw = cookies.get(NAME)?.value;
  if (!raw) return null;
  cookies.delete(NAME, { path });
  try {
    return decodeURIComponent(raw);
  } catch {
    return null;
  }
}
