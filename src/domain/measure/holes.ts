/**
 * Holes on a flattened face (points in face coordinates u, v).
 *
 * Automatic finding: the face points are binned into a square grid whose cell is a few point
 * spacings wide; empty cells connected to the outside are the surroundings, and every other
 * connected group of empty cells is an empty region inside the face. Round ones are holes.
 *
 * The rim of a hole is the innermost point in each narrow angular sector about its centre (the
 * edge where the face stops); a geometric circle is fitted to those, the centre moves to the
 * fitted one and the rim is taken again. Isolated strays (one sector far off while its
 * neighbours agree) are dropped; runs of deviating sectors — a dent — are kept and flagged.
 *
 * The same rim logic fits a hole inside a box or lasso the builder draws ('edge'), or all
 * selected points ('all', e.g. a few probed points on the rim).
 */
import { DomainError } from '../errors';
import { fitCircle, type CircleFit } from '../fit/circle';
import { atan2Deg } from '../geometry/degrees';
import { DEFAULT_HOLE_LIMITS, holeQuality, type HoleLimits, type HoleQuality } from './holeQuality';
import { checkRegion, pointsInRegion, regionArea, regionCentre, type Region } from './region';

export interface FittedHole {
  readonly id: string;
  readonly centerU: number;
  readonly centerV: number;
  readonly diameterMm: number;
  readonly rmsMm: number;
  readonly maxDeviationMm: number;
  readonly roundnessMm: number;
  readonly n: number;
  readonly quality: HoleQuality;
  /** indices (into the face points) of the rim points used */
  readonly rim: Int32Array;
}

export interface FindHolesOptions {
  /** holes smaller than this are not looked for; default 3 mm */
  readonly minDiameterMm?: number;
  /** default: 60 % of the face's smaller span */
  readonly maxDiameterMm?: number;
  /** grid cell; default 2 × the estimated point spacing */
  readonly cellMm?: number;
  readonly limits?: Partial<HoleLimits>;
}

export interface RejectedRegion {
  readonly centerU: number;
  readonly centerV: number;
  readonly sizeMm: number;
  readonly reason: string;
}

export interface FoundHoles {
  readonly holes: FittedHole[];
  readonly rejected: RejectedRegion[];
  readonly cellMm: number;
  readonly spacingMm: number;
}

const MAX_GRID_CELLS = 16_000_000;

interface Grid {
  minU: number;
  minV: number;
  cell: number;
  w: number;
  h: number;
  /** CSR: points of cell k are order[start[k] .. start[k + 1]) */
  start: Int32Array;
  order: Int32Array;
}

function bounds(uv: Float64Array, use: Int32Array | null): { minU: number; maxU: number; minV: number; maxV: number } {
  let minU = Infinity;
  let maxU = -Infinity;
  let minV = Infinity;
  let maxV = -Infinity;
  const count = use ? use.length : uv.length / 2;
  for (let k = 0; k < count; k++) {
    const i = use ? use[k]! : k;
    const u = uv[2 * i]!;
    const v = uv[2 * i + 1]!;
    if (u < minU) minU = u;
    if (u > maxU) maxU = u;
    if (v < minV) minV = v;
    if (v > maxV) maxV = v;
  }
  return { minU, maxU, minV, maxV };
}

function occupiedCells(uv: Float64Array, use: Int32Array | null, b: ReturnType<typeof bounds>, cell: number): number {
  const w = Math.floor((b.maxU - b.minU) / cell) + 1;
  const h = Math.floor((b.maxV - b.minV) / cell) + 1;
  const seen = new Uint8Array(w * h);
  let occupied = 0;
  const count = use ? use.length : uv.length / 2;
  for (let k = 0; k < count; k++) {
    const i = use ? use[k]! : k;
    const g = Math.floor((uv[2 * i + 1]! - b.minV) / cell) * w + Math.floor((uv[2 * i]! - b.minU) / cell);
    if (seen[g] === 0) {
      seen[g] = 1;
      occupied++;
    }
  }
  return occupied;
}

/** Mean spacing of points spread over an area: √(occupied area / n), from two grid passes. */
export function estimateSpacing(uv: Float64Array, use: Int32Array | null = null): number {
  const count = use ? use.length : uv.length / 2;
  const b = bounds(uv, use);
  const spanU = b.maxU - b.minU;
  const spanV = b.maxV - b.minV;
  let cell = Math.max(Math.sqrt((Math.max(spanU, 1e-9) * Math.max(spanV, 1e-9)) / count), Math.max(spanU, spanV) / 4000);
  let spacing = cell;
  for (let pass = 0; pass < 2; pass++) {
    const occ = occupiedCells(uv, use, b, cell);
    spacing = Math.sqrt((occ * cell * cell) / count);
    cell = Math.max(2 * spacing, Math.max(spanU, spanV) / 4000);
  }
  return spacing;
}

function buildGrid(uv: Float64Array, b: ReturnType<typeof bounds>, cellWanted: number): Grid {
  let cell = cellWanted;
  let w = 0;
  let h = 0;
  for (;;) {
    // one empty cell of padding all round, so the outside is connected
    w = Math.floor((b.maxU - b.minU) / cell) + 3;
    h = Math.floor((b.maxV - b.minV) / cell) + 3;
    if (w * h <= MAX_GRID_CELLS) break;
    cell *= 1.25;
  }
  const n = uv.length / 2;
  const start = new Int32Array(w * h + 1);
  const cellOf = new Int32Array(n);
  for (let i = 0; i < n; i++) {
    const g = (Math.floor((uv[2 * i + 1]! - b.minV) / cell) + 1) * w + Math.floor((uv[2 * i]! - b.minU) / cell) + 1;
    cellOf[i] = g;
    start[g + 1]++;
  }
  for (let k = 0; k < w * h; k++) start[k + 1] += start[k]!;
  const fill = start.slice(0, w * h);
  const order = new Int32Array(n);
  for (let i = 0; i < n; i++) order[fill[cellOf[i]!]!++] = i;
  return { minU: b.minU, minV: b.minV, cell, w, h, start, order };
}

/** Innermost point in each of `bins` sectors about (cu, cv), within `reach`. Returns point indices. */
function innermostRim(uv: Float64Array, candidates: (visit: (i: number) => void) => void, cu: number, cv: number, reach: number, bins: number): Int32Array {
  const best = new Int32Array(bins).fill(-1);
  const bestD = new Float64Array(bins).fill(Infinity);
  const reach2 = reach * reach;
  candidates((i) => {
    const du = uv[2 * i]! - cu;
    const dv = uv[2 * i + 1]! - cv;
    const d2 = du * du + dv * dv;
    if (d2 > reach2) return;
    const b = Math.min(bins - 1, Math.floor(((Math.atan2(dv, du) + Math.PI) / (2 * Math.PI)) * bins));
    if (d2 < bestD[b]!) {
      bestD[b] = d2;
      best[b] = i;
    }
  });
  let count = 0;
  for (let b = 0; b < bins; b++) if (best[b]! >= 0) count++;
  const out = new Int32Array(count);
  for (let b = 0, k = 0; b < bins; b++) if (best[b]! >= 0) out[k++] = best[b]!;
  return out;
}

function gather(uv: Float64Array, indices: Int32Array): Float64Array {
  const out = new Float64Array(indices.length * 2);
  for (let k = 0; k < indices.length; k++) {
    out[2 * k] = uv[2 * indices[k]!]!;
    out[2 * k + 1] = uv[2 * indices[k]! + 1]!;
  }
  return out;
}

/** Drops isolated strays: far off the circle while both angular neighbours sit on it. */
function dropStrays(uv: Float64Array, rim: Int32Array, c: CircleFit): Int32Array {
  const m = rim.length;
  if (m < 8) return rim;
  const ang = new Float64Array(m);
  const err = new Float64Array(m);
  for (let k = 0; k < m; k++) {
    const du = uv[2 * rim[k]!]! - c.centerX;
    const dv = uv[2 * rim[k]! + 1]! - c.centerY;
    ang[k] = Math.atan2(dv, du);
    err[k] = Math.sqrt(du * du + dv * dv) - c.radius;
  }
  const order = Array.from({ length: m }, (_, k) => k).sort((a, b) => ang[a]! - ang[b]!);
  const abs = Float64Array.from(err, Math.abs).sort();
  const noise = Math.max(1.4826 * abs[m >> 1]!, 1e-9 * c.radius);
  const keep: number[] = [];
  for (let j = 0; j < m; j++) {
    const k = order[j]!;
    const prev = order[(j + m - 1) % m]!;
    const next = order[(j + 1) % m]!;
    const stray = Math.abs(err[k]!) > 6 * noise && Math.abs(err[prev]!) < 3 * noise && Math.abs(err[next]!) < 3 * noise;
    if (!stray) keep.push(rim[k]!);
  }
  return keep.length === m ? rim : Int32Array.from(keep);
}

function sectorsFor(radius: number, spacing: number): number {
  return Math.max(16, Math.min(720, Math.round((2 * Math.PI * radius) / Math.max(spacing, 1e-9))));
}

/**
 * Rim by innermost points, refitted `rounds` times about the moving centre. `visit` enumerates
 * candidate points near (cu, cv).
 */
function fitRim(
  uv: Float64Array,
  visit: (cu: number, cv: number, reach: number) => (f: (i: number) => void) => void,
  cu0: number,
  cv0: number,
  r0: number,
  spacing: number,
  margin: number,
  rounds = 3,
): { circle: CircleFit; rim: Int32Array } {
  let cu = cu0;
  let cv = cv0;
  let r = r0;
  let circle: CircleFit | null = null;
  let rim: Int32Array = new Int32Array(0);
  for (let round = 0; round < rounds; round++) {
    const reach = r + margin;
    rim = innermostRim(uv, visit(cu, cv, reach), cu, cv, reach, sectorsFor(r, spacing));
    if (rim.length < 3) break;
    circle = fitCircle(gather(uv, rim));
    const cleaned = dropStrays(uv, rim, circle);
    if (cleaned.length !== rim.length && cleaned.length >= 3) {
      rim = cleaned;
      circle = fitCircle(gather(uv, rim));
    }
    const moved = Math.hypot(circle.centerX - cu, circle.centerY - cv);
    cu = circle.centerX;
    cv = circle.centerY;
    r = circle.radius;
    if (moved < 1e-3 * spacing && round > 0) break;
  }
  if (!circle) {
    throw new DomainError('measure.hole.noRim', `No rim found around (${cu0.toFixed(2)}, ${cv0.toFixed(2)}): fewer than 3 points bound it.`, ['region']);
  }
  // The innermost point of a sector is the low tail of that sector's rim points. Take every point
  // within 3σ of it (σ: the rim's scatter about its own shape), so the rim is not biased inwards.
  const noise = holeQuality(uv, circle, DEFAULT_HOLE_LIMITS, rim, 8).noiseMm;
  if (noise > 0 && rim.length >= 8) {
    const bins = sectorsFor(circle.radius, spacing);
    const band = rimBand(uv, visit(circle.centerX, circle.centerY, circle.radius + margin), circle, circle.radius + margin, bins, 3 * noise);
    if (band.length >= rim.length) {
      let c2 = fitCircle(gather(uv, band));
      let b2 = dropStrays(uv, band, c2);
      if (b2.length !== band.length && b2.length >= 3) c2 = fitCircle(gather(uv, b2));
      else b2 = band;
      if (Math.hypot(c2.centerX - circle.centerX, c2.centerY - circle.centerY) < Math.max(3 * noise, 0.1 * spacing) + 0.05 * circle.radius) {
        circle = c2;
        rim = b2;
      }
    }
  }
  return { circle, rim };
}

/** Points within `width` of their sector's innermost point, about the circle's centre. */
function rimBand(uv: Float64Array, candidates: (visit: (i: number) => void) => void, c: CircleFit, reach: number, bins: number, width: number): Int32Array {
  const inner = new Float64Array(bins).fill(Infinity);
  const reach2 = reach * reach;
  const sector = (du: number, dv: number) => Math.min(bins - 1, Math.floor(((Math.atan2(dv, du) + Math.PI) / (2 * Math.PI)) * bins));
  candidates((i) => {
    const du = uv[2 * i]! - c.centerX;
    const dv = uv[2 * i + 1]! - c.centerY;
    const d2 = du * du + dv * dv;
    if (d2 > reach2) return;
    const b = sector(du, dv);
    const d = Math.sqrt(d2);
    if (d < inner[b]!) inner[b] = d;
  });
  const picked: number[] = [];
  candidates((i) => {
    const du = uv[2 * i]! - c.centerX;
    const dv = uv[2 * i + 1]! - c.centerY;
    const d2 = du * du + dv * dv;
    if (d2 > reach2) return;
    if (Math.sqrt(d2) <= inner[sector(du, dv)]! + width) picked.push(i);
  });
  return Int32Array.from(picked);
}

function toHole(id: string, uv: Float64Array, circle: CircleFit, rim: Int32Array, limits: HoleLimits): FittedHole {
  return Object.freeze({
    id,
    centerU: circle.centerX,
    centerV: circle.centerY,
    diameterMm: 2 * circle.radius,
    rmsMm: circle.rms,
    maxDeviationMm: circle.maxDeviation,
    roundnessMm: circle.roundness,
    n: circle.n,
    quality: holeQuality(uv, circle, limits, rim),
    rim,
  });
}

/** Automatic hole finding on face points `uv` (interleaved u, v; only points of the face). */
export function findHoles(uv: Float64Array, opts: FindHolesOptions = {}): FoundHoles {
  const n = uv.length / 2;
  if (n < 20) throw new DomainError('measure.hole.tooFewPoints', `Hole finding needs the face's points; only ${n} given.`, ['points']);
  const limits = { ...DEFAULT_HOLE_LIMITS, ...opts.limits };
  const b = bounds(uv, null);
  const spacing = estimateSpacing(uv);
  const cellWanted = opts.cellMm ?? 2 * spacing;
  const grid = buildGrid(uv, b, cellWanted);
  const { w, h, start, order, cell } = grid;
  const minD = opts.minDiameterMm ?? 3;
  const maxD = opts.maxDiameterMm ?? 0.6 * Math.min(b.maxU - b.minU, b.maxV - b.minV);

  // label empty regions: 1 = outside, 2.. = inside the face (4-connected)
  const label = new Int32Array(w * h);
  const queue = new Int32Array(w * h);
  const empty = (k: number) => start[k + 1] === start[k];
  const flood = (seed: number, lab: number): { cells: number; su: number; sv: number; minX: number; maxX: number; minY: number; maxY: number; touches: boolean } => {
    let head = 0;
    let tail = 0;
    queue[tail++] = seed;
    label[seed] = lab;
    const s = { cells: 0, su: 0, sv: 0, minX: Infinity, maxX: -Infinity, minY: Infinity, maxY: -Infinity, touches: false };
    while (head < tail) {
      const k = queue[head++]!;
      const x = k % w;
      const y = (k - x) / w;
      s.cells++;
      s.su += x;
      s.sv += y;
      if (x < s.minX) s.minX = x;
      if (x > s.maxX) s.maxX = x;
      if (y < s.minY) s.minY = y;
      if (y > s.maxY) s.maxY = y;
      if (x === 0 || y === 0 || x === w - 1 || y === h - 1) s.touches = true;
      if (x > 0) visit(k - 1);
      if (x < w - 1) visit(k + 1);
      if (y > 0) visit(k - w);
      if (y < h - 1) visit(k + w);
    }
    return s;
    function visit(q: number) {
      if (label[q] === 0 && empty(q)) {
        label[q] = lab;
        queue[tail++] = q;
      }
    }
  };
  flood(0, 1);

  const candidates = (cu: number, cv: number, reach: number) => (f: (i: number) => void) => {
    const x0 = Math.max(0, Math.floor((cu - reach - b.minU) / cell) + 1);
    const x1 = Math.min(w - 1, Math.floor((cu + reach - b.minU) / cell) + 1);
    const y0 = Math.max(0, Math.floor((cv - reach - b.minV) / cell) + 1);
    const y1 = Math.min(h - 1, Math.floor((cv + reach - b.minV) / cell) + 1);
    for (let y = y0; y <= y1; y++) {
      for (let x = x0; x <= x1; x++) {
        const k = y * w + x;
        for (let j = start[k]!; j < start[k + 1]!; j++) f(order[j]!);
      }
    }
  };

  const holes: { circle: CircleFit; rim: Int32Array }[] = [];
  const rejected: RejectedRegion[] = [];
  let next = 2;
  for (let k = 0; k < w * h; k++) {
    if (label[k] !== 0 || !empty(k)) continue;
    const s = flood(k, next++);
    if (s.touches) continue;
    const cu = b.minU + (s.su / s.cells - 1 + 0.5) * cell;
    const cv = b.minV + (s.sv / s.cells - 1 + 0.5) * cell;
    const areaMm2 = s.cells * cell * cell;
    // the empty cells miss about half a cell at the rim
    const r0 = Math.sqrt(areaMm2 / Math.PI) + cell / 2;
    const bw = s.maxX - s.minX + 1;
    const bh = s.maxY - s.minY + 1;
    if (2 * r0 < minD) continue;
    const size = Math.max(bw, bh) * cell;
    if (2 * r0 > maxD) {
      rejected.push({ centerU: cu, centerV: cv, sizeMm: size, reason: `larger than ${maxD.toFixed(0)} mm: not treated as a hole` });
      continue;
    }
    const aspect = bw / bh;
    const fillRatio = s.cells / ((Math.PI / 4) * bw * bh);
    // shape tests mean little for regions a few cells across: the rim fit judges those
    const small = Math.max(bw, bh) <= 5;
    if (!small && (aspect < 0.6 || aspect > 1 / 0.6 || fillRatio < 0.55)) {
      rejected.push({ centerU: cu, centerV: cv, sizeMm: size, reason: 'not round: a gap in the scan or a slot, not a hole' });
      continue;
    }
    try {
      const fit = fitRim(uv, candidates, cu, cv, r0, spacing, 3 * cell);
      // the fit must stay where the empty region was
      if (Math.hypot(fit.circle.centerX - cu, fit.circle.centerY - cv) > r0) {
        rejected.push({ centerU: cu, centerV: cv, sizeMm: size, reason: 'the rim points do not surround the empty region' });
        continue;
      }
      holes.push(fit);
    } catch (e) {
      if (!(e instanceof DomainError)) throw e;
      rejected.push({ centerU: cu, centerV: cv, sizeMm: size, reason: e.message });
    }
  }

  // number the holes counter-clockwise about their common centre, from +u
  let mu = 0;
  let mv = 0;
  for (const hh of holes) {
    mu += hh.circle.centerX / holes.length;
    mv += hh.circle.centerY / holes.length;
  }
  const angleOf = (c: CircleFit) => (Math.hypot(c.centerX - mu, c.centerY - mv) < 1e-9 ? -1 : atan2Deg(c.centerY - mv, c.centerX - mu));
  holes.sort((p, q) => angleOf(p.circle) - angleOf(q.circle));
  return {
    holes: holes.map((hh, i) => toHole(`H${i + 1}`, uv, hh.circle, hh.rim, limits)),
    rejected,
    cellMm: cell,
    spacingMm: spacing,
  };
}

export interface RegionHoleOptions {
  /** 'edge': the innermost points about the selection's empty middle (scans); 'all': every selected point (probed rims) */
  readonly rim?: 'edge' | 'all';
  readonly limits?: Partial<HoleLimits>;
  readonly id?: string;
  /** restrict to these points (one byte per point, 1 = use), e.g. the face's inliers */
  readonly mask?: Uint8Array;
}

/** Fits the hole inside a box or lasso drawn on the flattened face. */
export function fitHoleInRegion(uv: Float64Array, region: Region, opts: RegionHoleOptions = {}): FittedHole {
  checkRegion(region);
  const limits = { ...DEFAULT_HOLE_LIMITS, ...opts.limits };
  const inside = pointsInRegion(uv, region, opts.mask);
  if (inside.length < 3) {
    throw new DomainError('measure.hole.tooFewPoints', `The selection holds ${inside.length} point${inside.length === 1 ? '' : 's'}; a hole needs at least 3 rim points.`, ['region']);
  }
  return fitHoleFromIndices(uv, inside, { ...opts, limits }, regionCentre(region), regionArea(region));
}

/** Fits a hole to the given points (e.g. one label of a probed file). */
export function fitHoleFromIndices(
  uv: Float64Array,
  indices: Int32Array,
  opts: RegionHoleOptions = {},
  centre?: { u: number; v: number },
  areaMm2?: number,
): FittedHole {
  const limits = { ...DEFAULT_HOLE_LIMITS, ...opts.limits };
  const id = opts.id ?? 'H';
  if (indices.length < 3) {
    throw new DomainError('measure.hole.tooFewPoints', `A hole needs at least 3 points; ${indices.length} given.`, ['points']);
  }
  if ((opts.rim ?? 'edge') === 'all') {
    const circle = fitCircle(gather(uv, indices));
    return toHole(id, uv, circle, indices, limits);
  }
  const b = bounds(uv, indices);
  const c = centre ?? { u: (b.minU + b.maxU) / 2, v: (b.minV + b.maxV) / 2 };
  const area = areaMm2 ?? (b.maxU - b.minU) * (b.maxV - b.minV);
  const spacing = Math.sqrt(area / indices.length);
  // start: the nearest selected point to the centre bounds the empty middle
  let r0 = Infinity;
  for (let k = 0; k < indices.length; k++) {
    const i = indices[k]!;
    r0 = Math.min(r0, Math.hypot(uv[2 * i]! - c.u, uv[2 * i + 1]! - c.v));
  }
  const reachAll = Math.hypot(b.maxU - b.minU, b.maxV - b.minV);
  const visit = () => (f: (i: number) => void) => {
    for (let k = 0; k < indices.length; k++) f(indices[k]!);
  };
  const { circle, rim } = fitRim(uv, visit, c.u, c.v, Math.max(r0, spacing), spacing, reachAll, 4);
  return toHole(id, uv, circle, rim, limits);
}
