/**
 * The hole table as CSV (RFC 4180 quoting, CRLF line ends), plate coordinates in millimetres.
 *  - `face` is the side of the plate the operation is machined from (engine | transmission);
 *  - `operation` is through | tapDrill | dowelReam | centreBore | starterBore | counterbore;
 *  - `depth_mm` is empty for a through operation;
 *  - a counterbored hole has two rows with the same id: the hole, then its counterbore.
 */
import type { PlateProfile } from '../profileTypes';
import { holeTable } from './holeTable';

export const HOLE_TABLE_CSV_HEADER = 'id,face,operation,x_mm,y_mm,diameter_mm,thread,depth_mm';

function field(v: string): string {
  return /[",\r\n]/.test(v) ? `"${v.replace(/"/g, '""')}"` : v;
}

/** Fixed-point millimetres: 4 decimals (0.1 µm), trailing zeros dropped. */
export function csvMm(v: number): string {
  const r = Math.round(v * 1e4) / 1e4;
  return String(Object.is(r, -0) ? 0 : r);
}

export function holeTableCsv(profile: PlateProfile): string {
  const lines = [HOLE_TABLE_CSV_HEADER];
  for (const r of holeTable(profile)) {
    lines.push(
      [
        field(r.id),
        r.side,
        r.operation,
        csvMm(r.xMm),
        csvMm(r.yMm),
        csvMm(r.diameterMm),
        field(r.thread ?? ''),
        r.depthMm === null ? '' : csvMm(r.depthMm),
      ].join(','),
    );
  }
  return lines.join('\r\n') + '\r\n';
}
