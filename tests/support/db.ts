import { execFileSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';

const ROOT = fileURLToPath(new URL('../..', import.meta.url));

/** Stop / start the test MariaDB instance (the one scripts/test.sh started, same env). */
export function testDb(action: 'start' | 'stop' | 'status'): string {
  if (!process.env.DB_DIR || !process.env.DB_DIR.includes('test')) {
    throw new Error('refusing to control a database that is not the test instance (DB_DIR must be the test folder)');
  }
  return execFileSync('bash', ['scripts/db.sh', action], { cwd: ROOT, env: process.env, encoding: 'utf8' });
}
