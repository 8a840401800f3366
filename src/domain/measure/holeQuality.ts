/**
 * How good is a fitted hole? From the rim points and their least-squares circle:
 *
 * - radial error eᵢ = ‖pᵢ − c‖ − r against the angle θᵢ about the centre (the polar deviation
 *   plot, binned for drawing);
 * - ovality: the 2nd harmonic of e(θ) — an ellipse of semi-axes a, b has e ≈ ((a − b)/2)·cos 2θ,
 *   so major − minor diameter = 4·|2nd harmonic|;
 * - dent: what the harmonics up to the 2nd do not explain, where it is largest and how wide;
 * - arc coverage: 360° less the widest angular gap without rim points.
 *
 * Flags (limits are ours, common practice for bolt and dowel holes from a scan; every one can be
 * overridden): few points, short arc, RMS, roundness, oval, dent.
 */
import { coverageFromBins } from '../fit/cylinder';
import type { CircleFit } from '../fit/circle';
import { DEG_PER_RAD, normalizeDeg } from '../geometry/degrees';
import { solveSmall } from '../fit/smallMatrix';

export interface HoleLimits {
  readonly minPoints: number;
  readonly minArcDeg: number;
  readonly maxRmsMm: number;
  readonly maxRoundnessMm: number;
  readonly maxOvalityMm: number;
  readonly maxDentMm: number;
}

export const DEFAULT_HOLE_LIMITS: HoleLimits = Object.freeze({
  minPoints: 12,
  minArcDeg: 180,
  maxRmsMm: 0.08,
  maxRoundnessMm: 0.25,
  maxOvalityMm: 0.12,
  maxDentMm: 0.12,
});

export const HOLE_FLAGS = ['few-points', 'short-arc', 'high-rms', 'out-of-round', 'oval', 'dent'] as const;
export type HoleFlag = (typeof HOLE_FLAGS)[number];

export const HOLE_FLAG_TEXT: Readonly<Record<HoleFlag, string>> = Object.freeze({
  'few-points': 'too few rim points',
  'short-arc': 'rim seen on less than half the circle',
  'high-rms': 'rim points scatter widely',
  'out-of-round': 'out of round',
  oval: 'oval',
  dent: 'dented',
});

export interface PolarBins {
  /** bin centre angles, degrees CCW from +u */
  readonly angleDeg: number[];
  /** mean, min and max radial error per bin, mm; null where the bin has no point */
  readonly meanMm: (number | null)[];
  readonly minMm: (number | null)[];
  readonly maxMm: (number | null)[];
}

export interface HoleQuality {
  readonly arcCoverageDeg: number;
  /** major − minor diameter from the 2nd harmonic */
  readonly ovalityMm: number;
  /** direction of the major axis, degrees in [0, 180) */
  readonly ovalityAxisDeg: number;
  /** largest deviation left after the harmonics 0–2 */
  readonly dentMm: number;
  readonly dentAtDeg: number;
  /** robust scatter of the rim points about the harmonic shape */
  readonly noiseMm: number;
  readonly flags: HoleFlag[];
  readonly polar: PolarBins;
}

/**
 * Quality of a circle fitted to 2D points `uv` (interleaved u, v). `indices` restricts to some of
 * them (the rim points); omitted = all.
 */
export function holeQuality(uv: Float64Array, circle: CircleFit, limits: HoleLimits = DEFAULT_HOLE_LIMITS, indices?: Int32Array, bins = 120): HoleQuality {
  const count = indices ? indices.length : uv.length / 2;
  const theta = new Float64Array(count);
  const err = new Float64Array(count);
  const occupied = new Uint8Array(720);
  // normal equations of e(θ) = c0 + c1 cos θ + s1 sin θ + c2 cos 2θ + s2 sin 2θ
  const ata = new Float64Array(25);
  const atb = new Float64Array(5);
  const row = new Float64Array(5);
  for (let k = 0; k < count; k++) {
    const i = indices ? indices[k]! : k;
    const du = uv[2 * i]! - circle.centerX;
    const dv = uv[2 * i + 1]! - circle.centerY;
    const t = Math.atan2(dv, du);
    const e = Math.sqrt(du * du + dv * dv) - circle.radius;
    theta[k] = t;
    err[k] = e;
    occupied[Math.min(719, Math.floor(((t + Math.PI) / (2 * Math.PI)) * 720))] = 1;
    row[0] = 1;
    row[1] = Math.cos(t);
    row[2] = Math.sin(t);
    row[3] = Math.cos(2 * t);
    row[4] = Math.sin(2 * t);
    for (let r = 0; r < 5; r++) {
      atb[r] += row[r]! * e;
      for (let c = 0; c < 5; c++) ata[r * 5 + c] += row[r]! * row[c]!;
    }
  }
  const coverage = coverageFromBins(occupied);
  let coef = count >= 8 ? solveSmall(ata, atb, 5) : null;
  const modelAt = (c: Float64Array | null, t: number) =>
    c ? c[0]! + c[1]! * Math.cos(t) + c[2]! * Math.sin(t) + c[3]! * Math.cos(2 * t) + c[4]! * Math.sin(2 * t) : 0;

  // residual after the harmonic shape
  const resid = new Float64Array(count);
  let dentMm = 0;
  let dentAt = 0;
  for (let k = 0; k < count; k++) {
    const r = err[k]! - modelAt(coef, theta[k]!);
    resid[k] = Math.abs(r);
    if (Math.abs(r) > dentMm) {
      dentMm = Math.abs(r);
      dentAt = theta[k]!;
    }
  }
  const sorted = Float64Array.from(resid).sort();
  const noiseMm = count > 0 ? 1.4826 * sorted[Math.floor(count / 2)]! : 0;
  // a dent stands out of the noise and is local (fewer than a quarter of the points beyond half its depth)
  let beyondHalf = 0;
  for (let k = 0; k < count; k++) if (resid[k]! > dentMm / 2) beyondHalf++;
  const isDent = dentMm > limits.maxDentMm && dentMm > 5 * noiseMm && beyondHalf < count / 4;
  if (isDent && coef) {
    // a dent leaks into the 2nd harmonic: judge ovality without the dented stretch
    ata.fill(0);
    atb.fill(0);
    let kept = 0;
    for (let k = 0; k < count; k++) {
      if (resid[k]! > dentMm / 4) continue;
      const t = theta[k]!;
      row[0] = 1;
      row[1] = Math.cos(t);
      row[2] = Math.sin(t);
      row[3] = Math.cos(2 * t);
      row[4] = Math.sin(2 * t);
      for (let r = 0; r < 5; r++) {
        atb[r] += row[r]! * err[k]!;
        for (let c = 0; c < 5; c++) ata[r * 5 + c] += row[r]! * row[c]!;
      }
      kept++;
    }
    coef = kept >= 8 ? (solveSmall(ata, atb, 5) ?? coef) : coef;
  }
  const c2 = coef ? coef[3]! : 0;
  const s2 = coef ? coef[4]! : 0;
  const ovalityMm = coef && coverage >= 180 ? 4 * Math.hypot(c2, s2) : 0;
  const ovalityAxisDeg = normalizeDeg((Math.atan2(s2, c2) * DEG_PER_RAD) / 2) % 180;

  // the diagnosis first (oval, dent), then what made the fit poor
  const flags: HoleFlag[] = [];
  if (ovalityMm > limits.maxOvalityMm) flags.push('oval');
  if (isDent) flags.push('dent');
  if (circle.roundness > limits.maxRoundnessMm) flags.push('out-of-round');
  if (circle.rms > limits.maxRmsMm) flags.push('high-rms');
  if (coverage < limits.minArcDeg) flags.push('short-arc');
  if (count < limits.minPoints) flags.push('few-points');

  // polar bins
  const angleDeg: number[] = [];
  const sums = new Float64Array(bins);
  const ns = new Int32Array(bins);
  const mins = new Float64Array(bins).fill(Infinity);
  const maxs = new Float64Array(bins).fill(-Infinity);
  for (let k = 0; k < count; k++) {
    const deg = normalizeDeg(theta[k]! * DEG_PER_RAD);
    const b = Math.min(bins - 1, Math.floor((deg / 360) * bins));
    const e = err[k]!;
    sums[b] += e;
    ns[b]++;
    if (e < mins[b]!) mins[b] = e;
    if (e > maxs[b]!) maxs[b] = e;
  }
  const meanMm: (number | null)[] = [];
  const minMm: (number | null)[] = [];
  const maxMm: (number | null)[] = [];
  for (let b = 0; b < bins; b++) {
    angleDeg.push(((b + 0.5) * 360) / bins);
    meanMm.push(ns[b] ? sums[b]! / ns[b]! : null);
    minMm.push(ns[b] ? mins[b]! : null);
    maxMm.push(ns[b] ? maxs[b]! : null);
  }

  return {
    arcCoverageDeg: coverage,
    ovalityMm,
    ovalityAxisDeg,
    dentMm,
    dentAtDeg: normalizeDeg(dentAt * DEG_PER_RAD),
    noiseMm,
    flags,
    polar: { angleDeg, meanMm, minMm, maxMm },
  };
}
