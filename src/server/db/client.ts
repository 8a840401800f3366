import mysql from 'mysql2/promise';
import { drizzle, type MySql2Database } from 'drizzle-orm/mysql2';
import * as schema from './schema';
import * as relations from './relations';
import { databaseUrl } from './config';

const fullSchema = { ...schema, ...relations };
export type Db = MySql2Database<typeof fullSchema>;
/** A transaction handle: repositories take `Db | Tx`. */
export type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];

let pool: mysql.Pool | undefined;
let db: Db | undefined;

/** One pool per process, well under MariaDB's max_connections. */
export function getPool(): mysql.Pool {
  if (!pool) {
    pool = mysql.createPool({
      uri: databaseUrl(),
      connectionLimit: Number(process.env.DB_POOL_SIZE ?? 10),
      waitForConnections: true,
      queueLimit: 500,
      connectTimeout: 3000,
      enableKeepAlive: true,
      timezone: 'Z',
      dateStrings: false,
      supportBigNumbers: true,
    });
  }
  return pool;
}

export function getDb(): Db {
  if (!db) db = drizzle(getPool(), { schema: fullSchema, mode: 'default' });
  return db;
}

export async function closeDb(): Promise<void> {
  const p = pool;
  pool = undefined;
  db = undefined;
  if (p) await p.end();
}

/** Is the database answering? Never throws; a short timeout so health checks stay fast. */
export async function pingDb(timeoutMs = 2000): Promise<boolean> {
  try {
    const p = getPool();
    const ping = p.query('SELECT 1');
    const timer = new Promise<never>((_, reject) => setTimeout(() => reject(new Error('timeout')), timeoutMs));
    await Promise.race([ping, timer]);
    return true;
  } catch {
    return false;
  }
}
