import { memo, useState } from 'react';
import { FLYWHEEL_HOUSING_SIZES, flywheelHousing, type PlateSpecInput } from '~/domain';
import type { FlywheelHousingSize } from '~/domain/standards/flywheelHousings';
import { editText, readLength, showLength, type DisplayUnits } from '~/domain/editor/units';
import { addBoltCircle, deletePattern, housingBoltCircle, type FaceKey, type NewHoleDefaults } from '~/domain/editor/specOps';
import { parseFastener } from '~/domain/standards/threads';
import { isDomainError } from '~/domain/errors';
import type { Commit } from './HoleTable';

const box = 'rounded border border-blast-200 bg-white px-2 py-1.5 font-mono text-[15px] outline-none focus:ring-2 focus:ring-brass-500';
const lab = 'block text-[13px] font-semibold uppercase tracking-wide text-plate-700';

/** Bolt circle, published flywheel-housing preset, and "from measurements" for one face. */
export const PatternHelpers = memo(function PatternHelpers({ doc, face, units, commit, onAdded, readOnly }: { doc: PlateSpecInput; face: FaceKey; units: DisplayUnits; commit: Commit; onAdded(ids: string[]): void; readOnly: boolean }) {
  const [open, setOpen] = useState<'circle' | 'housing' | null>(null);
  const [dia, setDia] = useState('');
  const [count, setCount] = useState('6');
  const [start, setStart] = useState('0');
  const [angles, setAngles] = useState('');
  const [role, setRole] = useState<NewHoleDefaults['role']>('clearance');
  const [fastener, setFastener] = useState('M10x1.5');
  const [size, setSize] = useState<FlywheelHousingSize>('3');
  const [error, setError] = useState<string | null>(null);
  const patterns = doc[face].patterns ?? [];

  const addCircle = () => {
    const d = readLength(dia, units, { positive: true });
    if (!d.ok) return setError(`Bolt circle diameter: ${d.message}`);
    if (role !== 'dowel') {
      try {
        parseFastener(fastener);
      } catch (e) {
        if (!isDomainError(e)) throw e;
        return setError(`Fastener: "${fastener}" is not one this editor knows (e.g. M10x1.5, 3/8-16 UNC)`);
      }
    }
    let req;
    if (angles.trim()) {
      const list = angles.split(/[\s,;]+/).filter(Boolean).map(Number);
      if (list.some((a) => !Number.isFinite(a))) return setError('Angles: a list of degrees, e.g. "15, 75, 135"');
      req = { diameterMm: d.mm, anglesDeg: list };
    } else {
      const n = Number(count);
      const s = Number(start);
      if (!Number.isInteger(n) || n < 1 || n > 360) return setError('Count: a whole number of holes from 1 to 360');
      if (!Number.isFinite(s)) return setError('Start angle: a number of degrees');
      req = { diameterMm: d.mm, count: n, startAngleDeg: s };
    }
    const defaults: NewHoleDefaults = role === 'dowel' ? { role, dowelDiameterMm: 10 } : { role, fastener };
    const r = addBoltCircle(doc, face, req, defaults);
    commit(r.doc);
    onAdded(r.ids);
    setError(null);
    setOpen(null);
  };
  const addHousing = () => {
    const h = housingBoltCircle(size);
    const r = addBoltCircle(doc, face, h.request, { role: 'clearance', fastener: h.defaults.fastener });
    commit(r.doc);
    onAdded(r.ids);
    setOpen(null);
  };
  const hs = flywheelHousing(size);
  return (
    <div className="space-y-2" data-testid={`pattern-helpers-${face}`}>
      <div className="flex flex-wrap items-center gap-2">
        <button type="button" disabled={readOnly} aria-expanded={open === 'circle'} onClick={() => setOpen(open === 'circle' ? null : 'circle')} className="rounded border border-plate-700 bg-white px-3 py-1.5 text-sm font-semibold text-plate-900 hover:bg-plate-100">+ Bolt circle</button>
        <button type="button" disabled={readOnly} aria-expanded={open === 'housing'} onClick={() => setOpen(open === 'housing' ? null : 'housing')} className="rounded border border-plate-700 bg-white px-3 py-1.5 text-sm font-semibold text-plate-900 hover:bg-plate-100">+ Flywheel housing size</button>
        <span className="text-sm text-plate-500" title="Fit a bolt circle to probed or scanned points on the measurements page of the project, then pick it here.">From measurements: import on the project's measurements page</span>
      </div>
      {open === 'circle' && (
        <form className="grid grid-cols-3 gap-2 rounded border border-plate-300 bg-plate-100/60 p-3" onSubmit={(e) => { e.preventDefault(); addCircle(); }} aria-label="New bolt circle">
          <label><span className={lab}>Diameter ({units.length})</span><input aria-label="Bolt circle diameter" className={box + ' w-full'} value={dia} onChange={(e) => setDia(e.target.value)} placeholder={units.length === 'mm' ? '240' : '9.5'} autoFocus /></label>
          <label><span className={lab}>Count</span><input aria-label="Hole count" className={box + ' w-full'} value={count} onChange={(e) => setCount(e.target.value)} disabled={angles.trim() !== ''} /></label>
          <label><span className={lab}>Start angle (°)</span><input aria-label="Start angle" className={box + ' w-full'} value={start} onChange={(e) => setStart(e.target.value)} disabled={angles.trim() !== ''} /></label>
          <label className="col-span-3"><span className={lab}>or explicit angles (°, CCW from +X, as measured)</span><input aria-label="Explicit angles" className={box + ' w-full'} value={angles} onChange={(e) => setAngles(e.target.value)} placeholder="e.g. 15, 75, 135, 195, 255, 315" /></label>
          <label><span className={lab}>Role</span>
            <select aria-label="Hole role" className={box + ' w-full'} value={role} onChange={(e) => setRole(e.target.value as NewHoleDefaults['role'])}>
              <option value="clearance">clearance</option><option value="tapped">tapped</option><option value="stud">stud</option><option value="dowel">dowel (⌀10 H7)</option>
            </select>
          </label>
          <label className="col-span-2"><span className={lab}>Fastener</span><input aria-label="Fastener" className={box + ' w-full'} value={fastener} onChange={(e) => setFastener(e.target.value)} disabled={role === 'dowel'} /></label>
          {error && <p role="alert" className="col-span-3 text-sm font-semibold text-finding-error">{error}</p>}
          <div className="col-span-3 flex gap-2">
            <button type="submit" className="rounded bg-plate-900 px-3 py-1.5 text-sm font-semibold text-white hover:bg-plate-700">Add holes</button>
            <button type="button" className="rounded px-3 py-1.5 text-sm" onClick={() => setOpen(null)}>Cancel</button>
          </div>
        </form>
      )}
      {open === 'housing' && (
        <div className="rounded border border-plate-300 bg-plate-100/60 p-3 text-sm">
          <label><span className={lab}>Published flywheel-housing size (SAE J617)</span>
            <select aria-label="Housing size" className={box} value={size} onChange={(e) => setSize(e.target.value as FlywheelHousingSize)}>
              {FLYWHEEL_HOUSING_SIZES.map((s) => <option key={s} value={s}>size {s}</option>)}
            </select>
          </label>
          <p className="mt-1 font-mono">{hs.holeCount} × {hs.thread} on ⌀{showLength(hs.boltCircleDiameterMm, units)} · bore ⌀{showLength(hs.boreMm, units)} · first hole at {hs.startAngleDeg}°</p>
          <div className="mt-2 flex gap-2">
            <button type="button" className="rounded bg-plate-900 px-3 py-1.5 font-semibold text-white hover:bg-plate-700" onClick={addHousing}>Add {hs.holeCount} holes</button>
            <button type="button" className="rounded px-3 py-1.5" onClick={() => setOpen(null)}>Cancel</button>
          </div>
        </div>
      )}
      {patterns.length > 0 && (
        <ul className="flex flex-wrap gap-2 text-sm">
          {patterns.map((p) => (
            <li key={p.id} className="flex items-center gap-2 rounded-full border border-blast-200 bg-white py-0.5 pl-3 pr-1 font-mono">
              <span className="font-semibold">{p.id}</span>
              <span>⌀{editText(p.diameterMm, units)}{units.length === 'mm' ? '' : '"'}</span>
              <span className="text-plate-500">{p.anglesDeg ? `${p.anglesDeg.length} at given angles` : `${p.count} from ${p.startAngleDeg ?? 0}°`}{p.fitted ? ' · fitted' : ''}</span>
              <button type="button" disabled={readOnly} className="rounded-full px-1.5 text-finding-error hover:bg-red-50" aria-label={`Delete bolt circle ${p.id} and its holes`} title="Delete this bolt circle and its holes"
                onClick={() => commit(deletePattern(doc, face, p.id))}>✕</button>
            </li>
          ))}
        </ul>
      )}
    </div>
  );
});
