/**
 * The gate on an order's `inspected` state: a part of the order's revision must have passed
 * inspection (or been accepted with a deviation by an engineer) after the order was paid, i.e.
 * inspected for this order and against this approved revision. A newer failed inspection with
 * nothing passed after it blocks the step. One inspection serves one order: an inspection that
 * already let another order become `inspected` does not count again (two orders of the same
 * revision are two parts, each inspected).
 */
import { desc, eq } from 'drizzle-orm';
import type { Db, Tx } from '../db/client';
import { inspections, orders } from '../db/schema';

export type InspectionResult = { status: 'passed' | 'accepted' | 'failed' | 'none'; detail: string; inspectionId?: number };

export async function inspectionResultForOrder(db: Db | Tx, order: { id: number; revisionId: number; paidAt: Date | null }): Promise<InspectionResult> {
  const rows = await db
    .select({ id: inspections.id, state: inspections.state, completedAt: inspections.completedAt, acceptedAt: inspections.acceptedAt, usedBy: orders.id })
    .from(inspections)
    .leftJoin(orders, eq(orders.inspectionId, inspections.id))
    .where(eq(inspections.revisionId, order.revisionId))
    .orderBy(desc(inspections.id))
    .limit(200);
  const since = order.paidAt?.getTime() ?? 0;
  // A failed inspection older than one another order has used belongs to that order's part (it
  // was inspected again and passed); only what came after it can be this order's part.
  const lastUsedElsewhere = Math.max(0, ...rows.filter((r) => r.usedBy !== null && r.usedBy !== order.id).map((r) => r.id));
  const finished = rows.filter(
    (r) => r.state !== 'in_progress' && (r.usedBy === null || r.usedBy === order.id) && r.id > lastUsedElsewhere && (r.acceptedAt ?? r.completedAt ?? new Date(0)).getTime() >= since,
  );
  const ok = finished.find((r) => r.state === 'passed' || r.state === 'accepted_with_deviation');
  if (ok) return { status: ok.state === 'passed' ? 'passed' : 'accepted', detail: `inspection ${ok.id} ${ok.state === 'passed' ? 'passed' : 'accepted with deviation'}`, inspectionId: ok.id };
  const failed = finished.find((r) => r.state === 'failed');
  if (failed) return { status: 'failed', detail: `inspection ${failed.id} failed`, inspectionId: failed.id };
  return { status: 'none', detail: 'no finished inspection of this revision since the order was paid that another order has not used' };
}
