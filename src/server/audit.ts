import type { Db, Tx } from './db/client';
import { auditEvents } from './db/schema';

/** What happened, to what. Details never hold a password, a hash or a token. */
export interface AuditEntry {
  actorId: string | null;
  action: string;
  targetType: string;
  targetId: string;
  details?: Record<string, unknown>;
}

export async function audit(db: Db | Tx, entry: AuditEntry): Promise<void> {
  await db.insert(auditEvents).values({
    actorId: entry.actorId,
    action: entry.action,
    targetType: entry.targetType,
    targetId: entry.targetId.slice(0, 64),
    details: entry.details ?? {},
  });
}
