import { memo, useState, type ClipboardEvent } from 'react';
import type { PlateProfile, PlateSpecInput } from '~/domain';
import { editText, otherUnitText, readLength, showLength, type DisplayUnits } from '~/domain/editor/units';
import {
  insertVertexAfter,
  moveVertex,
  parseVertexRows,
  patchVertex,
  polygonOf,
  polygonProblems,
  rectangleAround,
  removeVertex,
  withPolygon,
  type OutlineVertex,
  type PolygonInput,
} from '~/domain/editor/outlinePolygon';
import { CellInput } from './CellInput';
import type { Commit } from './HoleTable';

interface Props {
  doc: PlateSpecInput;
  /** the last plate that could be laid out (its bounding box starts a polygon) */
  profile: PlateProfile | null;
  units: DisplayUnits;
  commit: Commit;
  issues: ReadonlyMap<string, string>;
  readOnly: boolean;
}

/**
 * The outline: automatic (hull of the features plus the edge margin) or the builder's own polygon,
 * edited as a table of corners (X, Y and an own corner radius; empty = the common radius), with
 * insert / delete / move up / move down per corner and rows pasted from a spreadsheet. Corners can
 * also be dragged on the drawing. What stops the polygon from being an outline is said per corner;
 * features outside it are check findings.
 */
export const OutlineEditor = memo(function OutlineEditor({ doc, profile, units, commit, issues, readOnly }: Props) {
  const poly = polygonOf(doc);
  const [pasteText, setPasteText] = useState('');
  const [pasteReport, setPasteReport] = useState<{ text: string; bad: boolean; problems: readonly string[] } | null>(null);
  const common = doc.outline?.cornerRadiusMm ?? (poly ? 0 : 10);

  const toPolygon = () => {
    const b = profile?.bbox ?? { minX: -150, minY: -150, maxX: 150, maxY: 150 };
    commit((d) => withPolygon(d, rectangleAround(b, d.outline?.cornerRadiusMm ?? 10)));
  };
  const toAuto = () => commit((d) => ({ ...d, outline: { kind: 'auto', edgeMarginMm: 12, cornerRadiusMm: d.outline?.cornerRadiusMm ?? 10 } }));
  const edit = (fn: (p: PolygonInput) => PolygonInput, key?: string) =>
    commit((d) => {
      const p = polygonOf(d);
      return p ? withPolygon(d, fn(p)) : d;
    }, key);
  const setVertices = (fn: (vs: readonly OutlineVertex[]) => OutlineVertex[], key?: string) => edit((p) => ({ ...p, vertices: fn(p.vertices) }), key);

  const applyPaste = (text: string, mode: 'replace' | 'append') => {
    const r = parseVertexRows(text, units.length);
    const problems = r.problems.map((p) => p.message);
    if (r.vertices.length === 0) return setPasteReport({ text: 'Nothing read: paste rows of X, Y and an optional corner radius.', bad: true, problems });
    if (!poly) {
      commit((d) => withPolygon(d, { vertices: r.vertices, cornerRadiusMm: d.outline?.cornerRadiusMm ?? 0 }));
    } else {
      setVertices((vs) => (mode === 'replace' ? [...r.vertices] : [...vs, ...r.vertices]));
    }
    setPasteReport({ text: `${mode === 'replace' || !poly ? 'Corners replaced by' : 'Added'} ${r.vertices.length} corner${r.vertices.length === 1 ? '' : 's'}.`, bad: problems.length > 0, problems });
  };
  const onTablePaste = (e: ClipboardEvent<HTMLDivElement>) => {
    if (readOnly) return;
    const text = e.clipboardData.getData('text/plain');
    if (!text.includes('\n') && !text.includes('\t')) return; // one value: an ordinary paste into a cell
    e.preventDefault();
    applyPaste(text, 'append');
  };

  const problems = poly ? polygonProblems(poly) : [];
  const badVertex = new Set(problems.map((p) => p.vertex).filter((v): v is number => v !== null));
  const schemaIssue = [...issues].find(([path]) => path.startsWith('outline'));
  const unitHead = units.length === 'mm' ? 'mm' : 'in';

  return (
    <div className="space-y-2" data-testid="outline-editor">
      <div role="radiogroup" aria-label="Outline kind" className="flex flex-wrap gap-2 text-[15px]">
        <label className={`flex items-center gap-2 rounded border px-3 py-1.5 ${!poly ? 'border-plate-700 bg-white font-semibold' : 'border-blast-200'}`}>
          <input type="radio" name="outline-kind" checked={!poly} disabled={readOnly} onChange={toAuto} className="h-4 w-4 accent-plate-700" />
          Automatic <span className="text-sm font-normal text-plate-500">(hull of the features + edge margin)</span>
        </label>
        <label className={`flex items-center gap-2 rounded border px-3 py-1.5 ${poly ? 'border-plate-700 bg-white font-semibold' : 'border-blast-200'}`}>
          <input type="radio" name="outline-kind" checked={!!poly} disabled={readOnly} onChange={toPolygon} data-testid="outline-polygon" className="h-4 w-4 accent-plate-700" />
          Own polygon
        </label>
      </div>

      {poly && (
        <>
          <p className="text-sm text-plate-700">
            Corners in plate coordinates, in order round the plate (either direction). Empty radius = the common corner radius ({showLength(common, units)}); 0 = a sharp corner. Drag the square handles on the drawing to move a corner.
          </p>
          <div onPaste={onTablePaste} className="overflow-x-auto">
            <table className="w-full table-fixed border-collapse text-[15px]" data-testid="vertex-table">
              <colgroup>
                <col style={{ width: 34 }} />
                <col />
                <col />
                <col />
                <col style={{ width: 128 }} />
              </colgroup>
              <thead className="bg-plate-100 text-left text-[13px] uppercase tracking-wide text-plate-700">
                <tr>
                  <th className="px-1.5 py-1.5">#</th>
                  <th className="px-1.5 py-1.5">X ({unitHead})</th>
                  <th className="px-1.5 py-1.5">Y ({unitHead})</th>
                  <th className="px-1.5 py-1.5" title="corner radius of this corner; empty = the common radius">R ({unitHead})</th>
                  <th className="px-1.5 py-1.5"><span className="sr-only">Actions</span></th>
                </tr>
              </thead>
              <tbody>
                {poly.vertices.map((v, i) => (
                  <tr key={i} data-vertex={i + 1} className={`border-b border-blast-200 ${badVertex.has(i) ? 'bg-red-50' : 'odd:bg-white even:bg-blast-50'}`}>
                    <td className="px-1.5 font-mono font-semibold text-plate-700">{i + 1}</td>
                    {(['xMm', 'yMm'] as const).map((k) => (
                      <td key={k} className="px-0.5 py-0.5">
                        <CellInput
                          cell={`v${i}:${k}`}
                          label={`Corner ${i + 1} ${k === 'xMm' ? 'X' : 'Y'}`}
                          value={editText(v[k], units)}
                          alt={otherUnitText(v[k], units)}
                          read={(t) => {
                            const r = readLength(t, units);
                            if (!r.ok) return r;
                            return { ok: true, apply: () => setVertices((vs) => patchVertex(vs, i, { [k]: r.mm }), `vertex:${i}:${k}`) };
                          }}
                          className="text-right"
                        />
                      </td>
                    ))}
                    <td className="px-0.5 py-0.5">
                      <CellInput
                        cell={`v${i}:r`}
                        label={`Corner ${i + 1} radius`}
                        value={v.radiusMm === null ? '' : editText(v.radiusMm, units)}
                        placeholder={editText(common, units)}
                        alt={v.radiusMm === null ? 'common' : otherUnitText(v.radiusMm, units)}
                        read={(t) => {
                          if (t.trim() === '') return { ok: true, apply: () => setVertices((vs) => patchVertex(vs, i, { radiusMm: null }), `vertex:${i}:r`) };
                          const r = readLength(t, units, { min: 0 });
                          if (!r.ok) return r;
                          return { ok: true, apply: () => setVertices((vs) => patchVertex(vs, i, { radiusMm: r.mm }), `vertex:${i}:r`) };
                        }}
                        className="text-right"
                      />
                    </td>
                    <td className="px-0.5 py-0.5">
                      <div className="flex justify-end gap-0.5 text-[15px]">
                        <button type="button" disabled={readOnly || i === 0} className="rounded px-1.5 py-1 hover:bg-plate-100 disabled:opacity-30" aria-label={`Move corner ${i + 1} up`} title="Move up" onClick={() => setVertices((vs) => moveVertex(vs, i, -1))}>↑</button>
                        <button type="button" disabled={readOnly || i === poly.vertices.length - 1} className="rounded px-1.5 py-1 hover:bg-plate-100 disabled:opacity-30" aria-label={`Move corner ${i + 1} down`} title="Move down" onClick={() => setVertices((vs) => moveVertex(vs, i, 1))}>↓</button>
                        <button type="button" disabled={readOnly} className="rounded px-1.5 py-1 font-bold text-plate-700 hover:bg-plate-100" aria-label={`Add a corner after corner ${i + 1}`} title="Add a corner in the middle of the next edge" onClick={() => setVertices((vs) => insertVertexAfter(vs, i))}>+</button>
                        <button type="button" disabled={readOnly} className="rounded px-1.5 py-1 text-finding-error hover:bg-red-50" aria-label={`Delete corner ${i + 1}`} title="Delete this corner" onClick={() => setVertices((vs) => removeVertex(vs, i))}>✕</button>
                      </div>
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
            {poly.vertices.length === 0 && (
              <button type="button" disabled={readOnly} className="mt-1 rounded border border-plate-700 px-3 py-1 text-sm font-semibold" onClick={() => setVertices((vs) => insertVertexAfter(vs, 0))}>Add a corner</button>
            )}
          </div>
          {(problems.length > 0 || schemaIssue) && (
            <div role="alert" className="rounded border-l-4 border-finding-error bg-red-50 px-3 py-2 text-[15px]" data-testid="outline-problems">
              <p className="font-bold text-finding-error">This polygon is not an outline yet (the drawing keeps the last good plate):</p>
              <ul className="mt-1 list-disc pl-5">
                {problems.map((p) => <li key={p.message}>{p.message}</li>)}
                {problems.length === 0 && schemaIssue && <li>{schemaIssue[1]}</li>}
              </ul>
            </div>
          )}
        </>
      )}

      <details className="rounded border border-blast-200 bg-blast-50 px-3 py-2 text-sm" data-testid="vertex-paste">
        <summary className="cursor-pointer font-semibold">Paste corner rows (X, Y, optional radius)</summary>
        <textarea
          aria-label="Corner rows to paste"
          value={pasteText}
          onChange={(e) => setPasteText(e.target.value)}
          rows={4}
          disabled={readOnly}
          placeholder={'X\tY\tR\n-160\t-140\n160\t-140\t20\n160\t150\n-160\t150'}
          className="mt-1 w-full rounded border border-blast-200 bg-white p-2 font-mono text-[14px]"
        />
        <p className="text-xs text-plate-500">Tab, comma, semicolon or space between values; a header like <code>X (in)</code> sets the unit, otherwise {units.length === 'mm' ? 'mm' : 'inch'}.</p>
        <div className="mt-1 flex gap-2">
          <button type="button" disabled={readOnly || !pasteText.trim()} className="rounded bg-plate-900 px-3 py-1 font-semibold text-white disabled:opacity-40" onClick={() => applyPaste(pasteText, 'replace')}>Replace the corners</button>
          <button type="button" disabled={readOnly || !pasteText.trim() || !poly} className="rounded border border-plate-700 px-3 py-1 font-semibold disabled:opacity-40" onClick={() => applyPaste(pasteText, 'append')}>Add at the end</button>
        </div>
      </details>
      {pasteReport && (
        <div role="status" className={`rounded border px-3 py-2 text-sm ${pasteReport.bad ? 'border-finding-warning bg-amber-50' : 'border-emerald-600 bg-emerald-50'}`} data-testid="vertex-paste-report">
          <p className="font-semibold">{pasteReport.text}</p>
          {pasteReport.problems.length > 0 && <ul className="mt-1 list-disc pl-5">{pasteReport.problems.map((p) => <li key={p}>{p}</li>)}</ul>}
          <button type="button" className="mt-1 text-xs underline" onClick={() => setPasteReport(null)}>dismiss</button>
        </div>
      )}
    </div>
  );
});
