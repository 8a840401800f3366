import type { Db, Tx } from '../db/client';
import { auditEvents } from '../db/schema';

export async function audit(
  db: Db | Tx,
  actorId: string | null,
  action: string,
  target: { type: string; id: string | number },
  details: Record<string, unknown> = {},
): Promise<void> {
  await db.insert(auditEvents).values({ actorId, action, targetType: target.type, targetId: String(target.id), details });
}
