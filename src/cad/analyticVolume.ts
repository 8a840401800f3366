/**
 * The plate's volume computed in 2D, exactly: the chamfered blank minus every void column.
 * Every kernel build is compared against this number.
 *
 * Blank with a 45° chamfer c on both outer edges. The outline offset inward by d has area
 *   A(d) = A − P·d + K·d²,  K = Σ(arc sweeps)/2 + Σ(sharp corners) tan(turn/2)
 * (Steiner's formula for parallel curves; mitred corners for line–line corners), so each chamfer
 * band holds ∫₀ᶜ A(d) dd = A·c − P·c²/2 + K·c³/3 and the blank is
 *   V = A·t − P·c² + (2/3)·K·c³.
 */
import type { PlateProfile } from '../domain/profileTypes';
import { arcSweepRad, chainPerimeterMm, chainSignedAreaMm2 } from '../domain/exports/outlineMath';
import { chainCorners } from './offsetOutline';
import type { VoidColumn } from './plateModel';
import { analyseLayout } from './plateModel';

export function chamferCurvatureTerm(profile: PlateProfile): number {
  let k = 0;
  for (const s of profile.outline) if (s.kind === 'arc') k += arcSweepRad(s) / 2;
  for (const c of chainCorners(profile.outline)) if (!c.tangent) k += Math.tan(c.turnRad / 2);
  return k;
}

export function blankVolumeMm3(profile: PlateProfile): number {
  const a = chainSignedAreaMm2(profile.outline);
  const t = profile.thicknessMm;
  const c = profile.edgeChamferMm;
  if (c === 0) return a * t;
  const p = chainPerimeterMm(profile.outline);
  return a * t - p * c * c + (2 / 3) * chamferCurvatureTerm(profile) * c * c * c;
}

export function columnVolumeMm3(col: VoidColumn): number {
  const area = col.shape === 'circle' ? Math.PI * col.radiusMm * col.radiusMm : col.areaMm2;
  return area * (col.z1 - col.z0);
}

/** Volume of the finished plate, mm³ (throws the first layout error when the layout is invalid). */
export function analyticVolumeMm3(profile: PlateProfile, columns?: readonly VoidColumn[]): number {
  let cols = columns;
  if (!cols) {
    const report = analyseLayout(profile);
    if (report.errors.length > 0) throw report.errors[0];
    cols = report.columns;
  }
  let v = blankVolumeMm3(profile);
  for (const col of cols) v -= columnVolumeMm3(col);
  return v;
}
