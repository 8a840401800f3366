import type { HoleResult } from '../../domain/measure/session';

/**
 * Polar deviation plot: the rim's radial error against the angle about the fitted centre,
 * exaggerated so ovality and dents show. The grey circle is the fitted circle; the line is the
 * rim, pushed out where it is larger and in where it is smaller.
 */
export function MeasurementPolar({ hole, size = 220 }: { hole: HoleResult; size?: number }) {
  const c = size / 2;
  const base = size * 0.32;
  const band = size * 0.13;
  const { angleDeg, meanMm, minMm, maxMm } = hole.polar;
  let worst = 0;
  for (let i = 0; i < angleDeg.length; i++) {
    for (const v of [minMm[i], maxMm[i]]) if (v !== null && v !== undefined) worst = Math.max(worst, Math.abs(v));
  }
  const span = Math.max(worst, 0.005);
  const k = band / span;
  const at = (deg: number, e: number) => {
    const r = base + e * k;
    const t = (deg * Math.PI) / 180;
    return [c + r * Math.cos(t), c - r * Math.sin(t)] as const;
  };
  // the rim as one line through the bins that have points; a gap wider than 30° (rim not seen) breaks it
  const path: string[] = [];
  let lastDeg: number | null = null;
  angleDeg.forEach((a, i) => {
    const e = meanMm[i];
    if (e === null || e === undefined) return;
    const [x, y] = at(a, e);
    path.push(`${lastDeg === null || a - lastDeg > 30 ? 'M' : 'L'}${x.toFixed(1)},${y.toFixed(1)}`);
    lastDeg = a;
  });
  if (hole.arcCoverageDeg > 330 && path.length > 2) path.push('Z');
  const label = span >= 0.1 ? `${span.toFixed(2)} mm` : `${(span * 1000).toFixed(0)} µm`;
  return (
    <figure className="inline-block" aria-label={`Polar deviation of hole ${hole.id}`}>
      <svg width={size} height={size} viewBox={`0 0 ${size} ${size}`} role="img" className="rounded bg-white">
        <title>{`Radial deviation of ${hole.id}: largest ${label}`}</title>
        <circle cx={c} cy={c} r={base + band} fill="none" stroke="#dfe5e8" strokeDasharray="3 3" />
        <circle cx={c} cy={c} r={base - band} fill="none" stroke="#dfe5e8" strokeDasharray="3 3" />
        <circle cx={c} cy={c} r={base} fill="none" stroke="#8fb7c9" strokeWidth={1.5} />
        <line x1={c - 6} y1={c} x2={c + 6} y2={c} stroke="#8fb7c9" />
        <line x1={c} y1={c - 6} x2={c} y2={c + 6} stroke="#8fb7c9" />
        <path d={path.join(' ')} fill="none" stroke={hole.flags.length ? '#c98a00' : '#1d3a4a'} strokeWidth={2} strokeLinejoin="round" />
        <text x={c + base + band + 2} y={c - 3} fontSize={10} fill="#4f8199">0°</text>
        <text x={4} y={size - 6} fontSize={10} fill="#2f5a70">{`dashed rings: ±${label}`}</text>
      </svg>
      <figcaption className="mt-1 max-w-[220px] text-xs text-plate-700">
        {hole.id}: Ø {hole.diameterMm.toFixed(3)} mm · oval {hole.ovalityMm.toFixed(3)} mm · largest dent {hole.dentMm.toFixed(3)} mm at {hole.dentAtDeg.toFixed(0)}°
      </figcaption>
    </figure>
  );
}
