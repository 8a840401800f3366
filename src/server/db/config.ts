/**
 * Where the database is. DATABASE_URL wins; otherwise the private local instance started by
 * scripts/db.sh (DB_HOST/DB_PORT/DB_NAME/DB_USER/DB_PASSWORD with the same defaults).
 */
export function databaseUrl(env: Record<string, string | undefined> = process.env): string {
  if (env.DATABASE_URL) return env.DATABASE_URL;
  const host = env.DB_HOST ?? '127.0.0.1';
  const port = env.DB_PORT ?? '3406';
  const name = env.DB_NAME ?? 'platewright';
  const user = env.DB_USER ?? 'platewright';
  const password = env.DB_PASSWORD ?? 'platewright-local';
  return `mysql://${encodeURIComponent(user)}:${encodeURIComponent(password)}@${host}:${port}/${name}`;
}
