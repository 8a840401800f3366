import { lazy, Suspense, useCallback, useDeferredValue, useEffect, useMemo, useRef, useState } from 'react';
import { countFindings, type Finding, type PlateProfile, type PlateSpecInput } from '~/domain';
import { plateDxf } from '~/domain/exports/dxf';
import { plateSvg } from '~/domain/exports/svg';
import { holeTableCsv } from '~/domain/exports/csv';
import { canRedo, canUndo, commit as commitHistory, redo, startHistory, undo, type History } from '~/domain/editor/history';
import { nextUnits, unitsLabel, type DisplayUnits } from '~/domain/editor/units';
import { reapplyChanges } from '~/domain/editor/reapply';
import { FACE_LABEL, type FaceKey } from '~/domain/editor/specOps';
import { ApiError, apiGet, apiSend } from '~/components/api';
import { StatusBadge } from '~/components/StatusBadge';
import { EditorDrawing } from './EditorDrawing';
import { HoleTable } from './HoleTable';
import { PatternHelpers } from './PatternHelpers';
import { FindingsPanel } from './FindingsPanel';
import { CentreBoreSection, PlateSection, StarterSection } from './SectionForms';
import { StackUpPanel } from './StackUpPanel';
import { SafetyPanel } from './SafetyPanel';
import { checkLayout, layoutDoc, type Evaluation } from './evaluate';
import { OutlineEditor } from './OutlineEditor';
import { polygonOf, patchVertex, withPolygon } from '~/domain/editor/outlinePolygon';
import { download } from './download';

const Plate3D = lazy(() => import('./Plate3D'));

export interface EditorRevision {
  readonly id: number;
  readonly number: number;
  readonly status: string;
  readonly spec: unknown;
}

export interface PlateEditorProps {
  readonly plate: { readonly id: number; readonly partNumber: string; readonly title: string };
  readonly base: EditorRevision | null;
  readonly latestNumber: number | null;
  readonly templates: readonly { readonly key: string; readonly label: string; readonly spec: unknown }[];
  readonly canEdit: boolean;
}

type Tab = 'holes' | 'plate' | 'stack';

interface Conflict {
  message: string;
  latest: { id: number; number: number };
  parent: { id: number; number: number } | null;
  saveMessage: string;
}

const NO_ISSUES: ReadonlyMap<string, string> = new Map();
const NO_FINDINGS: readonly Finding[] = [];
const NO_FINDINGS_ISSUES: readonly never[] = [];
const SAFETY_KEY = (plateId: number) => `platewright.safetySeen.${plateId}`;

export default function PlateEditor(props: PlateEditorProps) {
  const { plate, canEdit } = props;
  const [base, setBase] = useState<EditorRevision | null>(props.base);
  const [baseDoc, setBaseDoc] = useState<PlateSpecInput | null>((props.base?.spec as PlateSpecInput) ?? null);
  const [history, setHistory] = useState<History<PlateSpecInput> | null>(props.base ? startHistory(props.base.spec as PlateSpecInput) : null);
  const [tab, setTab] = useState<Tab>('holes');
  const [face, setFace] = useState<FaceKey>('engineFace');
  const [hovered, setHovered] = useState<string | null>(null);
  const [selected, setSelected] = useState<string[]>([]);
  const [selectedFinding, setSelectedFinding] = useState<number | null>(null);
  const [view, setView] = useState<'2d' | '3d'>('2d');
  const [safety, setSafety] = useState(false);
  const [saving, setSaving] = useState<null | 'dialog'>(null);
  const [conflict, setConflict] = useState<Conflict | null>(null);
  const [toast, setToast] = useState<{ text: string; href?: string; bad?: boolean } | null>(null);
  const [reapplied, setReapplied] = useState<string[] | null>(null);
  const lastGood = useRef<PlateProfile | null>(null);
  const [mounted, setMounted] = useState(false);
  useEffect(() => setMounted(true), []);

  useEffect(() => {
    try {
      if (!localStorage.getItem(SAFETY_KEY(plate.id))) setSafety(true);
    } catch {
      setSafety(true);
    }
  }, [plate.id]);
  const closeSafety = () => {
    setSafety(false);
    try {
      localStorage.setItem(SAFETY_KEY(plate.id), new Date().toISOString());
    } catch {
      /* private mode: shown again next time */
    }
  };

  const doc = history?.present ?? null;
  // a keystroke renders the drawing first: schema + profile now, the checks (the larger part of
  // the work) in a deferred render right after; the table, the forms and the findings list render
  // after the drawing too. Their edits are applied to the newest document, so a late render never loses one.
  const layout = useMemo(() => (doc ? layoutDoc(doc) : null), [doc]);
  const checkedLayout = useDeferredValue(layout);
  const checked = useMemo(() => (checkedLayout ? checkLayout(checkedLayout) : null), [checkedLayout]);
  const evaluation: Evaluation | null = useMemo(() => {
    if (!layout) return null;
    // findings of an older layout stay up until this one's are in (one deferred render later)
    const findings = checked && (checked.layout === layout || layout.profile) ? checked.findings : NO_FINDINGS;
    return { spec: layout.spec, profile: layout.profile, findings, issues: layout.issues, issueMap: layout.issueMap, ms: layout.ms + (checked?.ms ?? 0) };
  }, [layout, checked]);
  const panelDoc = useDeferredValue(doc);
  const panelEval = useDeferredValue(evaluation);
  if (evaluation?.profile) lastGood.current = evaluation.profile;
  const profile = evaluation?.profile ?? lastGood.current;
  const findings = evaluation?.findings ?? [];
  const counts = countFindings(findings);
  const unitLength = doc?.displayUnits?.length ?? 'mm';
  const unitFractions = doc?.displayUnits?.fractions ?? false;
  const units: DisplayUnits = useMemo(() => ({ length: unitLength, fractions: unitFractions }), [unitLength, unitFractions]);
  const unitsKey = `${units.length}-${units.fractions}`;
  const dirty = !!doc && doc !== baseDoc;

  const commit = useCallback((next: PlateSpecInput | ((current: PlateSpecInput) => PlateSpecInput), key?: string) => {
    setHistory((h) => {
      if (!h) return typeof next === 'function' ? h : startHistory(next);
      return commitHistory(h, typeof next === 'function' ? next(h.present) : next, { key });
    });
    setSelectedFinding(null);
  }, []);

  const doUndo = useCallback(() => {
    (document.activeElement as HTMLElement | null)?.blur?.();
    setHistory((h) => (h ? undo(h) : h));
  }, []);
  const doRedo = useCallback(() => {
    (document.activeElement as HTMLElement | null)?.blur?.();
    setHistory((h) => (h ? redo(h) : h));
  }, []);

  useEffect(() => {
    const onKey = (e: KeyboardEvent) => {
      if (!(e.ctrlKey || e.metaKey)) return;
      if ((e.target as HTMLElement)?.tagName === 'TEXTAREA') return;
      const k = e.key.toLowerCase();
      if (k === 'z' && !e.shiftKey) {
        e.preventDefault();
        doUndo();
      } else if ((k === 'z' && e.shiftKey) || k === 'y') {
        e.preventDefault();
        doRedo();
      } else if (k === 's') {
        e.preventDefault();
        if (canEdit) setSaving('dialog');
      }
    };
    window.addEventListener('keydown', onKey);
    return () => window.removeEventListener('keydown', onKey);
  }, [doUndo, doRedo, canEdit]);

  // unsaved-changes guard
  useEffect(() => {
    if (!dirty) return;
    const guard = (e: BeforeUnloadEvent) => {
      e.preventDefault();
      e.returnValue = '';
    };
    window.addEventListener('beforeunload', guard);
    return () => window.removeEventListener('beforeunload', guard);
  }, [dirty]);

  const docRef = useRef(doc);
  docRef.current = doc;
  const pickFinding = useCallback((i: number, f: Finding) => {
    const doc = docRef.current;
    setSelectedFinding(i);
    setSelected([...f.featureIds]);
    const first = f.featureIds[0];
    if (first && doc) {
      if ((doc.engineFace.holes ?? []).some((h) => h.id === first)) {
        setTab('holes');
        setFace('engineFace');
      } else if ((doc.transmissionFace.holes ?? []).some((h) => h.id === first)) {
        setTab('holes');
        setFace('transmissionFace');
      }
    }
  }, []);
  const select = useCallback((ids: string[]) => setSelected(ids), []);
  // corners of an own polygon outline, dragged on the drawing (one undo step per drag)
  const cornerPoints = useMemo(() => {
    const p = doc ? polygonOf(doc) : null;
    return p ? p.vertices.map((v) => ({ x: v.xMm, y: v.yMm })) : null;
  }, [doc]);
  const moveCorner = useCallback((i: number, at: { x: number; y: number }, dragId: number) => {
    commit((d) => {
      const p = polygonOf(d);
      return p ? withPolygon(d, { ...p, vertices: patchVertex(p.vertices, i, { xMm: at.x, yMm: at.y }) }) : d;
    }, `corner-drag:${dragId}`);
  }, [commit]);

  useEffect(() => {
    if (!selected[0]) return;
    const row = document.querySelector(`[data-row="${CSS.escape(selected[0])}"]`);
    row?.scrollIntoView({ block: 'nearest' });
  }, [selected]);

  // ------------------------------------------------------------------------------------------
  // saving

  const save = async (message: string, asBranch = false) => {
    if (!doc) return;
    try {
      const r = await apiSend<{ revision: { id: number; number: number; status: string } }>('POST', `/api/plates/${plate.id}/revisions`, {
        spec: doc,
        message,
        parentRevisionId: base?.id ?? null,
        ...(asBranch ? { asBranch: true } : {}),
      });
      setBase({ id: r.revision.id, number: r.revision.number, status: r.revision.status, spec: doc });
      setBaseDoc(doc);
      setSaving(null);
      setConflict(null);
      setReapplied(null);
      setToast({ text: `Saved as revision ${r.revision.number}${asBranch ? ' (a branch)' : ''}.`, href: `/plates/${plate.id}?rev=${r.revision.id}` });
    } catch (e) {
      if (e instanceof ApiError && e.status === 409 && e.code === 'stale_parent') {
        const body = e.body as { latestRevision?: { id: number; number: number }; parentRevision?: { id: number; number: number } };
        setSaving(null);
        setConflict({ message: e.message, latest: body.latestRevision!, parent: body.parentRevision ?? null, saveMessage: message });
        return;
      }
      setToast({ text: e instanceof Error ? e.message : String(e), bad: true });
    }
  };

  const reloadAndReapply = async () => {
    if (!conflict || !doc) return;
    try {
      const { revision } = await apiGet<{ revision: EditorRevision }>(`/api/revisions/${conflict.latest.id}`);
      const merged = reapplyChanges(baseDoc ?? ({} as PlateSpecInput), doc, revision.spec as PlateSpecInput);
      setBase(revision);
      setBaseDoc(revision.spec as PlateSpecInput);
      commit(merged.spec);
      setReapplied([...merged.overwritten]);
      setConflict(null);
      setToast({ text: `Loaded revision ${revision.number} and re-applied your ${merged.applied.length} change${merged.applied.length === 1 ? '' : 's'}. Check the plate, then save again.` });
    } catch (e) {
      setToast({ text: e instanceof Error ? e.message : String(e), bad: true });
    }
  };

  // ------------------------------------------------------------------------------------------
  // exports of the current state

  const draftLabel = base && !dirty && base.status === 'approved' ? `rev ${base.number}` : 'DRAFT';
  const fileBase = `${plate.partNumber}-${base && !dirty && base.status === 'approved' ? `rev${base.number}` : 'DRAFT-not-released'}`;
  const exportFile = async (kind: 'dxf' | 'svg' | 'csv' | 'pdf' | 'step') => {
    const p = evaluation?.profile;
    if (!p || !doc) return setToast({ text: 'Fix the marked fields first: the plate cannot be laid out, so there is nothing to export.', bad: true });
    if (kind === 'dxf') download(`${fileBase}.dxf`, plateDxf(p, { partNumber: plate.partNumber, revision: draftLabel }), 'application/dxf');
    if (kind === 'svg') download(`${fileBase}.svg`, plateSvg(p, { partNumber: plate.partNumber, revision: draftLabel }), 'image/svg+xml');
    if (kind === 'csv') download(`${fileBase}-holes.csv`, holeTableCsv(p), 'text/csv');
    if (kind === 'step') {
      setToast({ text: 'Building the STEP file in the CAD kernel…' });
      try {
        const { getKernel } = await import('~/cad/kernelClient');
        const k = await getKernel();
        const bytes = await k.step(p, { partNumber: plate.partNumber, revision: draftLabel, timestampIso: new Date().toISOString() });
        download(`${fileBase}.step`, bytes as BlobPart, 'model/step');
        setToast({ text: `STEP file ready (${draftLabel}).` });
      } catch (e) {
        setToast({ text: `The STEP file could not be made: ${e instanceof Error ? e.message : String(e)}`, bad: true });
      }
    }
    if (kind === 'pdf') {
      const r = await fetch(`/api/plates/${plate.id}/preview/drawing.pdf`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ spec: doc, basedOnRevisionId: base?.id ?? null }) });
      if (!r.ok) {
        const err = await r.json().catch(() => null);
        return setToast({ text: err?.error?.message ?? `The drawing could not be made (${r.status}).`, bad: true });
      }
      download(`${fileBase}.pdf`, await r.blob(), 'application/pdf');
    }
  };

  // ------------------------------------------------------------------------------------------

  if (!doc) {
    return <TemplatePicker templates={props.templates} onPick={(spec) => { setHistory(startHistory(spec)); setBaseDoc(null); }} canEdit={canEdit} safety={safety} closeSafety={closeSafety} />;
  }
  const readOnly = !canEdit;
  const faceHoles = (k: FaceKey) => (doc[k].holes ?? []).length;

  return (
    <div className="flex h-full min-h-0 flex-col" data-testid="plate-editor">
      {/* header bar */}
      <div className="flex flex-wrap items-center gap-x-3 gap-y-2 border-b border-plate-300 bg-white px-3 py-1.5">
        <div className="flex items-baseline gap-2">
          <a href={`/plates/${plate.id}`} className="font-mono text-xl font-bold text-plate-900 hover:underline">{plate.partNumber}</a>
          <span className="hidden max-w-[16rem] truncate text-plate-700 2xl:inline">{plate.title}</span>
        </div>
        <div className="flex items-center gap-2 text-sm" data-testid="base-revision">
          {base ? <>rev {base.number} <StatusBadge status={base.status} /></> : <span className="text-plate-700">new plate — no revision yet</span>}
          {dirty && <span className="rounded bg-brass-500 px-2 py-0.5 text-xs font-bold text-slate-ink" data-testid="unsaved">UNSAVED</span>}
          {(dirty || base?.status !== 'approved') && <span className="hidden rounded border border-finding-error px-1.5 py-0.5 text-xs font-bold text-finding-error xl:inline" title="Files exported now are drafts, not a released revision">DRAFT</span>}
        </div>
        <div className="flex items-center gap-3 text-[15px] font-bold tabular-nums" data-testid="check-counts" aria-live="polite">
          <span className={counts.error ? 'text-finding-error' : 'text-plate-300'} data-count="error">● {counts.error} error{counts.error === 1 ? '' : 's'}</span>
          <span className={counts.warning ? 'text-finding-warning' : 'text-plate-300'} data-count="warning">▲ {counts.warning} warning{counts.warning === 1 ? '' : 's'}</span>
          <span className={counts.note ? 'text-finding-note' : 'text-plate-300'} data-count="note">■ {counts.note}<span className="hidden 2xl:inline"> note{counts.note === 1 ? '' : 's'}</span></span>
          {mounted && evaluation && <span className="hidden text-xs font-normal text-plate-500 2xl:inline" title="time to lay out and check the plate">{evaluation.ms.toFixed(1)} ms</span>}
        </div>
        <div className="ml-auto flex flex-wrap items-center gap-2">
          <button type="button" onClick={() => commit({ ...doc, displayUnits: nextUnits(units) })} disabled={readOnly} className="rounded border border-plate-700 px-3 py-1.5 text-sm font-semibold text-plate-900 hover:bg-plate-100" data-testid="units-toggle" title="Switch the display unit (inputs accept mm or inch either way)">
            <span className="hidden 2xl:inline">Units: </span>{unitsLabel(units)}
          </button>
          <button type="button" onClick={doUndo} disabled={!history || !canUndo(history)} className="rounded px-2 py-1.5 text-base font-semibold hover:bg-plate-100 disabled:opacity-40" title="Undo (Ctrl+Z)" aria-label="Undo">↶<span className="hidden 2xl:inline"> Undo</span></button>
          <button type="button" onClick={doRedo} disabled={!history || !canRedo(history)} className="rounded px-2 py-1.5 text-base font-semibold hover:bg-plate-100 disabled:opacity-40" title="Redo (Ctrl+Shift+Z)" aria-label="Redo">↷<span className="hidden 2xl:inline"> Redo</span></button>
          <ExportMenu onExport={exportFile} />
          <button type="button" onClick={() => setSafety(true)} className="rounded border-2 border-brass-500 px-3 py-1.5 text-sm font-bold text-plate-900 hover:bg-brass-500/20" data-testid="safety-button">⚠ Safety</button>
          {canEdit && <button type="button" onClick={() => setSaving('dialog')} className="rounded bg-plate-900 px-4 py-1.5 font-semibold text-white hover:bg-plate-700" data-testid="save-button">Save revision…</button>}
        </div>
      </div>
      {reapplied && reapplied.length > 0 && (
        <p className="border-b border-finding-warning bg-amber-50 px-4 py-1.5 text-sm" role="status">Your version replaced changes the newer revision also made at: <code>{reapplied.join(', ')}</code>. <button type="button" className="underline" onClick={() => setReapplied(null)}>ok</button></p>
      )}

      {/* body */}
      <div className="grid min-h-0 flex-1 grid-cols-1 lg:grid-cols-[minmax(640px,48%)_1fr] 2xl:grid-cols-[760px_1fr_360px]">
        {/* left: inputs */}
        <div className="flex min-h-0 flex-col border-r border-plate-300 bg-white">
          <div role="tablist" aria-label="Editor sections" className="flex border-b border-plate-300 bg-plate-100 text-[15px] font-semibold">
            {([['holes', `Holes (${faceHoles('engineFace') + faceHoles('transmissionFace')})`], ['plate', 'Plate · outline · starter'], ['stack', 'Thickness stack-up']] as const).map(([k, l]) => (
              <button key={k} role="tab" type="button" aria-selected={tab === k} onClick={() => setTab(k)} className={`px-4 py-2 ${tab === k ? 'border-b-4 border-brass-500 bg-white text-plate-900' : 'text-plate-700 hover:bg-white/60'}`}>{l}</button>
            ))}
          </div>
          <div className="min-h-0 flex-1 overflow-auto p-3">
            {tab === 'holes' && (
              <div className="space-y-3">
                <div role="tablist" aria-label="Face" className="flex gap-1">
                  {(['engineFace', 'transmissionFace'] as const).map((k) => (
                    <button key={k} role="tab" type="button" aria-selected={face === k} onClick={() => setFace(k)} data-testid={`face-${k}`}
                      className={`flex items-center gap-2 rounded-t border border-b-0 px-3 py-1.5 text-[15px] font-semibold ${face === k ? 'border-plate-300 bg-white text-plate-900' : 'border-transparent bg-blast-50 text-plate-700'}`}>
                      <span aria-hidden="true" className={`inline-block h-3.5 w-3.5 rounded-full border-2 ${k === 'engineFace' ? 'border-plate-900 bg-white' : 'border-dashed border-brass-700 bg-[#fff3d6]'}`} />
                      {FACE_LABEL[k]} ({faceHoles(k)})
                    </button>
                  ))}
                </div>
                <FaceHeader doc={panelDoc!} face={face} commit={commit} readOnly={readOnly} />
                <PatternHelpers key={`${face}-${unitsKey}`} doc={panelDoc!} face={face} units={units} commit={commit} onAdded={select} readOnly={readOnly} />
                <HoleTable doc={panelDoc!} face={face} units={units} issues={panelEval?.issueMap ?? NO_ISSUES} hovered={hovered} selected={selected} onHover={setHovered} onSelect={select} commit={commit} readOnly={readOnly} />
                <p className="text-xs text-plate-500">Keys: ↑ ↓ Enter move between rows, Esc restores a cell, Ctrl+Z / Ctrl+Shift+Z undo/redo, Ctrl+S save. Paste rows (X, Y, size — tab or comma separated) anywhere on the table to add holes.</p>
              </div>
            )}
            {tab === 'plate' && (
              <div className="space-y-5">
                <Section title="Outline"><OutlineEditor doc={doc} profile={profile} units={units} commit={commit} issues={evaluation?.issueMap ?? NO_ISSUES} readOnly={readOnly} /></Section>
                <Section title="Plate, edge and material"><PlateSection key={unitsKey} doc={doc} units={units} commit={commit} issues={evaluation?.issueMap ?? NO_ISSUES} readOnly={readOnly} /></Section>
                <Section title="Centre bore / register"><CentreBoreSection key={unitsKey} doc={doc} units={units} commit={commit} issues={evaluation?.issueMap ?? NO_ISSUES} readOnly={readOnly} /></Section>
                <Section title="Starter"><StarterSection key={unitsKey} doc={doc} units={units} commit={commit} issues={evaluation?.issueMap ?? NO_ISSUES} readOnly={readOnly} /></Section>
              </div>
            )}
            {tab === 'stack' && <StackUpPanel doc={doc} units={units} commit={commit} readOnly={readOnly} />}
          </div>
        </div>

        {/* centre: drawing / 3D, and (below 2xl) the findings under it */}
        <div className="grid min-h-0 grid-rows-[minmax(0,1fr)_minmax(0,34%)] 2xl:grid-rows-1">
          <div className="relative min-h-0">
            <div className="absolute right-2 top-2 z-10 flex overflow-hidden rounded border border-plate-700 bg-white text-sm font-semibold" role="tablist" aria-label="View">
              {(['2d', '3d'] as const).map((k) => (
                <button key={k} type="button" role="tab" aria-selected={view === k} onClick={() => setView(k)} className={`px-3 py-1 ${view === k ? 'bg-plate-900 text-white' : 'text-plate-900 hover:bg-plate-100'}`}>{k === '2d' ? 'Drawing' : '3D'}</button>
              ))}
            </div>
            {view === '2d' && profile && mounted && (
              <EditorDrawing profile={profile} doc={doc} findings={findings} units={units} hovered={hovered} selected={selected} selectedFinding={selectedFinding} onHover={setHovered} onSelect={select} stale={!evaluation?.profile}
                corners={tab === 'plate' && !readOnly ? cornerPoints : null} onMoveCorner={moveCorner} />
            )}
            {view === '2d' && !profile && <p className="p-6 text-finding-error">The plate cannot be laid out yet — see the problems listed under Checks.</p>}
            {view === '3d' && (
              <Suspense fallback={<p className="p-6">Loading the 3D view…</p>}>
                <Plate3D profile={evaluation?.profile ?? null} />
              </Suspense>
            )}
          </div>
          <div className="min-h-0 border-t border-plate-300 bg-blast-50 2xl:hidden">
            <FindingsPanel findings={panelEval?.findings ?? NO_FINDINGS} issues={panelEval?.issues ?? NO_FINDINGS_ISSUES} selected={selectedFinding} onPick={pickFinding} units={units} />
          </div>
        </div>
        <div className="hidden min-h-0 border-l border-plate-300 bg-blast-50 2xl:block">
          <FindingsPanel findings={panelEval?.findings ?? NO_FINDINGS} issues={panelEval?.issues ?? NO_FINDINGS_ISSUES} selected={selectedFinding} onPick={pickFinding} units={units} />
        </div>
      </div>

      {toast && (
        <div role="status" className={`fixed bottom-4 left-1/2 z-40 -translate-x-1/2 rounded px-4 py-2 text-[15px] font-semibold shadow-lg ${toast.bad ? 'bg-finding-error text-white' : 'bg-plate-900 text-white'}`} data-testid="toast">
          {toast.text} {toast.href && <a href={toast.href} className="ml-2 underline">Open in history</a>}
          <button type="button" className="ml-3 opacity-80" aria-label="Dismiss" onClick={() => setToast(null)}>✕</button>
        </div>
      )}
      {saving === 'dialog' && <SaveDialog issues={evaluation?.issues.length ?? 0} errors={counts.error} baseNumber={base?.number ?? null} onCancel={() => setSaving(null)} onSave={(m) => save(m)} />}
      {conflict && (
        <div role="dialog" aria-modal="true" aria-labelledby="conflict-h" className="fixed inset-0 z-50 flex items-center justify-center bg-slate-ink/60 p-4" data-testid="conflict-dialog">
          <div className="w-full max-w-xl rounded-lg bg-white p-6 shadow-xl">
            <h2 id="conflict-h" className="text-xl font-bold">Someone saved revision {conflict.latest.number} while you were editing</h2>
            <p className="mt-2">{conflict.message}</p>
            <p className="mt-2 text-sm text-plate-700">Nothing of yours is lost: your edits are still here. Choose how to go on.</p>
            <div className="mt-4 space-y-2">
              <button type="button" className="block w-full rounded bg-plate-900 px-4 py-2 text-left font-semibold text-white hover:bg-plate-700" onClick={reloadAndReapply}>
                Load revision {conflict.latest.number} and re-apply my changes <span className="block text-sm font-normal">then check the result and save again</span>
              </button>
              <button type="button" className="block w-full rounded border border-plate-700 px-4 py-2 text-left font-semibold hover:bg-plate-100" onClick={() => save(conflict.saveMessage, true)}>
                Save mine as a branch of revision {conflict.parent?.number ?? base?.number} <span className="block text-sm font-normal">both versions stay in the history</span>
              </button>
              <button type="button" className="block w-full rounded px-4 py-2 text-left" onClick={() => setConflict(null)}>Keep editing, decide later</button>
            </div>
          </div>
        </div>
      )}
      {safety && <SafetyPanel onClose={closeSafety} />}
    </div>
  );
}

function Section({ title, children }: { title: string; children: React.ReactNode }) {
  return (
    <section>
      <h3 className="mb-2 border-b border-blast-200 pb-1 text-sm font-bold uppercase tracking-wide text-plate-900">{title}</h3>
      {children}
    </section>
  );
}

function FaceHeader({ doc, face, commit, readOnly }: { doc: PlateSpecInput; face: FaceKey; commit: (d: PlateSpecInput, key?: string) => void; readOnly: boolean }) {
  const f = doc[face];
  return (
    <div className="flex flex-wrap items-center gap-3 rounded border border-blast-200 bg-blast-50 px-3 py-2 text-sm">
      <label className="flex items-center gap-2">
        <span className="font-semibold">Measured looking</span>
        <select aria-label="Viewed from" disabled={readOnly} value={f.viewedFrom} onChange={(e) => commit({ ...doc, [face]: { ...f, viewedFrom: e.target.value as 'rear' | 'front' } })} className="rounded border border-blast-200 bg-white px-2 py-1">
          <option value="rear">from the rear (plate coordinates)</option>
          <option value="front">at the mating face (mirrored onto the plate)</option>
        </select>
      </label>
      {f.viewedFrom === 'front' && <span className="rounded bg-brass-500/30 px-2 py-0.5 text-xs font-bold" title="X is mirrored (x → −x) onto the plate">X MIRRORED ON THE PLATE</span>}
      {f.description && <span className="w-full text-plate-700">{f.description}</span>}
    </div>
  );
}

function ExportMenu({ onExport }: { onExport(kind: 'dxf' | 'svg' | 'csv' | 'pdf' | 'step'): void }) {
  const [open, setOpen] = useState(false);
  return (
    <div className="relative">
      <button type="button" aria-expanded={open} aria-haspopup="menu" onClick={() => setOpen(!open)} className="rounded border border-plate-700 px-3 py-1.5 text-sm font-semibold text-plate-900 hover:bg-plate-100" data-testid="export-button">Export ▾</button>
      {open && (
        <div role="menu" className="absolute right-0 z-30 mt-1 w-72 rounded border border-plate-300 bg-white p-1 shadow-lg" onClick={() => setOpen(false)}>
          <p className="px-3 py-1 text-xs font-bold text-finding-error">Files of the current state are DRAFT — not released.</p>
          {([['dxf', 'DXF cut file (2D, mm)'], ['step', 'STEP solid (3D, for CAM)'], ['pdf', 'Drawing PDF'], ['svg', 'SVG preview'], ['csv', 'Hole table CSV']] as const).map(([k, l]) => (
            <button key={k} role="menuitem" type="button" className="block w-full rounded px-3 py-2 text-left hover:bg-plate-100" data-export={k} onClick={() => onExport(k)}>{l}</button>
          ))}
        </div>
      )}
    </div>
  );
}

function SaveDialog({ issues, errors, baseNumber, onCancel, onSave }: { issues: number; errors: number; baseNumber: number | null; onCancel(): void; onSave(message: string): Promise<void> }) {
  const [message, setMessage] = useState('');
  const [touched, setTouched] = useState(false);
  const [busy, setBusy] = useState(false);
  const empty = message.trim() === '';
  return (
    <div role="dialog" aria-modal="true" aria-labelledby="save-h" className="fixed inset-0 z-50 flex items-center justify-center bg-slate-ink/60 p-4" onKeyDown={(e) => e.key === 'Escape' && onCancel()}>
      <form
        className="w-full max-w-lg rounded-lg bg-white p-6 shadow-xl"
        data-testid="save-dialog"
        onSubmit={async (e) => {
          e.preventDefault();
          setTouched(true);
          if (empty || issues > 0) return;
          setBusy(true);
          await onSave(message.trim());
          setBusy(false);
        }}
      >
        <h2 id="save-h" className="text-xl font-bold">Save as a new revision{baseNumber ? ` (on top of rev ${baseNumber})` : ''}</h2>
        <label className="mt-3 block">
          <span className="font-semibold">What changed and why</span>
          <textarea autoFocus value={message} onChange={(e) => setMessage(e.target.value)} rows={3} aria-invalid={touched && empty ? true : undefined}
            className={`mt-1 w-full rounded border p-2 text-[16px] ${touched && empty ? 'border-finding-error' : 'border-plate-300'}`} placeholder="e.g. moved T3 clear of the starter pocket" />
        </label>
        {touched && empty && <p role="alert" className="text-sm font-semibold text-finding-error">A revision needs a message: say what changed, for the reviewer.</p>}
        {issues > 0 && <p role="alert" className="mt-2 text-sm font-semibold text-finding-error">The plate has {issues} field problem{issues === 1 ? '' : 's'} (see Checks); fix them before saving.</p>}
        {errors > 0 && issues === 0 && <p className="mt-2 text-sm text-finding-warning">It saves as a draft with {errors} error finding{errors === 1 ? '' : 's'}; a reviewer will see them.</p>}
        <div className="mt-4 flex gap-2">
          <button type="submit" disabled={busy} className="rounded bg-plate-900 px-4 py-2 font-semibold text-white hover:bg-plate-700 disabled:opacity-50">{busy ? 'Saving…' : 'Save revision'}</button>
          <button type="button" onClick={onCancel} className="rounded px-4 py-2">Cancel</button>
        </div>
      </form>
    </div>
  );
}

function TemplatePicker({ templates, onPick, canEdit, safety, closeSafety }: { templates: PlateEditorProps['templates']; onPick(spec: PlateSpecInput): void; canEdit: boolean; safety: boolean; closeSafety(): void }) {
  return (
    <div className="mx-auto max-w-4xl p-6" data-testid="template-picker">
      <h1 className="text-2xl font-bold">Start this plate from a template</h1>
      <p className="mt-1 text-plate-700">The plate has no revision yet. Pick a starting point; nothing is saved until you save a revision.</p>
      <ul className="mt-4 grid gap-3 sm:grid-cols-2 lg:grid-cols-3">
        {templates.map((t) => (
          <li key={t.key}>
            <button type="button" disabled={!canEdit} onClick={() => onPick(structuredClone(t.spec) as PlateSpecInput)} className="h-full w-full rounded border border-plate-300 bg-white p-4 text-left hover:border-plate-700 hover:shadow" data-template={t.key}>
              <span className="block font-semibold">{t.label}</span>
              <span className="block text-sm text-plate-500">{t.key}</span>
            </button>
          </li>
        ))}
      </ul>
      {safety && <SafetyPanel onClose={closeSafety} />}
    </div>
  );
}
