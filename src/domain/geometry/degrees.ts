/**
 * Angles in degrees, the unit used everywhere in the domain. Sines and cosines of multiples of
 * 90° come out exact (no 6e-17 left-overs on the axes).
 */

export const DEG_PER_RAD = 180 / Math.PI;

/** Wraps an angle into [0, 360). */
export function normalizeDeg(angleDeg: number): number {
  const a = angleDeg % 360;
  const r = a < 0 ? a + 360 : a;
  // -1e-15 % 360 + 360 rounds to 360
  return r >= 360 ? 0 : r === 0 ? 0 : r;
}

/** Wraps an angle difference into (−180, 180]. */
export function wrapDeltaDeg(deltaDeg: number): number {
  const a = normalizeDeg(deltaDeg);
  return a > 180 ? a - 360 : a;
}

function quarterTurns(angleDeg: number): number | null {
  const q = angleDeg / 90;
  return Number.isInteger(q) ? ((q % 4) + 4) % 4 : null;
}

export function cosDeg(angleDeg: number): number {
  const q = quarterTurns(angleDeg);
  if (q !== null) return [1, 0, -1, 0][q]!;
  return Math.cos(angleDeg / DEG_PER_RAD);
}

export function sinDeg(angleDeg: number): number {
  const q = quarterTurns(angleDeg);
  if (q !== null) return [0, 1, 0, -1][q]!;
  return Math.sin(angleDeg / DEG_PER_RAD);
}

/** atan2 in degrees, in [0, 360). */
export function atan2Deg(y: number, x: number): number {
  return normalizeDeg(Math.atan2(y, x) * DEG_PER_RAD);
}
