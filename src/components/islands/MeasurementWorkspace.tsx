import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import * as Comlink from 'comlink';
import { useEffect, useMemo, useRef, useState } from 'react';
import { applyPatternToSpec, type AppliedHole, type FaceName } from '../../domain/measure/applyPattern';
import type { FitRequest } from '../../domain/measure/fitRequest';
import type { HoleFlag } from '../../domain/measure/holeQuality';
import { HOLE_FLAG_TEXT } from '../../domain/measure/holeQuality';
import { likelyPatternHoles, measuredPattern, type FaceView } from '../../domain/measure/pattern';
import type { FitResponse, HoleResult } from '../../domain/measure/session';
import type { UploadSummary } from '../../domain/measure/summary';
import { ACCEPTED_EXTENSIONS } from '../../domain/measure/formats';
import { parsePlateSpec } from '../../domain/spec';
import { apiGet, apiSend, ApiError } from '../api';
import type { MeasureWorkerApi, Progress } from '../measure.worker';
import { QueryRoot } from '../QueryRoot';
import { MeasurementCloud } from './MeasurementCloud';
import { MeasurementFace, type FaceOverlay } from './MeasurementFace';
import { MeasurementPolar } from './MeasurementPolar';

export interface UploadItem {
  id: number;
  fileName: string;
  format: string;
  sizeBytes: number;
  summary: UploadSummary;
  uploadedBy: { name: string };
  createdAt: string;
}

export interface PlateChoice {
  id: number;
  partNumber: string;
  title: string;
}

interface Props {
  projectId: number;
  canEdit: boolean;
  plates: PlateChoice[];
  blankSpec: unknown;
}

const mb = (b: number) => `${(b / 1e6).toFixed(b < 1e7 ? 1 : 0)} MB`;
const f3 = (x: number) => x.toFixed(3);
const when = (iso: string) => new Date(iso).toLocaleString('en-GB', { day: 'numeric', month: 'short', year: 'numeric', hour: '2-digit', minute: '2-digit' });

let workerApi: Comlink.Remote<MeasureWorkerApi> | null = null;
function worker(): Comlink.Remote<MeasureWorkerApi> {
  if (!workerApi) workerApi = Comlink.wrap<MeasureWorkerApi>(new Worker(new URL('../measure.worker.ts', import.meta.url), { type: 'module' }));
  return workerApi;
}

/** POST the file with upload progress (fetch cannot report bytes sent). */
function sendUpload(projectId: number, file: File, units: string, onProgress: (sent: number, total: number) => void): Promise<UploadItem> {
  return new Promise((resolve, reject) => {
    const xhr = new XMLHttpRequest();
    xhr.open('POST', `/api/projects/${projectId}/uploads`);
    xhr.setRequestHeader('accept', 'application/json');
    xhr.upload.onprogress = (e) => onProgress(e.loaded, e.lengthComputable ? e.total : file.size);
    xhr.onerror = () => reject(new ApiError(0, 'network', 'The upload was interrupted (network). Nothing was saved; try again.'));
    xhr.onload = () => {
      let body: { upload?: UploadItem; error?: { code: string; message: string } } = {};
      try {
        body = JSON.parse(xhr.responseText);
      } catch {
        /* not JSON */
      }
      if (xhr.status === 201 && body.upload) resolve(body.upload);
      else reject(new ApiError(xhr.status, body.error?.code ?? `http_${xhr.status}`, body.error?.message ?? `The server answered ${xhr.status}.`));
    };
    const form = new FormData();
    form.append('units', units);
    form.append('file', file, file.name);
    xhr.send(form);
  });
}

type Stage = { kind: 'idle' } | { kind: 'sending'; sent: number; total: number } | { kind: 'checking' } | { kind: 'reading'; done: number; total: number } | { kind: 'fitting'; what: string } | { kind: 'ready' };

interface PatternRow {
  role: AppliedHole['role'];
  fastener: string;
}

function Workspace({ projectId, canEdit, plates, blankSpec }: Props) {
  const qc = useQueryClient();
  const list = useQuery({ queryKey: ['uploads', projectId], queryFn: () => apiGet<{ uploads: UploadItem[] }>(`/api/projects/${projectId}/uploads`) });
  const [file, setFile] = useState<File | null>(null);
  const [units, setUnits] = useState<'mm' | 'in'>('mm');
  const [stage, setStage] = useState<Stage>({ kind: 'idle' });
  const [error, setError] = useState<string | null>(null);
  const [open, setOpen] = useState<UploadItem | null>(null);
  const [facePts, setFacePts] = useState<Float32Array | null>(null);
  const [cloud, setCloud] = useState<{ xyz: Float32Array; onFace: Uint8Array } | null>(null);
  const [plane, setPlane] = useState<Extract<FitResponse, { kind: 'plane' }>['plane'] | null>(null);
  const [holes, setHoles] = useState<HoleResult[]>([]);
  const [rejected, setRejected] = useState<number>(0);
  const [inPattern, setInPattern] = useState<Set<string>>(new Set());
  const [selectedId, setSelectedId] = useState<string | null>(null);
  const [selection, setSelection] = useState<{ u: number; v: number }[] | null>(null);
  const [tool, setTool] = useState<'box' | 'lasso'>('box');
  const [view, setView] = useState<FaceView>({ flip: false, rotateDeg: 0 });
  const [bore, setBore] = useState<{ u: number; v: number; tiltDeg: number; diameterMm: number; cylindricityMm: number; rmsMm: number; n: number } | null>(null);
  const [face, setFace] = useState<FaceName>('transmission');
  const [viewedFrom, setViewedFrom] = useState<'rear' | 'front'>('front');
  const [plateId, setPlateId] = useState<number | null>(plates[0]?.id ?? null);
  const [patternId, setPatternId] = useState('TB');
  const [idPrefix, setIdPrefix] = useState('T');
  const [rows, setRows] = useState<Record<string, PatternRow>>({});
  const [applied, setApplied] = useState<{ plateId: number; number: number; id: number } | null>(null);
  const manualCount = useRef(0);

  const busy = stage.kind !== 'idle' && stage.kind !== 'ready';
  const onProgress: Progress = (s, done, total) => {
    if (s === 'reading') setStage({ kind: 'reading', done, total });
  };
  const progress = Comlink.proxy(onProgress);

  const reset = () => {
    setFacePts(null);
    setCloud(null);
    setPlane(null);
    setHoles([]);
    setRejected(0);
    setInPattern(new Set());
    setSelectedId(null);
    setSelection(null);
    setBore(null);
    setApplied(null);
    setRows({});
    manualCount.current = 0;
  };

  const afterLoad = async () => {
    setStage({ kind: 'fitting', what: 'Fitting the face plane…' });
    const r = (await worker().run({ kind: 'plane' })) as Extract<FitResponse, { kind: 'plane' }>;
    setPlane(r.plane);
    setFacePts(await worker().facePoints(120_000));
    setCloud(await worker().cloudPoints(60_000));
    setStage({ kind: 'ready' });
  };

  const openUpload = async (u: UploadItem, local?: File) => {
    setError(null);
    reset();
    setOpen(u);
    try {
      setStage({ kind: 'reading', done: 0, total: u.sizeBytes });
      if (local) await worker().loadFile(local, u.summary.units, progress);
      else await worker().loadUrl(`/api/uploads/${u.id}/file`, u.fileName, u.sizeBytes, u.summary.units, progress);
      await afterLoad();
    } catch (e) {
      setStage({ kind: 'idle' });
      setError((e as Error).message);
    }
  };

  const upload = async () => {
    if (!file) return;
    setError(null);
    setStage({ kind: 'sending', sent: 0, total: file.size });
    try {
      const saved = await sendUpload(projectId, file, units, (sent, total) => setStage(sent >= total ? { kind: 'checking' } : { kind: 'sending', sent, total }));
      await qc.invalidateQueries({ queryKey: ['uploads', projectId] });
      await openUpload(saved, file);
    } catch (e) {
      setStage({ kind: 'idle' });
      setError((e as Error).message);
    }
  };

  const run = async (request: FitRequest, what: string): Promise<FitResponse | null> => {
    setError(null);
    setStage({ kind: 'fitting', what });
    try {
      return await worker().run(request);
    } catch (e) {
      setError((e as Error).message);
      return null;
    } finally {
      setStage({ kind: 'ready' });
    }
  };

  const findHoles = async () => {
    const r = await run({ kind: 'holes' }, 'Looking for holes on the face…');
    if (!r || r.kind !== 'holes') return;
    setHoles(r.holes);
    setRejected(r.rejected.length);
    setInPattern(new Set(likelyPatternHoles(r.holes)));
    setSelectedId(r.holes.find((h) => h.flags.length)?.id ?? r.holes[0]?.id ?? null);
  };

  const fitSelection = async (kind: 'circle' | 'cylinder') => {
    if (!selection) return;
    const region = { kind: 'polygon' as const, points: selection };
    const r = await run(kind === 'circle' ? { kind: 'circle', region } : { kind: 'cylinder', region }, kind === 'circle' ? 'Fitting the hole in the selection…' : 'Fitting the bore in the selection…');
    if (!r) return;
    if (r.kind === 'circle') {
      manualCount.current += 1;
      const id = `S${manualCount.current}`;
      setHoles((hs) => [...hs, { ...r.hole, id }]);
      setSelectedId(id);
    } else if (r.kind === 'cylinder') {
      const c = r.cylinder;
      setBore({ u: r.axisOnFace.u, v: r.axisOnFace.v, tiltDeg: r.axisOnFace.tiltDeg, diameterMm: c.diameterMm, cylindricityMm: c.cylindricity, rmsMm: c.rms, n: c.n });
    }
    setSelection(null);
  };

  const chosen = holes.filter((h) => inPattern.has(h.id));
  const pattern = useMemo(() => {
    if (chosen.length < 3) return null;
    try {
      return measuredPattern(chosen, { view, axis: bore });
    } catch (e) {
      return e as Error;
    }
  }, [chosen.map((h) => h.id).join(','), view, bore]);

  useEffect(() => {
    setViewedFrom(face === 'engine' ? 'rear' : 'front');
    setPatternId(face === 'engine' ? 'EB' : 'TB');
    setIdPrefix(face === 'engine' ? 'E' : 'T');
  }, [face]);

  const rowFor = (h: HoleResult): PatternRow => rows[h.id] ?? { role: 'clearance', fastener: h.sizes[0]?.fastener ?? '' };

  const apply = useMutation({
    mutationFn: async () => {
      if (!pattern || pattern instanceof Error || !plateId || !open) throw new Error('Fit a bolt circle over at least 3 holes and choose a plate first.');
      const { revisions } = await apiGet<{ revisions: { id: number; number: number }[] }>(`/api/plates/${plateId}/revisions`);
      const latest = revisions[0] ?? null;
      const base = latest ? (await apiGet<{ revision: { spec: unknown } }>(`/api/revisions/${latest.id}`)).revision.spec : blankSpec;
      const spec = applyPatternToSpec(parsePlateSpec(base), face, {
        patternId,
        viewedFrom,
        measured: pattern,
        fromUploadId: String(open.id),
        source: open.fileName,
        bore: bore ? { diameterMm: bore.diameterMm, cylindricityMm: bore.cylindricityMm } : undefined,
        holes: pattern.holes.map((ph, i) => {
          const h = chosen[i]!;
          const row = rowFor(h);
          const nearest = h.sizes[0];
          const size = h.sizes.find((s) => s.fastener === row.fastener) ?? nearest;
          return {
            id: `${idPrefix}${i + 1}`,
            role: row.role,
            fastener: row.role === 'dowel' ? undefined : row.fastener || undefined,
            clearanceClass: row.role === 'clearance' && size?.kind === 'clearance' && size.fitClass ? size.fitClass : undefined,
            quality: {
              centerU: h.centerU,
              centerV: h.centerV,
              diameterMm: ph.diameterMm,
              rmsMm: h.rmsMm,
              roundnessMm: h.roundnessMm,
              n: h.n,
              arcCoverageDeg: h.arcCoverageDeg,
              flags: h.flags as HoleFlag[],
              nearest: nearest ? { label: `${nearest.label} ${nearest.fastener}`, differenceMm: nearest.differenceMm } : undefined,
            },
          };
        }),
      });
      const message = `Measured ${face} pattern ${patternId} from upload ${open.id} (${open.fileName}): Ø${f3(pattern.boltCircle.diameterMm)} mm, ${pattern.holes.length} holes`;
      const saved = await apiSend<{ revision: { id: number; number: number } }>('POST', `/api/plates/${plateId}/revisions`, { spec, message, parentRevisionId: latest?.id ?? null });
      return { plateId, ...saved.revision };
    },
    onSuccess: (r) => setApplied(r),
  });

  const overlay: FaceOverlay = {
    holes: holes.map((h) => ({ id: h.id, centerU: h.centerU, centerV: h.centerV, diameterMm: h.diameterMm, flagged: h.flags.length > 0, inPattern: inPattern.has(h.id) })),
    selectedId,
    boltCircle: pattern && !(pattern instanceof Error) ? (() => {
      // bolt circle centre back in face coordinates
      const inv = toFace(view, pattern.boltCircle.centerX, pattern.boltCircle.centerY);
      return { centerU: inv.u, centerV: inv.v, diameterMm: pattern.boltCircle.diameterMm };
    })() : null,
    axis: bore ? { u: bore.u, v: bore.v } : null,
  };
  const selectedHole = holes.find((h) => h.id === selectedId) ?? null;
  const uploads = list.data?.uploads ?? [];

  return (
    <div className="space-y-8">
      <section aria-labelledby="uploads-h">
        <h2 id="uploads-h" className="mb-3 text-lg font-bold">Measurement files</h2>
        {list.isLoading ? (
          <p className="text-plate-500">Loading uploads…</p>
        ) : uploads.length === 0 ? (
          <div className="rounded-lg border border-dashed border-plate-300 bg-white p-6 text-plate-700">No measurements yet. Upload a scan or probe file of a flange below.</div>
        ) : (
          <table className="w-full rounded-lg bg-white text-left text-[15px] shadow-sm" data-testid="uploads-table">
            <thead className="bg-plate-100 text-sm">
              <tr><th className="px-3 py-2">File</th><th className="px-3 py-2">Format</th><th className="px-3 py-2 text-right">Points</th><th className="px-3 py-2">Units</th><th className="px-3 py-2">Uploaded</th><th className="px-3 py-2"></th></tr>
            </thead>
            <tbody>
              {uploads.map((u) => (
                <tr key={u.id} className={`border-t border-blast-200 ${open?.id === u.id ? 'bg-brass-500/10' : ''}`}>
                  <td className="px-3 py-2 font-semibold">{u.fileName}<div className="text-xs font-normal text-plate-500">{mb(u.sizeBytes)}</div></td>
                  <td className="px-3 py-2 uppercase">{u.format} <span className="text-xs normal-case text-plate-500">{u.summary.encoding}</span></td>
                  <td className="px-3 py-2 text-right tabular-nums">{u.summary.pointCount.toLocaleString('en-GB')}</td>
                  <td className="px-3 py-2">
                    {u.summary.units === 'in' ? 'inch' : 'mm'}
                    {!u.summary.unitsCheck.plausible && <div className="max-w-56 text-xs text-finding-warning">{u.summary.unitsCheck.message}</div>}
                  </td>
                  <td className="px-3 py-2 text-sm">{u.uploadedBy.name}<div className="text-plate-500">{when(u.createdAt)}</div></td>
                  <td className="px-3 py-2 text-right"><button type="button" disabled={busy} onClick={() => openUpload(u)} className="rounded border border-plate-300 px-3 py-1 text-sm font-semibold text-plate-700 hover:bg-plate-100 disabled:opacity-50">Open</button></td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
        {canEdit && (
          <form className="mt-4 flex flex-wrap items-end gap-3 rounded-lg border border-blast-200 bg-white p-4" onSubmit={(e) => { e.preventDefault(); void upload(); }}>
            <label className="flex flex-col text-sm font-semibold">
              Scan or probe file
              <input type="file" name="file" accept={ACCEPTED_EXTENSIONS.join(',')} onChange={(e) => setFile(e.target.files?.[0] ?? null)} className="mt-1 text-sm font-normal" />
            </label>
            <label className="flex flex-col text-sm font-semibold">
              Units in the file
              <select name="units" value={units} onChange={(e) => setUnits(e.target.value as 'mm' | 'in')} className="mt-1 rounded border border-blast-200 bg-white px-2 py-1.5 font-normal">
                <option value="mm">millimetres</option>
                <option value="in">inches</option>
              </select>
            </label>
            <button type="submit" disabled={!file || busy} className="rounded bg-plate-700 px-4 py-2 font-semibold text-white hover:bg-plate-900 disabled:opacity-50">Upload</button>
            <p className="basis-full text-xs text-plate-700">XYZ or CSV point lists (x, y, z, optional label), PLY (ASCII or binary) or STL (ASCII or binary), up to 200 MB. The file is checked as it arrives; a bad file is refused with the line or byte at fault and nothing is kept.</p>
          </form>
        )}
        <StageLine stage={stage} />
        {error && <p role="alert" className="mt-3 rounded border border-finding-error/40 bg-white p-3 text-finding-error">{error}</p>}
      </section>

      {open && plane && (
        <section aria-labelledby="face-h" className="space-y-4">
          <div className="flex flex-wrap items-baseline justify-between gap-2">
            <h2 id="face-h" className="text-lg font-bold">{open.fileName}: the face</h2>
            <p className="text-sm text-plate-700" data-testid="plane-summary">
              Face plane from {plane.n.toLocaleString('en-GB')} of {plane.total.toLocaleString('en-GB')} points · flatness {f3(plane.flatnessMm)} mm · rms {f3(plane.rmsMm)} mm · {plane.outliers.toLocaleString('en-GB')} points off the face
            </p>
          </div>
          {!open.summary.unitsCheck.plausible && <p className="rounded border border-finding-warning/50 bg-white p-2 text-sm text-finding-warning">{open.summary.unitsCheck.message}</p>}
          <div className="flex flex-wrap gap-2" role="toolbar" aria-label="Face tools">
            <button type="button" disabled={busy} onClick={findHoles} className="rounded bg-plate-700 px-3 py-1.5 font-semibold text-white hover:bg-plate-900 disabled:opacity-50">Find holes</button>
            <span className="mx-1 self-center text-sm text-plate-500">Select:</span>
            {(['box', 'lasso'] as const).map((t) => (
              <button key={t} type="button" aria-pressed={tool === t} onClick={() => setTool(t)} className={`rounded border px-3 py-1.5 text-sm font-semibold ${tool === t ? 'border-brass-700 bg-brass-500/20' : 'border-plate-300'}`}>{t === 'box' ? 'Box' : 'Lasso'}</button>
            ))}
            <button type="button" disabled={!selection || busy} onClick={() => fitSelection('circle')} className="rounded border border-plate-300 px-3 py-1.5 text-sm font-semibold disabled:opacity-40">Fit hole in selection</button>
            <button type="button" disabled={!selection || busy} onClick={() => fitSelection('cylinder')} className="rounded border border-plate-300 px-3 py-1.5 text-sm font-semibold disabled:opacity-40">Fit bore in selection</button>
            <span className="mx-1 self-center text-sm text-plate-500">View:</span>
            <button type="button" aria-pressed={view.flip} onClick={() => setView((v) => ({ ...v, flip: !v.flip }))} className={`rounded border px-3 py-1.5 text-sm font-semibold ${view.flip ? 'border-brass-700 bg-brass-500/20' : 'border-plate-300'}`}>Seen from the other side</button>
            <button type="button" onClick={() => setView((v) => ({ ...v, rotateDeg: (v.rotateDeg + 90) % 360 }))} className="rounded border border-plate-300 px-3 py-1.5 text-sm font-semibold">Turn 90° ({view.rotateDeg}°)</button>
          </div>
          <div className="grid gap-4 lg:grid-cols-[minmax(0,640px)_minmax(0,1fr)]">
            <div>
              <MeasurementFace points={facePts} overlay={overlay} view={view} tool={tool} onSelect={setSelection} onPickHole={setSelectedId} />
              <p className="mt-1 text-xs text-plate-700">
                {selection ? 'Selection made: fit a hole or a bore in it.' : 'Drag a box or lasso around a hole’s rim (or a bore) to fit it by hand; click a hole to see its deviation plot.'} Holes outlined in amber are flagged.
              </p>
            </div>
            <div className="space-y-4">
              <MeasurementCloud cloud={cloud} />
              {selectedHole && <MeasurementPolar hole={selectedHole} />}
              {bore && (
                <div className="rounded border border-blast-200 bg-white p-3 text-sm" data-testid="bore-result">
                  <p className="font-semibold">Bore (shaft axis)</p>
                  <p>Ø {f3(bore.diameterMm)} mm · cylindricity {f3(bore.cylindricityMm)} mm · rms {f3(bore.rmsMm)} mm · {bore.n} points · axis {bore.tiltDeg.toFixed(2)}° off square to the face</p>
                </div>
              )}
            </div>
          </div>

          {holes.length > 0 && (
            <div>
              <h3 className="mb-2 font-bold">Fitted holes {rejected > 0 && <span className="text-sm font-normal text-plate-500">({rejected} empty areas were not round enough to count as holes)</span>}</h3>
              <table className="w-full rounded-lg bg-white text-left text-sm shadow-sm" data-testid="holes-table">
                <thead className="bg-plate-100">
                  <tr>
                    <th className="px-2 py-2">In pattern</th><th className="px-2 py-2">Hole</th><th className="px-2 py-2 text-right">Centre u, v mm</th><th className="px-2 py-2 text-right">Ø mm</th><th className="px-2 py-2 text-right">rms</th><th className="px-2 py-2 text-right">roundness</th><th className="px-2 py-2 text-right">points</th><th className="px-2 py-2 text-right">rim seen</th><th className="px-2 py-2">Nearest standard size</th><th className="px-2 py-2">Fit</th>
                  </tr>
                </thead>
                <tbody>
                  {holes.map((h) => (
                    <tr key={h.id} className={`border-t border-blast-200 ${h.id === selectedId ? 'bg-brass-500/10' : ''}`} onClick={() => setSelectedId(h.id)}>
                      <td className="px-2 py-1.5"><input type="checkbox" aria-label={`Use ${h.id} in the bolt pattern`} checked={inPattern.has(h.id)} onChange={(e) => setInPattern((s) => { const n = new Set(s); if (e.target.checked) n.add(h.id); else n.delete(h.id); return n; })} /></td>
                      <td className="px-2 py-1.5 font-semibold">{h.id}</td>
                      <td className="px-2 py-1.5 text-right tabular-nums">{h.centerU.toFixed(2)}, {h.centerV.toFixed(2)}</td>
                      <td className="px-2 py-1.5 text-right tabular-nums font-semibold">{f3(h.diameterMm)}</td>
                      <td className="px-2 py-1.5 text-right tabular-nums">{f3(h.rmsMm)}</td>
                      <td className="px-2 py-1.5 text-right tabular-nums">{f3(h.roundnessMm)}</td>
                      <td className="px-2 py-1.5 text-right tabular-nums">{h.n}</td>
                      <td className="px-2 py-1.5 text-right tabular-nums">{Math.round(h.arcCoverageDeg)}°</td>
                      <td className="px-2 py-1.5">{h.sizes[0] ? <>{h.sizes[0].fastener} <span className="text-plate-500">{h.sizes[0].label}</span> <span className="tabular-nums">{h.sizes[0].differenceMm >= 0 ? '+' : '−'}{f3(Math.abs(h.sizes[0].differenceMm))}</span></> : '—'}</td>
                      <td className="px-2 py-1.5">
                        {h.flags.length ? <span className="font-semibold text-finding-warning">{h.flags.map((f) => HOLE_FLAG_TEXT[f as HoleFlag]).join(', ')}</span> : <span className="text-plate-700">good</span>}
                        {(() => {
                          const twin = holes.find((o) => o.id !== h.id && o.id < h.id && Math.hypot(o.centerU - h.centerU, o.centerV - h.centerV) < o.diameterMm / 4);
                          return twin ? <span className="ml-1 text-plate-500">· same hole as {twin.id}</span> : null;
                        })()}
                      </td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </div>
          )}

          {holes.length > 0 && (
            <div className="rounded-lg border border-blast-200 bg-white p-4" data-testid="pattern-panel">
              <h3 className="font-bold">Bolt pattern</h3>
              {!pattern ? (
                <p className="text-sm text-plate-700">Tick at least 3 holes to fit a bolt circle.</p>
              ) : pattern instanceof Error ? (
                <p role="alert" className="text-finding-error">{pattern.message}</p>
              ) : (
                <div className="space-y-3">
                  <p data-testid="bolt-circle">
                    Bolt circle <strong>Ø {f3(pattern.boltCircle.diameterMm)} mm</strong> through {pattern.holes.length} holes · rms {f3(pattern.boltCircle.rms)} mm · first hole at {pattern.holes[0]!.angleDeg.toFixed(2)}° · angular rms {pattern.boltCircle.angularRmsDeg.toFixed(3)}°
                    {pattern.offset ? <> · centre <strong>{f3(pattern.offset.distanceMm)} mm</strong> from the bore axis (TIR {f3(pattern.offset.tirMm)} mm)</> : <span className="text-plate-500"> · no bore fitted: the circle’s centre is taken as the shaft axis</span>}
                  </p>
                  <table className="text-sm">
                    <thead><tr className="text-left"><th className="pr-3">Hole</th><th className="pr-3 text-right">Angle</th><th className="pr-3 text-right">Off pitch</th><th className="pr-3">Plate hole</th><th>Fastener</th></tr></thead>
                    <tbody>
                      {pattern.holes.map((ph, i) => {
                        const h = chosen[i]!;
                        const row = rowFor(h);
                        return (
                          <tr key={ph.id}>
                            <td className="pr-3 font-semibold">{idPrefix}{i + 1} <span className="font-normal text-plate-500">({ph.id})</span></td>
                            <td className="pr-3 text-right tabular-nums">{ph.angleDeg.toFixed(2)}°</td>
                            <td className="pr-3 text-right tabular-nums">{ph.deviationDeg >= 0 ? '+' : '−'}{Math.abs(ph.deviationDeg).toFixed(3)}°</td>
                            <td className="pr-3">
                              <select aria-label={`Plate hole for ${ph.id}`} value={row.role} onChange={(e) => setRows((r) => ({ ...r, [h.id]: { ...row, role: e.target.value as PatternRow['role'] } }))} className="rounded border border-blast-200 px-1 py-0.5">
                                <option value="clearance">clearance</option>
                                <option value="tapped">tapped</option>
                                <option value="dowel">dowel</option>
                                <option value="stud">stud</option>
                              </select>
                            </td>
                            <td>
                              <input aria-label={`Fastener for ${ph.id}`} value={row.fastener} onChange={(e) => setRows((r) => ({ ...r, [h.id]: { ...row, fastener: e.target.value } }))} className="w-28 rounded border border-blast-200 px-1 py-0.5" disabled={row.role === 'dowel'} />
                            </td>
                          </tr>
                        );
                      })}
                    </tbody>
                  </table>
                  <div className="flex flex-wrap items-end gap-3 border-t border-blast-200 pt-3">
                    <label className="flex flex-col text-sm font-semibold">Face
                      <select aria-label="Face" value={face} onChange={(e) => setFace(e.target.value as FaceName)} className="mt-1 rounded border border-blast-200 px-2 py-1 font-normal">
                        <option value="engine">engine (block rear face)</option>
                        <option value="transmission">transmission (bell housing)</option>
                      </select>
                    </label>
                    <label className="flex flex-col text-sm font-semibold">This view is looking
                      <select aria-label="This view is looking" value={viewedFrom} onChange={(e) => setViewedFrom(e.target.value as 'rear' | 'front')} className="mt-1 rounded border border-blast-200 px-2 py-1 font-normal">
                        <option value="rear">forward, from behind (as the plate is drawn)</option>
                        <option value="front">rearward, at the mating face (mirrored onto the plate)</option>
                      </select>
                    </label>
                    <label className="flex flex-col text-sm font-semibold">Pattern id
                      <input value={patternId} onChange={(e) => setPatternId(e.target.value)} className="mt-1 w-20 rounded border border-blast-200 px-2 py-1 font-normal" />
                    </label>
                    <label className="flex flex-col text-sm font-semibold">Hole ids start
                      <input value={idPrefix} onChange={(e) => setIdPrefix(e.target.value)} className="mt-1 w-16 rounded border border-blast-200 px-2 py-1 font-normal" />
                    </label>
                    <label className="flex flex-col text-sm font-semibold">Plate
                      <select aria-label="Plate" value={plateId ?? ''} onChange={(e) => setPlateId(Number(e.target.value))} className="mt-1 rounded border border-blast-200 px-2 py-1 font-normal">
                        {plates.length === 0 && <option value="">no plate in this project yet</option>}
                        {plates.map((p) => <option key={p.id} value={p.id}>{p.partNumber} {p.title}</option>)}
                      </select>
                    </label>
                    <button type="button" disabled={!canEdit || !plateId || apply.isPending} onClick={() => apply.mutate()} className="rounded bg-brass-500 px-4 py-2 font-semibold text-slate-ink hover:bg-brass-700 hover:text-white disabled:opacity-50">
                      {apply.isPending ? 'Saving…' : 'Apply to the plate as a new draft'}
                    </button>
                  </div>
                  {apply.error && <p role="alert" className="whitespace-pre-line text-finding-error">{(apply.error as Error).message}</p>}
                  {applied && (
                    <p role="status" className="rounded border border-plate-300 bg-plate-100 p-2">
                      Saved as draft revision {applied.number} of the plate. <a className="font-semibold text-plate-700 underline" href={`/plates/${applied.plateId}/edit?rev=${applied.id}`}>Open it in the editor</a> · <a className="font-semibold text-plate-700 underline" href={`/plates/${applied.plateId}`}>the plate's revisions</a>
                    </p>
                  )}
                </div>
              )}
            </div>
          )}
        </section>
      )}
    </div>
  );
}

function toFace(view: FaceView, x: number, y: number) {
  const c = Math.cos((view.rotateDeg * Math.PI) / 180);
  const s = Math.sin((view.rotateDeg * Math.PI) / 180);
  const a = x * c + y * s;
  return { u: view.flip ? -a : a, v: -x * s + y * c };
}

function StageLine({ stage }: { stage: Stage }) {
  if (stage.kind === 'idle' || stage.kind === 'ready') return null;
  let text = '';
  let fraction: number | null = null;
  if (stage.kind === 'sending') {
    fraction = stage.total ? stage.sent / stage.total : 0;
    text = `Sending ${mb(stage.sent)} of ${mb(stage.total)}`;
  } else if (stage.kind === 'checking') text = 'Sent. The server is checking the file…';
  else if (stage.kind === 'reading') {
    fraction = stage.total ? stage.done / stage.total : 0;
    text = `Reading points: ${mb(stage.done)} of ${mb(stage.total)}`;
  } else text = stage.what;
  return (
    <div className="mt-3" role="status" aria-live="polite" data-testid="progress">
      <p className="text-sm font-semibold text-plate-900">{text}{fraction !== null && ` (${Math.round(fraction * 100)} %)`}</p>
      <div className="mt-1 h-2 w-full max-w-xl overflow-hidden rounded bg-blast-200">
        <div className={`h-full bg-plate-500 ${fraction === null ? 'animate-pulse' : ''}`} style={{ width: `${Math.round((fraction ?? 1) * 100)}%` }} />
      </div>
    </div>
  );
}

export function MeasurementWorkspace(props: Props) {
  return (
    <QueryRoot>
      <Workspace {...props} />
    </QueryRoot>
  );
}
