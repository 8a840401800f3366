/// <reference path="../.astro/types.d.ts" />

declare namespace App {
  interface Locals {
    /** the signed-in user, worked out by src/middleware.ts (null when anonymous) */
    user: import('./server/auth/types').SessionUser | null;
    session: import('./server/auth/types').SessionInfo | null;
    /** true when the session could not be checked because the database did not answer */
    sessionUnavailable?: boolean;
  }
}
