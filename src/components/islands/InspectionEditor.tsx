/**
 * The inspection table: one line per feature with its nominal and limits, inputs for what was
 * measured, and the result computed live by the same domain code the server uses. Results are
 * words (PASS / FAIL / open) with colour as a second cue. Keyboard first: Tab across, Enter /
 * Shift+Enter down / up the same column, Ctrl+S saves.
 */
import { useMemo, useRef, useState } from 'react';
import {
  evaluateInspection,
  parseInspectionCsv,
  type FeatureResult,
  type InspectionPlan,
  type MeasurementRow,
  type RowError,
} from '~/domain/inspection';

type Field = 'x' | 'y' | 'z' | 'diameter' | 'depth';
type Draft = Record<string, Partial<Record<Field, string>>>;

interface Props {
  inspectionId: number;
  state: string;
  plan: InspectionPlan;
  measurements: MeasurementRow[];
  canEdit: boolean;
  canAccept: boolean;
  thicknessPoints?: number;
}

const FIELDS: Field[] = ['x', 'y', 'z', 'diameter', 'depth'];
const f3 = (v: number | null | undefined) => (v === null || v === undefined ? '' : v.toFixed(3));
const sgn = (v: number | null | undefined) => (v === null || v === undefined ? '' : `${v >= 0 ? '+' : ''}${v.toFixed(3)}`);
const OP: Record<string, string> = { through: 'clearance', tapDrill: 'tap drill', dowelReam: 'dowel (reamed)', centreBore: 'centre bore', starterBore: 'starter bore' };
const STATE: Record<string, string> = { in_progress: 'In progress', passed: 'Passed', failed: 'Failed', accepted_with_deviation: 'Accepted with deviation' };

function toDraft(rows: MeasurementRow[]): Draft {
  const d: Draft = {};
  for (const r of rows) {
    d[r.featureId] = {};
    for (const k of FIELDS) if (r[k] !== undefined) d[r.featureId]![k] = String(r[k]);
  }
  return d;
}

/** Draft cells → rows; unreadable numbers are reported per cell, never silently dropped. */
function toRows(draft: Draft): { rows: MeasurementRow[]; bad: string[] } {
  const rows: MeasurementRow[] = [];
  const bad: string[] = [];
  for (const [featureId, cells] of Object.entries(draft)) {
    const row: MeasurementRow = { featureId };
    let any = false;
    for (const k of FIELDS) {
      const raw = (cells[k] ?? '').trim().replace(',', '.');
      if (raw === '') continue;
      const v = Number(raw);
      if (!Number.isFinite(v) || !/^[+-]?(\d+\.?\d*|\.\d+)$/.test(raw)) bad.push(`${featureId} ${k}`);
      else {
        (row as Record<string, unknown>)[k] = v;
        any = true;
      }
    }
    if (any) rows.push(row);
  }
  return { rows, bad };
}

function Verdict({ r }: { r: FeatureResult['result'] | undefined }) {
  if (r === 'pass') return <span className="inline-block min-w-14 rounded bg-green-100 px-2 py-0.5 text-center font-bold text-green-900">PASS</span>;
  if (r === 'fail') return <span className="inline-block min-w-14 rounded bg-red-100 px-2 py-0.5 text-center font-bold text-red-900">FAIL</span>;
  return <span className="inline-block min-w-14 rounded border border-dashed border-plate-300 px-2 py-0.5 text-center text-plate-500">open</span>;
}

export default function InspectionEditor(props: Props) {
  const { plan } = props;
  const [state, setState] = useState(props.state);
  const [draft, setDraft] = useState<Draft>(() => toDraft(props.measurements));
  const [message, setMessage] = useState<{ kind: 'ok' | 'error'; text: string } | null>(null);
  const [rowErrors, setRowErrors] = useState<readonly RowError[]>([]);
  const [busy, setBusy] = useState(false);
  const [csvText, setCsvText] = useState('');
  const [comment, setComment] = useState('');
  const table = useRef<HTMLTableElement>(null);
  const editable = props.canEdit && state === 'in_progress';
  const thkIds = useMemo(() => {
    const n = Math.max(props.thicknessPoints ?? 4, ...Object.keys(draft).filter((k) => /^THK\d+$/.test(k)).map((k) => Number(k.slice(3))));
    return Array.from({ length: n }, (_, i) => `THK${i + 1}`);
  }, [draft, props.thicknessPoints]);

  const { rows, bad } = useMemo(() => toRows(draft), [draft]);
  const result = useMemo(() => evaluateInspection(plan, rows), [plan, rows]);
  const byId = useMemo(() => new Map(result.features.map((f) => [f.featureId, f])), [result]);

  const set = (id: string, k: Field, v: string) => setDraft((d) => ({ ...d, [id]: { ...d[id], [k]: v } }));

  function onKey(e: React.KeyboardEvent<HTMLInputElement>) {
    if ((e.ctrlKey || e.metaKey) && e.key.toLowerCase() === 's') {
      e.preventDefault();
      void save(false);
      return;
    }
    if (e.key !== 'Enter') return;
    e.preventDefault();
    const inputs = Array.from(table.current?.querySelectorAll<HTMLInputElement>(`input[data-col="${e.currentTarget.dataset.col}"]`) ?? []);
    const i = inputs.indexOf(e.currentTarget);
    const next = inputs[i + (e.shiftKey ? -1 : 1)];
    if (next) {
      next.focus();
      next.select();
    }
  }

  const cell = (id: string, k: Field, label: string, enabled = true) => {
    const value = draft[id]?.[k] ?? '';
    const isBad = bad.includes(`${id} ${k}`);
    return (
      <input
        aria-label={`${id} ${label}`}
        data-col={k}
        inputMode="decimal"
        disabled={!editable || !enabled}
        value={value}
        onChange={(e) => set(id, k, e.target.value)}
        onKeyDown={onKey}
        className={`w-24 rounded border px-1.5 py-0.5 text-right font-mono tabular-nums disabled:bg-blast-50 ${isBad ? 'border-red-700 bg-red-50' : 'border-plate-300'} ${enabled ? '' : 'invisible'}`}
      />
    );
  };

  async function save(finish: boolean) {
    if (bad.length) {
      setMessage({ kind: 'error', text: `Not a number: ${bad.join(', ')}. Nothing was saved.` });
      return;
    }
    setBusy(true);
    setMessage(null);
    setRowErrors([]);
    try {
      const r = await fetch(`/api/inspections/${props.inspectionId}/measurements`, {
        method: 'PUT',
        headers: { 'content-type': 'application/json', accept: 'application/json' },
        body: JSON.stringify({ rows, finish }),
      });
      const body = await r.json();
      if (!r.ok) {
        setRowErrors(body.error?.rows ?? []);
        setMessage({ kind: 'error', text: body.error?.message ?? `The server answered ${r.status}.` });
        return;
      }
      setState(body.state);
      setMessage({ kind: 'ok', text: finish ? `Inspection closed: ${STATE[body.state] ?? body.state}.${body.failing.length ? ` Out of tolerance: ${body.failing.join(', ')}.` : ''} The designer gets the report by e-mail.` : `Saved ${rows.length} rows at ${new Date().toLocaleTimeString()}.` });
    } catch {
      setMessage({ kind: 'error', text: 'The server could not be reached; nothing was saved. Your values are still in the table.' });
    } finally {
      setBusy(false);
    }
  }

  function loadCsv(text: string) {
    const parsed = parseInspectionCsv(text, plan);
    if (parsed.errors.length) {
      setRowErrors(parsed.errors);
      setMessage({ kind: 'error', text: `${parsed.errors.length} problem(s) in the CSV; the table was not changed.` });
      return;
    }
    setRowErrors([]);
    setDraft((d) => ({ ...d, ...toDraft([...parsed.rows]) }));
    setMessage({ kind: 'ok', text: `Read ${parsed.rows.length} rows from the CSV into the table (not saved yet).` });
  }

  async function accept() {
    setBusy(true);
    setMessage(null);
    try {
      const r = await fetch(`/api/inspections/${props.inspectionId}/accept`, { method: 'POST', headers: { 'content-type': 'application/json', accept: 'application/json' }, body: JSON.stringify({ comment }) });
      const body = await r.json();
      if (!r.ok) {
        setMessage({ kind: 'error', text: body.error?.fields?.comment ? `Comment ${body.error.fields.comment}.` : (body.error?.message ?? `The server answered ${r.status}.`) });
        return;
      }
      setState(body.inspection.state);
      setAcceptedNote(body.inspection.acceptComment);
      setMessage({ kind: 'ok', text: 'Accepted with deviation. The designer gets the report by e-mail.' });
    } finally {
      setBusy(false);
    }
  }

  const holeRows = plan.holes.map((h) => {
    const f = byId.get(h.id);
    const hr = f && f.kind === 'hole' ? f : undefined;
    const posBad = hr?.truePositionMm != null && hr.truePositionMm > h.positionToleranceMm + 1e-9;
    const sizeBad = hr?.sizeDeviationMm != null && hr.measured.diameter !== undefined && (hr.measured.diameter < h.size.lowerMm - 1e-9 || hr.measured.diameter > h.size.upperMm + 1e-9);
    return (
      <tr key={h.id} data-feature={h.id} data-result={hr?.result} className={`border-t border-blast-200 ${hr?.result === 'fail' ? 'bg-red-50' : ''}`}>
        <th scope="row" className="py-1 pr-2 text-left font-mono font-bold">{h.id}</th>
        <td className="pr-2 text-plate-700">{OP[h.operation] ?? h.operation}{h.thread ? ` ${h.thread}` : ''}</td>
        <td className="pr-2 text-right font-mono tabular-nums">{f3(h.nominal.x)}</td>
        <td className="pr-2 text-right font-mono tabular-nums">{f3(h.nominal.y)}</td>
        <td className="whitespace-nowrap pr-2 font-mono tabular-nums">Ø{f3(h.diameterMm)} <span className="text-plate-500">{h.size.label}</span></td>
        <td className="pr-1">{cell(h.id, 'x', 'measured X')}</td>
        <td className="pr-1">{cell(h.id, 'y', 'measured Y')}</td>
        <td className="pr-1">{cell(h.id, 'diameter', 'measured diameter')}</td>
        <td className="pr-2">{cell(h.id, 'depth', 'measured depth', h.depth !== null)}</td>
        <td className={`pr-2 text-right font-mono tabular-nums ${posBad ? 'font-bold text-red-800' : ''}`}>{hr?.truePositionMm != null ? `${f3(hr.truePositionMm)}${posBad ? ' ✗' : ''}` : ''}<span className="block whitespace-nowrap text-xs font-normal text-plate-500">zone Ø{f3(h.positionToleranceMm)}</span></td>
        <td className={`pr-2 text-right font-mono tabular-nums ${sizeBad ? 'font-bold text-red-800' : ''}`}>{sgn(hr?.sizeDeviationMm)}{sizeBad ? ' ✗' : ''}</td>
        <td className="py-1"><Verdict r={hr?.result} />{hr?.result === 'fail' && <span className="block text-xs text-red-900">{hr.notes.join('; ')}</span>}</td>
      </tr>
    );
  });

  const thk = byId.get('THK');
  const flat = byId.get('FLAT');
  const [acceptedNote, setAcceptedNote] = useState<string | null>(null);
  const accepted = state === 'accepted_with_deviation';
  const overallWord = accepted
    ? `ACCEPTED WITH DEVIATION — ${result.failing.join(', ')} out of tolerance, accepted by an engineer in writing`
    : result.overall === 'passed' ? 'PASS — every feature within tolerance' : result.overall === 'failed' ? `FAIL — out of tolerance: ${result.failing.join(', ')}` : `Open — ${result.counts.notMeasured} check(s) still need values`;

  return (
    <div className="space-y-4">
      <div className={`rounded-lg border-2 p-3 ${accepted ? 'border-brass-700 bg-amber-50' : result.overall === 'failed' ? 'border-red-700 bg-red-50' : result.overall === 'passed' ? 'border-green-700 bg-green-50' : 'border-plate-300 bg-white'}`} role="status" aria-live="polite" data-testid="overall">
        <p className="text-lg font-bold">{overallWord}</p>
        {acceptedNote && <p className="text-sm">Reason: “{acceptedNote}”</p>}
        <p className="text-sm text-plate-700">Inspection state: <strong data-testid="state">{STATE[state] ?? state}</strong> · {result.counts.pass} pass · {result.counts.fail} fail · {result.counts.notMeasured} open</p>
      </div>
      {message && <p role={message.kind === 'error' ? 'alert' : 'status'} className={`rounded px-3 py-2 text-sm ${message.kind === 'error' ? 'bg-red-100 text-red-900' : 'bg-green-100 text-green-900'}`}>{message.text}</p>}
      {rowErrors.length > 0 && (
        <ul className="rounded border border-red-700 bg-red-50 px-4 py-2 text-sm text-red-900" data-testid="row-errors">
          {rowErrors.map((e, i) => <li key={i}>Line {e.row}{e.column ? `, ${e.column}` : ''}: {e.message}</li>)}
        </ul>
      )}
      <p className="text-sm text-plate-700">Coordinates in mm, plate coordinates (origin on the crank axis, seen from the transmission side). Tab moves across, Enter moves down the column, Ctrl+S saves. True position TP = 2·√(Δx² + Δy²), diameter zone.</p>
      <div className="overflow-x-auto rounded-lg border border-blast-200 bg-white p-2">
        <table ref={table} className="w-full text-sm" data-testid="inspection-table">
          <thead>
            <tr className="text-left text-xs uppercase tracking-wide text-plate-500">
              <th className="pr-2">Feature</th><th className="pr-2">Kind</th><th className="pr-2 text-right">Nom. X</th><th className="pr-2 text-right">Nom. Y</th><th className="pr-2">Nom. Ø / limits</th>
              <th>Meas. X</th><th>Meas. Y</th><th>Meas. Ø</th><th title="blind-hole or counterbore depth">Depth</th><th className="pr-2 text-right">TP</th><th className="pr-2 text-right">ΔØ</th><th>Result</th>
            </tr>
          </thead>
          <tbody>
            {holeRows}
            {plan.patterns.map((p) => {
              const f = byId.get(p.id);
              const pr = f && f.kind === 'pattern' ? f : undefined;
              return (
                <tr key={p.id} data-feature={p.id} data-result={pr?.result} className="border-t-2 border-plate-300">
                  <th scope="row" className="py-1 pr-2 text-left font-mono font-bold">{p.id}</th>
                  <td className="pr-2 text-plate-700" colSpan={4}>{p.face} bolt circle Ø{f3(p.nominalDiameterMm)}: fitted centre vs datum</td>
                  <td colSpan={4} className="font-mono text-xs tabular-nums">{pr?.fittedCentre ? `centre ${f3(pr.fittedCentre.x)}, ${f3(pr.fittedCentre.y)} · Ø${f3(pr.fittedDiameterMm)}` : `needs 3 of ${p.holeIds.length} hole centres`}</td>
                  <td className="pr-2 text-right font-mono tabular-nums">{f3(pr?.concentricityMm)}<span className="block whitespace-nowrap text-xs text-plate-500">TIR Ø{f3(p.toleranceMm)}</span></td>
                  <td />
                  <td className="py-1"><Verdict r={pr?.result} /></td>
                </tr>
              );
            })}
            {thkIds.map((id, i) => {
              const p = thk && thk.kind === 'thickness' ? thk.points.find((q) => q.featureId === id) : undefined;
              return (
                <tr key={id} data-feature={id} className={`border-t border-blast-200 ${i === 0 ? 'border-t-2 border-plate-300' : ''}`}>
                  <th scope="row" className="py-1 pr-2 text-left font-mono font-bold">{id}</th>
                  <td className="pr-2 text-plate-700" colSpan={4}>thickness {f3(plan.thickness.nominalMm)} {plan.thickness.label} — enter in the Z column</td>
                  <td colSpan={2} />
                  <td className="pr-1">{cell(id, 'z', 'measured thickness')}</td>
                  <td colSpan={2} />
                  <td className="pr-2 text-right font-mono tabular-nums">{p ? sgn(p.valueMm - plan.thickness.nominalMm) : ''}</td>
                  <td className="py-1"><Verdict r={p ? (p.pass ? 'pass' : 'fail') : undefined} /></td>
                </tr>
              );
            })}
            <tr data-feature="FLAT" className="border-t border-blast-200">
              <th scope="row" className="py-1 pr-2 text-left font-mono font-bold">FLAT</th>
              <td className="pr-2 text-plate-700" colSpan={4}>flatness ≤ {f3(plan.flatness.toleranceMm)} (reading; or FP1… points by CSV)</td>
              <td colSpan={2} />
              <td className="pr-1">{cell('FLAT', 'z', 'flatness reading')}</td>
              <td colSpan={2} />
              <td className="pr-2 text-right font-mono tabular-nums">{flat && flat.kind === 'flatness' ? f3(flat.flatnessMm) : ''}</td>
              <td className="py-1"><Verdict r={flat?.result} /></td>
            </tr>
            <tr className="border-t border-blast-200 text-plate-700">
              <th scope="row" className="py-1 pr-2 text-left font-mono font-bold">THK</th>
              <td colSpan={10}>thickness range {thk && thk.kind === 'thickness' && thk.rangeMm !== null ? `${f3(thk.minMm)} … ${f3(thk.maxMm)} (spread ${f3(thk.rangeMm)})` : '—'}</td>
              <td className="py-1"><Verdict r={thk?.result} /></td>
            </tr>
          </tbody>
        </table>
      </div>
      {editable && (
        <div className="flex flex-wrap gap-3">
          <button type="button" disabled={busy} onClick={() => void save(false)} className="rounded bg-plate-700 px-4 py-2 font-semibold text-white disabled:opacity-50">Save measurements</button>
          <button type="button" disabled={busy} onClick={() => void save(true)} className="rounded border-2 border-plate-700 px-4 py-2 font-semibold text-plate-900 disabled:opacity-50">Finish inspection</button>
        </div>
      )}
      {editable && (
        <details className="rounded-lg border border-blast-200 bg-white p-3">
          <summary className="cursor-pointer font-semibold">Paste or upload a probe CSV</summary>
          <p className="mt-1 text-sm text-plate-700">Header row with <code>id</code> and any of <code>x, y, z, diameter, depth</code> (mm); ids as in the hole table, THK1… thickness, FP1… flatness points, FLAT a flatness reading. The whole file is checked first: any bad line and nothing is read.</p>
          <textarea aria-label="CSV text" value={csvText} onChange={(e) => setCsvText(e.target.value)} rows={5} className="mt-2 w-full rounded border border-plate-300 p-2 font-mono text-xs" placeholder={'id,x,y,diameter\nE1,119.543,10.459,9.02'} />
          <div className="mt-2 flex flex-wrap items-center gap-3">
            <button type="button" onClick={() => loadCsv(csvText)} className="rounded bg-plate-700 px-3 py-1.5 text-sm font-semibold text-white">Read CSV into the table</button>
            <label className="text-sm">or a file: <input type="file" accept=".csv,text/csv,text/plain" aria-label="CSV file" onChange={async (e) => { const f = e.target.files?.[0]; if (f) loadCsv(await f.text()); }} /></label>
          </div>
        </details>
      )}
      {props.canAccept && state === 'failed' && (
        <div className="rounded-lg border-2 border-brass-500 bg-amber-50 p-3">
          <h2 className="font-bold">Accept with deviation</h2>
          <p className="text-sm text-plate-700">Only when the part is fit for use despite {result.failing.join(', ')}. Your written reason goes on the report with your name.</p>
          <textarea aria-label="Reason for accepting the deviation" value={comment} onChange={(e) => setComment(e.target.value)} rows={3} className="mt-2 w-full rounded border border-plate-300 p-2" />
          <button type="button" disabled={busy} onClick={() => void accept()} className="mt-2 rounded bg-brass-700 px-4 py-2 font-semibold text-white disabled:opacity-50">Accept with deviation</button>
        </div>
      )}
      <p><a className="font-semibold text-plate-700 underline" href={`/api/inspections/${props.inspectionId}/report.pdf`}>Inspection report (PDF)</a></p>
    </div>
  );
}
