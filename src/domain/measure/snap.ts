/**
 * Snapping a measured hole to the nearest standard size: a clearance hole for a bolt (ISO 273 /
 * ASME B18.2.8 tables) or the tap drill of a tapped hole (a scan of a threaded hole sees the
 * thread's crests, i.e. about the drilled size). The difference is shown so the builder can
 * judge: a hole 0.4 mm off every size is worth a second look.
 */
import { clearanceHole, CLEARANCE_CLASSES, type ClearanceClass } from '../standards/clearanceHoles';
import { tapDrill, TAP_DRILL_THREADS } from '../standards/tapDrills';
import { METRIC_NOMINALS, UNIFIED_NOMINALS } from '../standards/threads';

export interface StandardHoleSize {
  /** 'clearance': the flange's hole lets a bolt through; 'tapped': the flange's hole is threaded */
  readonly kind: 'clearance' | 'tapped';
  /** the bolt or thread, e.g. 'M10', '3/8', 'M10x1.5', '3/8-16 UNC' */
  readonly fastener: string;
  readonly system: 'metric' | 'inch';
  readonly fitClass: ClearanceClass | null;
  readonly diameterMm: number;
  /** e.g. 'ISO 273 medium', 'tap drill 8.5 mm' */
  readonly label: string;
}

export interface SnappedSize extends StandardHoleSize {
  /** measured − standard, mm */
  readonly differenceMm: number;
}

let table: StandardHoleSize[] | null = null;

/** Every standard size known to the tables, smallest first. */
export function standardHoleSizes(): readonly StandardHoleSize[] {
  if (table) return table;
  const out: StandardHoleSize[] = [];
  const seen = new Set<string>();
  for (const nominal of [...METRIC_NOMINALS, ...UNIFIED_NOMINALS]) {
    for (const cls of CLEARANCE_CLASSES) {
      try {
        const c = clearanceHole(nominal, cls);
        const key = `${c.nominal}/${c.fitClass}`;
        if (seen.has(key)) continue;
        seen.add(key);
        const metric = c.standard === 'ISO 273';
        out.push({ kind: 'clearance', fastener: c.nominal, system: metric ? 'metric' : 'inch', fitClass: c.fitClass, diameterMm: c.diameterMm, label: `${c.standard} ${c.fitClass}` });
      } catch {
        // size not in the clearance table
      }
    }
  }
  for (const thread of TAP_DRILL_THREADS) {
    const t = tapDrill(thread);
    out.push({ kind: 'tapped', fastener: t.thread, system: thread.startsWith('M') ? 'metric' : 'inch', fitClass: null, diameterMm: t.drillMm, label: `tap drill ${t.drillLabel}` });
  }
  out.sort((a, b) => a.diameterMm - b.diameterMm);
  table = out;
  return out;
}

export interface SnapOptions {
  readonly system?: 'metric' | 'inch' | 'any';
  readonly kind?: 'clearance' | 'tapped' | 'any';
  /** how many candidates to return, nearest first */
  readonly count?: number;
}

/** Nearest standard sizes to a measured diameter, nearest first. */
export function snapHoleSize(measuredMm: number, opts: SnapOptions = {}): SnappedSize[] {
  const system = opts.system ?? 'any';
  const kind = opts.kind ?? 'any';
  return standardHoleSizes()
    .filter((s) => (system === 'any' || s.system === system) && (kind === 'any' || s.kind === kind))
    .map((s) => ({ ...s, differenceMm: measuredMm - s.diameterMm }))
    .sort((a, b) => Math.abs(a.differenceMm) - Math.abs(b.differenceMm))
    .slice(0, opts.count ?? 3);
}
