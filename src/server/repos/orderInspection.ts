/**
 * The gate on an order's `inspected` state: the part must have passed (or been accepted at)
 * inspection against the approved revision.
 *
 * NOT WIRED YET: the inspection records are being built separately (an `inspections` table in
 * src/server/db/schema.ts). Until `inspectionResultForOrder` reads them it answers `unknown`, and
 * the shop then has to write who inspected the part and what was found (`inspectionNote`), which
 * goes into the audit trail. Wire it by making this function look up the newest inspection of
 * the order's revision and return 'passed' | 'accepted' | 'failed'.
 */
import type { Db, Tx } from '../db/client';

export type InspectionResult = { status: 'passed' | 'accepted' | 'failed'; detail: string } | { status: 'unknown'; detail: string };

export async function inspectionResultForOrder(_db: Db | Tx, _order: { id: number; revisionId: number }): Promise<InspectionResult> {
  return { status: 'unknown', detail: 'inspection records are not connected to orders yet' };
}
