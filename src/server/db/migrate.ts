import mysql from 'mysql2/promise';
import { drizzle } from 'drizzle-orm/mysql2';
import { migrate } from 'drizzle-orm/mysql2/migrator';
import { fileURLToPath } from 'node:url';
import { databaseUrl } from './config';

/** Apply every migration in drizzle/ over one connection (the migrator wants a single connection). */
export async function runMigrations(url = databaseUrl()): Promise<void> {
  const connection = await mysql.createConnection({ uri: url, multipleStatements: true });
  try {
    const folder = fileURLToPath(new URL('../../../drizzle', import.meta.url));
    await migrate(drizzle(connection), { migrationsFolder: process.env.MIGRATIONS_DIR ?? folder });
  } finally {
    await connection.end();
  }
}
