/**
 * The plate as the kernel will build it: every round feature and pocket broken into
 * non-overlapping void "columns" (a 2D region removed between two heights), plus the checks that
 * a layout must pass before any kernel call. Pure TypeScript; shared by the analytic volume and
 * both build strategies, so the three can never disagree about what a feature means.
 */
import type { OutlineSegment, PlateProfile, ProfileHole, ProfilePocket, Point2 } from '../domain/profileTypes';
import {
  chainClosureGapMm,
  chainSignedAreaMm2,
  distanceToSegmentMm,
  pointInChain,
  pointOnSegment,
} from '../domain/exports/outlineMath';
import { PlateBuildError } from './errors';

/** smallest wall the kernel model accepts between two features or a feature and the edge, mm */
export const MIN_KERNEL_WALL_MM = 0.05;

export type ColumnKind = 'hole' | 'counterbore' | 'pocket';

export interface CircleColumn {
  readonly shape: 'circle';
  readonly kind: Exclude<ColumnKind, 'pocket'>;
  readonly featureId: string;
  readonly center: Point2;
  readonly radiusMm: number;
  readonly z0: number;
  readonly z1: number;
  /** the column's lower end opens into this pocket's floor (not onto a plate face) */
  readonly bottomPocket?: string;
  /** the column's upper end opens into this pocket's floor */
  readonly topPocket?: string;
}

export interface PocketColumn {
  readonly shape: 'chain';
  readonly kind: 'pocket';
  readonly featureId: string;
  readonly outline: readonly OutlineSegment[];
  readonly areaMm2: number;
  readonly z0: number;
  readonly z1: number;
}

export type VoidColumn = CircleColumn | PocketColumn;

export interface LayoutReport {
  /** columns of every feature, non-overlapping in 3D by construction (when errors is empty) */
  readonly columns: readonly VoidColumn[];
  /** fatal: the plate cannot be built as specified */
  readonly errors: readonly PlateBuildError[];
  /** true when the direct B-rep build applies (nothing blind or counterbored inside a pocket) */
  readonly directSafe: boolean;
  /** why the direct B-rep does not apply */
  readonly directBlockers: readonly string[];
}

const EPS = 1e-9;

function holeLabel(h: ProfileHole): string {
  switch (h.operation) {
    case 'centreBore':
      return `centre bore ${h.id}`;
    case 'starterBore':
      return `starter bore ${h.id}`;
    case 'dowelReam':
      return `dowel hole ${h.id}`;
    case 'tapDrill':
      return `tapped hole ${h.id}`;
    default:
      return `hole ${h.id}`;
  }
}

function sideRange(side: 'engine' | 'transmission', depth: number, t: number): [number, number] {
  return side === 'engine' ? [0, depth] : [t - depth, t];
}

function fmt(v: number): string {
  return (Math.round(v * 1000) / 1000).toString();
}

/** Minimum distance from a point to a closed chain. */
function distanceToChainMm(chain: readonly OutlineSegment[], p: Point2): number {
  let d = Infinity;
  for (const s of chain) d = Math.min(d, distanceToSegmentMm(s, p));
  return d;
}

/** Sample points along a chain (for chain-vs-chain clearance checks). */
function sampleChain(chain: readonly OutlineSegment[], stepMm = 1): Point2[] {
  const pts: Point2[] = [];
  for (const s of chain) {
    const len = s.kind === 'line' ? Math.hypot(s.end.x - s.start.x, s.end.y - s.start.y) : Math.abs(s.radiusMm) * 2 * Math.PI;
    const n = Math.max(4, Math.ceil(len / stepMm));
    for (let i = 0; i < n; i++) pts.push(pointOnSegment(s, i / n));
  }
  return pts;
}

/**
 * Checks the layout and breaks it into columns. Never throws for a layout problem: returns the
 * problems as errors (each names the feature id) so a caller can show them all at once.
 */
export function analyseLayout(profile: PlateProfile): LayoutReport {
  const errors: PlateBuildError[] = [];
  const blockers: string[] = [];
  const t = profile.thicknessMm;
  const c = profile.edgeChamferMm;
  const columns: VoidColumn[] = [];

  if (!(t > 0)) errors.push(new PlateBuildError('thickness', `The plate thickness must be positive (got ${t} mm).`));
  if (!(c >= 0) || 2 * c >= t) {
    errors.push(
      new PlateBuildError('chamfer-too-large', `The edge chamfer of ${c} mm must be less than half the plate thickness (${fmt(t)} mm).`),
    );
  }
  if (profile.outline.length === 0 || chainClosureGapMm(profile.outline) > 1e-6) {
    errors.push(new PlateBuildError('outline-open', 'The plate outline is not a closed chain: every segment must end where the next one starts.'));
    return { columns, errors, directSafe: false, directBlockers: ['outline'] };
  }
  if (chainSignedAreaMm2(profile.outline) <= 0) {
    errors.push(new PlateBuildError('outline-orientation', 'The plate outline must run counter-clockwise (it encloses no positive area).'));
    return { columns, errors, directSafe: false, directBlockers: ['outline'] };
  }

  // ---- pockets
  for (const p of profile.pockets) {
    if (p.outline.length === 0 || chainClosureGapMm(p.outline) > 1e-6 || chainSignedAreaMm2(p.outline) <= 0) {
      errors.push(new PlateBuildError('pocket-outline', `Pocket ${p.id}: its outline must be a closed counter-clockwise chain.`, [p.id]));
      continue;
    }
    if (!(p.depthMm > 0) || p.depthMm >= t - MIN_KERNEL_WALL_MM) {
      errors.push(
        new PlateBuildError(
          'pocket-depth',
          `Pocket ${p.id} is ${fmt(p.depthMm)} mm deep in a ${fmt(t)} mm plate: it must be shallower than the plate (leave a floor).`,
          [p.id],
        ),
      );
      continue;
    }
    const pts = sampleChain(p.outline);
    const outside = pts.some((q) => !pointInChain(profile.outline, q) || distanceToChainMm(profile.outline, q) < c + MIN_KERNEL_WALL_MM);
    if (outside) {
      errors.push(
        new PlateBuildError('pocket-outline-break', `Pocket ${p.id} breaks through the plate outline (or its edge chamfer): move it inward.`, [p.id]),
      );
      continue;
    }
    const [z0, z1] = sideRange(p.fromSide, p.depthMm, t);
    columns.push({ shape: 'chain', kind: 'pocket', featureId: p.id, outline: p.outline, areaMm2: chainSignedAreaMm2(p.outline), z0, z1 });
  }
  const pocketCols = columns.filter((x): x is PocketColumn => x.shape === 'chain');
  for (let i = 0; i < pocketCols.length; i++) {
    for (let j = i + 1; j < pocketCols.length; j++) {
      const a = pocketCols[i]!;
      const b = pocketCols[j]!;
      const touch =
        sampleChain(a.outline).some((q) => pointInChain(b.outline, q) || distanceToChainMm(b.outline, q) < MIN_KERNEL_WALL_MM) ||
        sampleChain(b.outline).some((q) => pointInChain(a.outline, q));
      if (touch) errors.push(new PlateBuildError('feature-overlap', `Pocket ${a.featureId} overlaps pocket ${b.featureId}.`, [a.featureId, b.featureId]));
    }
  }

  // ---- round features
  const holeCols: CircleColumn[][] = [];
  const holeIds: ProfileHole[] = [];
  for (const h of profile.holes) {
    const cols: CircleColumn[] = [];
    const r = h.diameterMm / 2;
    const label = holeLabel(h);
    if (!(h.diameterMm > 0)) {
      errors.push(new PlateBuildError('hole-diameter', `The diameter of ${label} must be positive.`, [h.id]));
      continue;
    }
    let holeDepth = t;
    if (h.depthMm !== null) {
      if (!(h.depthMm > 0) || h.depthMm >= t - MIN_KERNEL_WALL_MM) {
        errors.push(
          new PlateBuildError(
            'hole-depth',
            `The depth of ${label} (${fmt(h.depthMm)} mm) must be between 0 and the plate thickness ${fmt(t)} mm; make it a through hole if it should go through.`,
            [h.id],
          ),
        );
        continue;
      }
      holeDepth = h.depthMm;
    }
    const cb = h.counterbore;
    if (cb) {
      if (!(cb.diameterMm > h.diameterMm + 2 * MIN_KERNEL_WALL_MM)) {
        errors.push(
          new PlateBuildError('counterbore-diameter', `The counterbore of ${label} (Ø${fmt(cb.diameterMm)}) must be larger than the hole (Ø${fmt(h.diameterMm)}).`, [h.id]),
        );
        continue;
      }
      const limit = h.depthMm === null || cb.fromSide !== h.fromSide ? t : holeDepth;
      if (!(cb.depthMm > 0) || cb.depthMm >= limit - MIN_KERNEL_WALL_MM) {
        errors.push(
          new PlateBuildError(
            'counterbore-depth',
            `The counterbore of ${label} is ${fmt(cb.depthMm)} mm deep: it must be shallower than ${h.depthMm === null ? `the plate (${fmt(t)} mm)` : `the hole (${fmt(holeDepth)} mm)`}.`,
            [h.id],
          ),
        );
        continue;
      }
      if (h.depthMm !== null && cb.fromSide !== h.fromSide) {
        errors.push(new PlateBuildError('counterbore-side', `The counterbore of blind ${label} must be on the side the hole is drilled from.`, [h.id]));
        continue;
      }
      const [c0, c1] = sideRange(cb.fromSide, cb.depthMm, t);
      cols.push({ shape: 'circle', kind: 'counterbore', featureId: h.id, center: h.center, radiusMm: cb.diameterMm / 2, z0: c0, z1: c1 });
      // the hole continues beyond the counterbore floor
      if (h.depthMm === null) {
        const [h0, h1] = cb.fromSide === 'engine' ? [cb.depthMm, t] : [0, t - cb.depthMm];
        cols.push({ shape: 'circle', kind: 'hole', featureId: h.id, center: h.center, radiusMm: r, z0: h0, z1: h1 });
      } else {
        const [h0, h1] = h.fromSide === 'engine' ? [cb.depthMm, holeDepth] : [t - holeDepth, t - cb.depthMm];
        cols.push({ shape: 'circle', kind: 'hole', featureId: h.id, center: h.center, radiusMm: r, z0: h0, z1: h1 });
      }
    } else {
      const [h0, h1] = h.depthMm === null ? [0, t] : sideRange(h.fromSide, holeDepth, t);
      cols.push({ shape: 'circle', kind: 'hole', featureId: h.id, center: h.center, radiusMm: r, z0: h0, z1: h1 });
    }

    // against the outline (and its edge chamfer)
    const inside = pointInChain(profile.outline, h.center);
    const dEdge = distanceToChainMm(profile.outline, h.center);
    let broke = false;
    for (const col of cols) {
      if (!inside || dEdge < col.radiusMm + c + MIN_KERNEL_WALL_MM) {
        const what = col.kind === 'counterbore' ? `The counterbore of ${label}` : label.charAt(0).toUpperCase() + label.slice(1);
        const why = !inside || dEdge < col.radiusMm ? 'breaks through the plate outline' : 'cuts into the edge chamfer';
        errors.push(
          new PlateBuildError(
            col.kind === 'counterbore' ? 'counterbore-outline-break' : 'hole-outline-break',
            `${what} ${why}: move it at least ${fmt(col.radiusMm + c + MIN_KERNEL_WALL_MM - (inside ? dEdge : -dEdge))} mm inward or make it smaller.`,
            [h.id],
          ),
        );
        broke = true;
        break;
      }
    }
    if (broke) continue;

    // against pockets: a round feature is either clear of a pocket or wholly inside its floor
    let bad = false;
    const adjusted: CircleColumn[] = [];
    for (const col of cols) {
      let z0 = col.z0;
      let z1 = col.z1;
      let bottomPocket: string | undefined;
      let topPocket: string | undefined;
      for (const p of pocketCols) {
        if (p.z1 <= z0 + EPS || p.z0 >= z1 - EPS) continue; // no common height
        const dp = distanceToChainMm(p.outline, col.center);
        const within = pointInChain(p.outline, col.center);
        if (dp < col.radiusMm + MIN_KERNEL_WALL_MM) {
          const what = col.kind === 'counterbore' ? `The counterbore of ${label}` : label.charAt(0).toUpperCase() + label.slice(1);
          errors.push(new PlateBuildError('feature-overlap', `${what} cuts across the wall of pocket ${p.featureId}: move it clear of the pocket or fully into it.`, [h.id, p.featureId]));
          bad = true;
          break;
        }
        if (within) {
          // a plain through hole opens into the pocket floor (the direct build handles that);
          // a blind hole or a counterbore inside a pocket goes to the boolean build
          if (h.depthMm !== null || col.kind === 'counterbore') blockers.push(`${h.id} (blind or counterbored) lies in pocket ${p.featureId}`);
          // the pocket already removed its height range from this column
          if (p.z0 <= z0 + EPS) {
            z0 = Math.max(z0, p.z1);
            bottomPocket = p.featureId;
          } else if (p.z1 >= z1 - EPS) {
            z1 = Math.min(z1, p.z0);
            topPocket = p.featureId;
          }
        }
      }
      if (bad) break;
      if (z1 > z0 + EPS) {
        adjusted.push({ ...col, z0, z1, ...(bottomPocket ? { bottomPocket } : {}), ...(topPocket ? { topPocket } : {}) });
      }
    }
    if (bad) continue;
    holeCols.push(adjusted);
    holeIds.push(h);
  }

  // round features against each other
  for (let i = 0; i < holeCols.length; i++) {
    for (let j = i + 1; j < holeCols.length; j++) {
      const a = holeIds[i]!;
      const b = holeIds[j]!;
      const dist = Math.hypot(a.center.x - b.center.x, a.center.y - b.center.y);
      let clash = false;
      for (const ca of holeCols[i]!) {
        for (const cbc of holeCols[j]!) {
          if (ca.z1 <= cbc.z0 + EPS || cbc.z1 <= ca.z0 + EPS) continue;
          if (dist < ca.radiusMm + cbc.radiusMm + MIN_KERNEL_WALL_MM) clash = true;
        }
      }
      if (clash) {
        errors.push(
          new PlateBuildError('feature-overlap', `${holeLabel(a).replace(/^./, (s) => s.toUpperCase())} overlaps ${holeLabel(b)} (centres ${fmt(dist)} mm apart).`, [a.id, b.id]),
        );
      }
    }
  }
  for (const cols of holeCols) columns.push(...cols);
  return { columns, errors, directSafe: errors.length === 0 && blockers.length === 0, directBlockers: blockers };
}

export function pocketById(profile: PlateProfile, id: string): ProfilePocket | undefined {
  return profile.pockets.find((p) => p.id === id);
}
