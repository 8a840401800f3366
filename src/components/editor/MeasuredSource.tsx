import type { PlateSpecInput } from '~/domain';
import { HOLE_FLAG_TEXT, type HoleFlag } from '~/domain/measure/holeQuality';
import { showLength, type DisplayUnits } from '~/domain/editor/units';
import type { FaceKey } from '~/domain/editor/specOps';

/**
 * Where the measured holes of a face came from: one line per bolt circle fitted from a scan
 * (diameter, scatter, angular scatter, offset from the bore axis) and one row per measured hole
 * (the fit's Ø, RMS, roundness, rim points and arc, nearest standard size, flags). Shown under
 * the face's hole table; rows follow the table's hover and selection. Nothing shows for a face
 * without measured holes.
 */
interface Props {
  doc: PlateSpecInput;
  face: FaceKey;
  units: DisplayUnits;
  hovered: string | null;
  selected: readonly string[];
}

type Hole = NonNullable<PlateSpecInput['engineFace']['holes']>[number];
type Pattern = NonNullable<PlateSpecInput['engineFace']['patterns']>[number];

export function MeasuredSource({ doc, face, units, hovered, selected }: Props) {
  const f = doc[face];
  const holes = (f.holes ?? []).filter((h): h is Hole & { fitted: NonNullable<Hole['fitted']> } => h.fitted !== undefined);
  if (holes.length === 0) return null;
  const patterns = (f.patterns ?? []).filter((p) => p.fitted !== undefined);
  const plain: DisplayUnits = { length: units.length, fractions: false };
  // fine figures: 3 decimals in mm, 4 in inch
  const fine = (mm: number) => showLength(mm, plain, { decimals: units.length === 'mm' ? 3 : 4 });
  const unit = units.length === 'mm' ? 'mm' : 'inches';
  // table cells: the unit is in the caption
  const num = (mm: number) => showLength(mm, plain, { decimals: units.length === 'mm' ? 3 : 4, showUnit: false });
  // a sign only on what shows as non-zero (no "−0.000")
  const signedNum = (mm: number) => {
    const shown = Number((units.length === 'mm' ? mm : mm / 25.4).toFixed(units.length === 'mm' ? 3 : 4));
    return `${shown > 0 ? '+' : shown < 0 ? '−' : ''}${num(Math.abs(mm))}`;
  };
  const uploads = [...new Set(holes.map((h) => h.fitted.fromUploadId))];
  const flagged = holes.filter((h) => h.fitted.flags.length > 0).length;
  const hot = new Set([...(hovered ? [hovered] : []), ...selected]);

  return (
    <details open className="mt-3 rounded border border-blast-200 bg-white" data-testid={`measured-source-${face}`}>
      <summary className="cursor-pointer select-none px-3 py-2 text-[15px]">
        <span className="mr-2 rounded-sm bg-plate-700 px-1.5 py-0.5 text-xs font-semibold uppercase tracking-wide text-white">measured</span>{' '}
        <span className="font-semibold">{holes.length} hole{holes.length === 1 ? '' : 's'} fitted from upload{uploads.length === 1 ? '' : 's'} {uploads.join(', ')}</span>{' '}
        {flagged > 0 ? (
          <span className="font-semibold text-amber-800">· {flagged} flagged — check before release</span>
        ) : (
          <span className="text-plate-700">· no fit flagged</span>
        )}
      </summary>
      <div className="space-y-2 px-3 pb-3">
        {patterns.map((p) => <PatternLine key={p.id} p={p} fine={fine} />)}
        <table className="w-full border-collapse text-[14px]" aria-label={`Measured holes, ${face === 'engineFace' ? 'engine' : 'transmission'} face`}>
          <caption className="caption-bottom pt-1 text-left text-[13px] text-plate-700">
            Lengths in {unit}. Off circle: outside (+) or inside (−) the fitted bolt circle, and the angle off the hole&apos;s slot. Hover a row for the fitted centre on the scanned face.
          </caption>
          <thead className="text-left text-[12px] uppercase tracking-wide text-plate-700">
            <tr>
              <th className="px-1.5 py-1">ID</th>
              <th className="px-1.5 py-1 text-right">Ø</th>
              <th className="px-1.5 py-1 text-right">RMS</th>
              <th className="px-1.5 py-1 text-right">Round</th>
              <th className="whitespace-nowrap px-1.5 py-1 text-right">Pts · arc</th>
              <th className="whitespace-nowrap px-1.5 py-1 text-right">Off circle</th>
              <th className="px-1.5 py-1">Nearest size</th>
              <th className="px-1.5 py-1">Fit</th>
            </tr>
          </thead>
          <tbody>
            {holes.map((h) => {
              const m = h.fitted;
              const moved = h.patternId === undefined;
              const flags = m.flags.map((x) => HOLE_FLAG_TEXT[x as HoleFlag] ?? x);
              const title = `${h.id}: fitted centre u ${fine(m.centerU)}, v ${fine(m.centerV)} on the scanned face (upload ${m.fromUploadId})`;
              return (
                <tr key={h.id} data-measured={h.id} title={title} className={`border-t border-blast-200 align-top ${hot.has(h.id) ? 'bg-brass-500/25' : ''}`}>
                  <td className="px-1.5 py-1 font-semibold">{h.id}</td>
                  <td className="whitespace-nowrap px-1.5 py-1 text-right font-mono">{num(m.diameterMm)}</td>
                  <td className="whitespace-nowrap px-1.5 py-1 text-right font-mono">{num(m.rmsMm)}</td>
                  <td className="whitespace-nowrap px-1.5 py-1 text-right font-mono">{num(m.roundnessMm)}</td>
                  <td className="whitespace-nowrap px-1.5 py-1 text-right">{m.points} · {Math.round(m.arcCoverageDeg)}°</td>
                  <td className="whitespace-nowrap px-1.5 py-1 text-right font-mono">
                    {m.radialDeviationMm === undefined ? '—' : signedNum(m.radialDeviationMm)}
                    {m.angleDeviationDeg !== undefined && <span className="text-plate-700"> {signedDeg(m.angleDeviationDeg)}</span>}
                  </td>
                  <td className="px-1.5 py-1 text-[13px] leading-tight">{m.nearest ? <>{m.nearest.label} <span className="whitespace-nowrap font-mono text-plate-700">{signedNum(m.nearest.differenceMm)}</span></> : '—'}</td>
                  <td className="px-1.5 py-1">
                    {flags.length > 0 ? <span className="font-semibold text-amber-800">⚠ {flags.join(', ')}</span> : <span className="whitespace-nowrap text-emerald-700">✓ good fit</span>}
                    {moved && <span className="text-plate-700"> · placed by hand since</span>}
                  </td>
                </tr>
              );
            })}
          </tbody>
        </table>
      </div>
    </details>
  );
}

function signedDeg(deg: number): string {
  const shown = Number(deg.toFixed(3));
  return `${shown > 0 ? '+' : shown < 0 ? '−' : ''}${Math.abs(deg).toFixed(3)}°`;
}

function PatternLine({ p, fine }: { p: Pattern; fine: (mm: number) => string }) {
  const ft = p.fitted!;
  const parts = [`Ø ${fine(p.diameterMm)} through ${ft.holeCount ?? p.anglesDeg?.length ?? p.count ?? '?'} measured holes`, `rms ${fine(ft.rmsMm)}`];
  if (ft.angularRmsDeg !== undefined) parts.push(`angular rms ${ft.angularRmsDeg.toFixed(3)}°`);
  const bore = ft.bore
    ? `centre ${fine(ft.bore.offsetMm)} from the bore axis (TIR ${fine(ft.bore.tirMm)})${ft.bore.diameterMm !== undefined ? `, bore Ø ${fine(ft.bore.diameterMm)}` : ''}`
    : 'no bore fitted: the bolt circle centre is taken as the shaft axis';
  return (
    <p className="text-[14px]" data-measured-pattern={p.id}>
      <span className="font-semibold">Bolt circle {p.id}</span>: {parts.join(' · ')} · {bore}
      {ft.fromUploadId ? <span className="text-plate-700"> · upload {ft.fromUploadId}</span> : null}
    </p>
  );
}
