/**
 * The hole table: one row per machining operation on a round feature, in plate coordinates
 * (origin on the crank axis, seen from the transmission side). A counterbored hole gives two
 * rows with the same feature id: the hole, then its counterbore. Used by the CSV, the drawing
 * and the DXF layer plan, so the three always agree.
 */
import type { HoleOperation, PlateProfile, PlateSide, ProfileHole } from '../profileTypes';

export type TableOperation = HoleOperation | 'counterbore';

export interface HoleTableRow {
  readonly id: string;
  /** which flange pattern the feature belongs to */
  readonly pattern: ProfileHole['face'];
  /** the side of the plate this operation is machined from */
  readonly side: PlateSide;
  readonly operation: TableOperation;
  readonly xMm: number;
  readonly yMm: number;
  readonly diameterMm: number;
  readonly thread: string | null;
  readonly threadDepthMm: number | null;
  /** null = through */
  readonly depthMm: number | null;
  readonly fit: { readonly designation: string; readonly lowerMm: number; readonly upperMm: number } | null;
}

const OPERATION_ORDER: Record<TableOperation, number> = {
  centreBore: 0,
  starterBore: 1,
  dowelReam: 2,
  through: 3,
  tapDrill: 4,
  counterbore: 5,
};

/** Natural order of ids: C1, D1, D2 … D10, E1 … */
export function compareFeatureIds(a: string, b: string): number {
  const ma = /^([A-Za-z]*)(\d*)(.*)$/.exec(a)!;
  const mb = /^([A-Za-z]*)(\d*)(.*)$/.exec(b)!;
  if (ma[1] !== mb[1]) return ma[1]! < mb[1]! ? -1 : 1;
  const na = ma[2] ? Number(ma[2]) : -1;
  const nb = mb[2] ? Number(mb[2]) : -1;
  if (na !== nb) return na - nb;
  return ma[3]! < mb[3]! ? -1 : ma[3]! > mb[3]! ? 1 : 0;
}

export function holeTable(profile: PlateProfile): HoleTableRow[] {
  const rows: HoleTableRow[] = [];
  const holes = [...profile.holes].sort((a, b) => compareFeatureIds(a.id, b.id));
  for (const h of holes) {
    rows.push({
      id: h.id,
      pattern: h.face,
      side: h.fromSide,
      operation: h.operation,
      xMm: h.center.x,
      yMm: h.center.y,
      diameterMm: h.diameterMm,
      thread: h.thread ?? null,
      threadDepthMm: h.threadDepthMm ?? null,
      depthMm: h.depthMm,
      fit: h.fit ?? null,
    });
    if (h.counterbore) {
      rows.push({
        id: h.id,
        pattern: h.face,
        side: h.counterbore.fromSide,
        operation: 'counterbore',
        xMm: h.center.x,
        yMm: h.center.y,
        diameterMm: h.counterbore.diameterMm,
        thread: null,
        threadDepthMm: null,
        depthMm: h.counterbore.depthMm,
        fit: null,
      });
    }
  }
  return rows;
}

export { OPERATION_ORDER };
