import { eq } from 'drizzle-orm';
import { randomBytes } from 'node:crypto';
import type { Db } from '../../src/server/db/client';
import { users, type Role } from '../../src/server/db/schema';
import { hashPassword } from '../../src/server/auth/password';
import { newId } from '../../src/server/seed';

/** An HTTP client with one cookie jar, sending the Origin header the server's origin check wants. */
export class ApiClient {
  cookies = new Map<string, string>();
  lastSetCookies: string[] = [];
  constructor(public readonly base: string) {}

  get sessionCookie(): string | undefined {
    return this.cookies.get('platewright_session');
  }

  async request(method: string, path: string, body?: unknown, headers: Record<string, string> = {}): Promise<{ status: number; body: any; headers: Headers }> {
    const h: Record<string, string> = { accept: 'application/json', ...headers };
    if (method !== 'GET' && method !== 'HEAD') h.origin ??= this.base;
    if (body !== undefined) h['content-type'] ??= 'application/json';
    if (this.cookies.size) h.cookie = [...this.cookies].map(([k, v]) => `${k}=${v}`).join('; ');
    const r = await fetch(this.base + path, { method, headers: h, body: body === undefined ? undefined : typeof body === 'string' ? body : JSON.stringify(body), redirect: 'manual' });
    this.lastSetCookies = r.headers.getSetCookie();
    for (const c of this.lastSetCookies) {
      const [pair] = c.split(';');
      const i = pair.indexOf('=');
      const name = pair.slice(0, i).trim();
      const value = pair.slice(i + 1).trim();
      if (value === '' || /max-age=0/i.test(c)) this.cookies.delete(name);
      else this.cookies.set(name, value);
    }
    const text = await r.text();
    let parsed: unknown = text;
    try {
      parsed = text ? JSON.parse(text) : null;
    } catch {
      /* not JSON: keep the text */
    }
    return { status: r.status, body: parsed, headers: r.headers };
  }

  get(path: string) {
    return this.request('GET', path);
  }
  post(path: string, body?: unknown, headers?: Record<string, string>) {
    return this.request('POST', path, body ?? {}, headers);
  }
  patch(path: string, body?: unknown) {
    return this.request('PATCH', path, body ?? {});
  }

  async signIn(email: string, password: string) {
    return this.post('/api/auth/sign-in', { email, password });
  }
}

export const tag = () => randomBytes(4).toString('hex');

/** An invented user straight into the database (the API has no "create user" but invitations). */
export async function makeUser(db: Db, opts: { role: Role; password: string; active?: boolean; email?: string; name?: string }) {
  const id = newId();
  const email = opts.email ?? `${opts.role}-${tag()}@example.test`;
  await db.insert(users).values({
    id,
    email,
    name: opts.name ?? `Test ${opts.role} ${email.slice(0, 6)}`,
    role: opts.role,
    active: opts.active ?? true,
    passwordHash: await hashPassword(opts.password),
  });
  return { id, email, password: opts.password, role: opts.role };
}

export async function userRow(db: Db, id: string) {
  const [u] = await db.select().from(users).where(eq(users.id, id));
  return u;
}
