import { customType } from 'drizzle-orm/mysql-core';

/**
 * JSON column that always comes back parsed. MariaDB stores JSON as LONGTEXT with a json_valid
 * check, and some driver versions hand it back as a string; this accepts both.
 * Repositories still validate the parsed value with zod before trusting it.
 */
export const jsonDoc = <T>(name: string) =>
  customType<{ data: T; driverData: string }>({
    dataType() {
      return 'json';
    },
    toDriver(value: T): string {
      return JSON.stringify(value);
    },
    fromDriver(value: unknown): T {
      return (typeof value === 'string' ? JSON.parse(value) : value) as T;
    },
  })(name);

/** LONGBLOB (drizzle 0.45 has no blob type for MySQL). Buffers round-trip unchanged. */
export const longblob = (name: string) =>
  customType<{ data: Buffer; driverData: Buffer }>({
    dataType() {
      return 'longblob';
    },
    toDriver(value: Buffer): Buffer {
      return value;
    },
    fromDriver(value: unknown): Buffer {
      return Buffer.isBuffer(value) ? value : Buffer.from(value as Uint8Array);
    },
  })(name);
