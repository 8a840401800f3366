import { Lucia, TimeSpan } from 'lucia';
import { DrizzleMySQLAdapter } from '@lucia-auth/adapter-drizzle';
import { getDb } from '../db/client';
import { sessions, users, type Role } from '../db/schema';
import { authConfig } from '../config';

// The only file that constructs the session library. Everything else goes through ./session.ts,
// so the library can be replaced without touching pages or endpoints.

export const SESSION_COOKIE = 'platewright_session';

function createLucia() {
  const config = authConfig();
  return new Lucia(new DrizzleMySQLAdapter(getDb(), sessions, users), {
    sessionExpiresIn: new TimeSpan(config.sessionDays, 'd'),
    sessionCookie: {
      name: SESSION_COOKIE,
      expires: true,
      attributes: { secure: config.production, sameSite: 'lax', path: '/' },
    },
    getUserAttributes: (a) => ({ email: a.email, name: a.name, role: a.role, active: a.active }),
  });
}

let instance: ReturnType<typeof createLucia> | undefined;

export function lucia(): ReturnType<typeof createLucia> {
  instance ??= createLucia();
  return instance;
}

declare module 'lucia' {
  interface Register {
    Lucia: ReturnType<typeof createLucia>;
    DatabaseUserAttributes: { email: string; name: string; role: Role; active: boolean };
  }
}
