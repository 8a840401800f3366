import { memo, useMemo, useState, type ClipboardEvent, type ReactNode } from 'react';
import { createColumnHelper, flexRender, getCoreRowModel, getSortedRowModel, useReactTable, type SortingState } from '@tanstack/react-table';
import type { PlateSpecInput } from '~/domain';
import { parseFastener } from '~/domain/standards/threads';
import { isDomainError } from '~/domain/errors';
import { editText, otherUnitText, readLength, type DisplayUnits } from '~/domain/editor/units';
import { parseHoleRows } from '~/domain/editor/paste';
import { addPastedRows, deleteHoles, duplicateHole, holeFacePosition, patchHole, setHoleCoordinate, type FaceKey, type HoleInput } from '~/domain/editor/specOps';
import { CellInput, type CellVerdict } from './CellInput';
import { MeasuredSource } from './MeasuredSource';

/** A new document, or an edit applied to the newest one (safe when the caller rendered an older one). */
export type Commit = (next: PlateSpecInput | ((current: PlateSpecInput) => PlateSpecInput), key?: string) => void;

interface Row {
  readonly index: number;
  readonly hole: HoleInput;
  readonly x: number | null;
  readonly y: number | null;
}

const ROLES = ['clearance', 'tapped', 'dowel', 'stud'] as const;
const CLASSES_METRIC = ['fine', 'medium', 'coarse'] as const;
const CLASSES_INCH = ['close', 'normal', 'loose'] as const;

function roleBody(h: HoleInput, role: HoleInput['role']): Partial<Record<keyof HoleInput, unknown>> {
  const clear = { fastener: undefined, clearanceClass: undefined, counterbore: undefined, threadDepthMm: undefined, dowel: undefined, depthMm: undefined, diameterMm: undefined };
  if (role === 'dowel') return { ...clear, role, dowel: { diameterMm: 10, fit: 'H7' } };
  const fastener = h.fastener ?? 'M10x1.5';
  if (role === 'tapped') return { ...clear, role, fastener, depthMm: h.depthMm };
  return { ...clear, role, fastener, clearanceClass: h.clearanceClass, counterbore: role === 'clearance' ? h.counterbore : undefined };
}

interface Props {
  doc: PlateSpecInput;
  face: FaceKey;
  units: DisplayUnits;
  issues: ReadonlyMap<string, string>;
  hovered: string | null;
  selected: readonly string[];
  onHover(id: string | null): void;
  onSelect(ids: string[]): void;
  commit: Commit;
  readOnly: boolean;
}

const col = createColumnHelper<Row>();

/**
 * Cells are called as plain functions, not mounted as components: the column definitions are
 * rebuilt on every edit, and mounting them as component types would remount every input (losing
 * focus and the typed draft) on each keystroke.
 */
function renderCell<C>(cell: unknown, ctx: C): ReactNode {
  return typeof cell === 'function' ? (cell as (c: C) => ReactNode)(ctx) : (cell as ReactNode);
}

export const HoleTable = memo(function HoleTable({ doc, face, units, issues, hovered, selected, onHover, onSelect, commit, readOnly }: Props) {
  const [sorting, setSorting] = useState<SortingState>([]);
  const [pasteReport, setPasteReport] = useState<{ added: string[]; problems: string[] } | null>(null);
  const f = doc[face];
  const rows = useMemo<Row[]>(
    () => (f.holes ?? []).map((hole, index) => {
      const p = holeFacePosition(f, hole);
      return { index, hole, x: p?.x ?? null, y: p?.y ?? null };
    }),
    [f],
  );
  const unitHead = units.length === 'mm' ? 'mm' : 'in';
  const issueAt = (i: number, field: string) => issues.get(`${face}.holes.${i}.${field}`);

  const columns = useMemo(
    () => [
      col.accessor((r) => r.hole.id, {
        id: 'id',
        header: 'ID',
        size: 64,
        cell: ({ row }) => (
          <CellInput
            cell={`${row.index}:id`}
            label={`${row.original.hole.id} id`}
            value={row.original.hole.id}
            issue={issueAt(row.original.index, 'id')}
            read={(t): CellVerdict =>
              /^[A-Za-z][A-Za-z0-9_-]{0,15}$/.test(t.trim())
                ? { ok: true, apply: () => commit((d) => patchHole(d, face, row.original.index, { id: t.trim() }), `id:${face}:${row.original.index}`) }
                : { ok: false, message: 'an id starts with a letter: E1, TD2 …' }
            }
            className="font-semibold"
          />
        ),
      }),
      col.accessor((r) => r.hole.role, {
        id: 'role',
        header: 'Role',
        size: 88,
        cell: ({ row }) => (
          <select
            aria-label={`${row.original.hole.id} role`}
            value={row.original.hole.role}
            disabled={readOnly}
            onChange={(e) => commit((d) => patchHole(d, face, row.original.index, roleBody(row.original.hole, e.target.value as HoleInput['role'])))}
            className="w-full rounded-sm border border-transparent bg-transparent py-1 pl-0.5 pr-0 text-[14px] hover:border-blast-200"
          >
            {ROLES.map((r) => <option key={r} value={r}>{r}</option>)}
          </select>
        ),
      }),
      ...(['x', 'y'] as const).map((axis) =>
        col.accessor((r) => r[axis] ?? Number.NaN, {
          id: axis,
          header: `${axis.toUpperCase()} (${unitHead})`,
          size: 94,
          cell: ({ row }) => {
            const r = row.original;
            const onPattern = r.hole.patternId !== undefined;
            return (
              <CellInput
                cell={`${row.index}:${axis}`}
                label={`${r.hole.id} ${axis.toUpperCase()}`}
                value={editText(r[axis] ?? undefined, units)}
                alt={otherUnitText(r[axis] ?? undefined, units)}
                muted={onPattern}
                title={onPattern ? `on bolt circle ${r.hole.patternId}, slot ${(r.hole.index ?? 0) + 1}; typing a value places the hole by coordinates` : undefined}
                issue={issueAt(r.index, axis)}
                read={(t) => {
                  const v = readLength(t, units);
                  if (!v.ok) return v;
                  return { ok: true, apply: () => commit((d) => setHoleCoordinate(d, face, r.index, axis, v.mm), `${axis}:${face}:${r.hole.id}`) };
                }}
                className="text-right"
              />
            );
          },
        }),
      ),
      col.accessor((r) => (r.hole.role === 'dowel' ? (r.hole.dowel?.diameterMm ?? 0) : (r.hole.fastener ?? '')), {
        id: 'size',
        header: 'Size',
        size: 96,
        sortingFn: 'alphanumeric',
        cell: ({ row }) => {
          const r = row.original;
          if (r.hole.role === 'dowel') {
            return (
              <div className="flex items-center gap-1">
                <span className="text-plate-500" aria-hidden="true">⌀</span>
                <CellInput
                  cell={`${row.index}:size`}
                  label={`${r.hole.id} dowel diameter`}
                  value={editText(r.hole.dowel?.diameterMm, units)}
                  alt={otherUnitText(r.hole.dowel?.diameterMm, units)}
                  issue={issueAt(r.index, 'dowel') ?? issues.get(`${face}.holes.${r.index}.dowel.fit`)}
                  read={(t) => {
                    const v = readLength(t, units, { positive: true });
                    if (!v.ok) return v;
                    return { ok: true, apply: () => commit((d) => patchHole(d, face, r.index, { dowel: { fit: 'H7', ...r.hole.dowel, diameterMm: v.mm } }), `dowel:${face}:${r.hole.id}`) };
                  }}
                />
              </div>
            );
          }
          return (
            <CellInput
              cell={`${row.index}:size`}
              label={`${r.hole.id} fastener`}
              value={r.hole.fastener ?? ''}
              issue={issueAt(r.index, 'fastener')}
              read={(t) => {
                try {
                  parseFastener(t);
                } catch (e) {
                  if (!isDomainError(e)) throw e;
                  return { ok: false, message: `"${t}" is not a fastener: e.g. M10x1.5, M8, 3/8-16 UNC` };
                }
                return { ok: true, apply: () => commit((d) => patchHole(d, face, r.index, { fastener: t.trim() }), `fastener:${face}:${r.hole.id}`) };
              }}
            />
          );
        },
      }),
      col.display({
        id: 'detail',
        header: 'Class / fit',
        size: 84,
        cell: ({ row }) => {
          const h = row.original.hole;
          if (h.role === 'dowel') {
            return (
              <input
                aria-label={`${h.id} dowel fit`}
                value={h.dowel?.fit ?? 'H7'}
                disabled={readOnly}
                onChange={(e) => commit((d) => patchHole(d, face, row.original.index, { dowel: { diameterMm: h.dowel?.diameterMm ?? 10, fit: e.target.value } }), `fit:${face}:${h.id}`)}
                className={`w-full rounded-sm border px-1.5 py-1 font-mono text-[15px] ${issues.get(`${face}.holes.${row.original.index}.dowel.fit`) ? 'border-finding-error' : 'border-transparent hover:border-blast-200'}`}
              />
            );
          }
          if (h.role === 'tapped') return <span className="px-1.5 text-sm text-plate-500">tap drill</span>;
          const inch = /-|^#|^\d+\/\d+/.test(h.fastener ?? '') && !/^M/i.test(h.fastener ?? '');
          const classes = inch ? CLASSES_INCH : CLASSES_METRIC;
          return (
            <select
              aria-label={`${h.id} clearance class`}
              value={h.clearanceClass ?? ''}
              disabled={readOnly}
              onChange={(e) => commit((d) => patchHole(d, face, row.original.index, { clearanceClass: e.target.value || undefined }))}
              className="w-full rounded-sm border border-transparent bg-transparent px-1 py-1 text-[15px] hover:border-blast-200"
            >
              <option value="">{inch ? 'normal (default)' : 'medium (default)'}</option>
              {classes.map((c) => <option key={c} value={c}>{c}</option>)}
            </select>
          );
        },
      }),
      col.display({
        id: 'cbore',
        header: "C'bore",
        size: 50,
        cell: ({ row }) => {
          const h = row.original.hole;
          if (h.role !== 'clearance') return null;
          return (
            <label className="flex items-center justify-center py-1">
              <input
                type="checkbox"
                aria-label={`${h.id} counterbore`}
                className="h-5 w-5 accent-plate-700"
                checked={h.counterbore !== undefined}
                disabled={readOnly}
                onChange={(e) => commit((d) => patchHole(d, face, row.original.index, { counterbore: e.target.checked ? {} : undefined }))}
              />
            </label>
          );
        },
      }),
      col.display({
        id: 'actions',
        header: '',
        size: 62,
        cell: ({ row }) => (
          <div className="flex justify-end gap-0.5">
            <button type="button" disabled={readOnly} title={`Duplicate ${row.original.hole.id} (10 mm to the right)`} aria-label={`Duplicate ${row.original.hole.id}`}
              className="rounded px-1.5 py-1 text-plate-700 hover:bg-plate-100"
              onClick={() => {
                const r = duplicateHole(doc, face, row.original.index);
                commit(r.doc);
                onSelect([r.id]);
              }}>
              <svg width="16" height="16" viewBox="0 0 16 16" aria-hidden="true" fill="none" stroke="currentColor" strokeWidth="1.6"><rect x="5" y="5" width="9" height="9" rx="1" /><path d="M11 5V3a1 1 0 0 0-1-1H3a1 1 0 0 0-1 1v7a1 1 0 0 0 1 1h2" /></svg>
            </button>
            <button type="button" disabled={readOnly} title={`Delete ${row.original.hole.id}`} aria-label={`Delete ${row.original.hole.id}`}
              className="rounded px-1.5 py-1 text-finding-error hover:bg-red-50"
              onClick={() => commit((d) => deleteHoles(d, face, [row.original.index]))}>✕</button>
          </div>
        ),
      }),
    ],
    // eslint-disable-next-line react-hooks/exhaustive-deps
    [doc, face, units, issues, readOnly],
  );

  const table = useReactTable({
    data: rows,
    columns,
    state: { sorting },
    onSortingChange: setSorting,
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: getSortedRowModel(),
    getRowId: (r) => `${r.index}`,
  });

  const onPaste = (e: ClipboardEvent<HTMLDivElement>) => {
    if (readOnly) return;
    const text = e.clipboardData.getData('text/plain');
    if (!text.includes('\n') && !text.includes('\t')) return; // one value: an ordinary paste into a cell
    e.preventDefault();
    const parsed = parseHoleRows(text, units.length);
    let added: string[] = [];
    if (parsed.rows.length > 0) {
      const r = addPastedRows(doc, face, parsed.rows, { role: 'clearance', fastener: 'M10x1.5' });
      commit(r.doc);
      added = r.ids;
      onSelect(r.ids);
    }
    setPasteReport({ added, problems: parsed.problems.map((p) => p.message) });
  };

  const selectedSet = new Set(selected);
  return (
    <div onPaste={onPaste} data-testid={`hole-table-${face}`} className="overflow-x-auto">
      <table className="w-full table-fixed border-collapse text-[15px]">
        <colgroup>
          {table.getVisibleLeafColumns().map((c) => <col key={c.id} style={{ width: c.getSize() }} />)}
        </colgroup>
        <thead className="sticky top-0 z-10 bg-plate-100 text-left text-[13px] uppercase tracking-wide text-plate-700">
          {table.getHeaderGroups().map((hg) => (
            <tr key={hg.id}>
              {hg.headers.map((h) => (
                <th key={h.id} className="px-1.5 py-1.5 font-semibold" aria-sort={h.column.getIsSorted() === 'asc' ? 'ascending' : h.column.getIsSorted() === 'desc' ? 'descending' : undefined}>
                  {h.column.getCanSort() ? (
                    <button type="button" className="flex items-center gap-1 uppercase" onClick={h.column.getToggleSortingHandler()}>
                      {flexRender(h.column.columnDef.header, h.getContext())}
                      <span aria-hidden="true">{{ asc: '▲', desc: '▼' }[h.column.getIsSorted() as string] ?? ''}</span>
                    </button>
                  ) : (
                    flexRender(h.column.columnDef.header, h.getContext())
                  )}
                </th>
              ))}
            </tr>
          ))}
        </thead>
        <tbody>
          {table.getRowModel().rows.map((row) => {
            const id = row.original.hole.id;
            const hot = hovered === id || selectedSet.has(id);
            return (
              <tr
                key={row.id}
                data-row={id}
                data-hot={hot ? 'true' : undefined}
                onPointerEnter={() => onHover(id)}
                onPointerLeave={() => onHover(null)}
                onFocus={() => onSelect([id])}
                className={`border-b border-blast-200 ${hot ? 'bg-brass-500/25' : 'odd:bg-white even:bg-blast-50'}`}
              >
                {row.getVisibleCells().map((c) => (
                  <td key={c.id} className="px-0.5 py-0.5 align-middle">{renderCell(c.column.columnDef.cell, c.getContext())}</td>
                ))}
              </tr>
            );
          })}
        </tbody>
      </table>
      {rows.length === 0 && <p className="p-3 text-sm text-plate-700">No holes on this face yet. Add a bolt circle above, or paste rows (X, Y, size) from a spreadsheet into this table.</p>}
      <MeasuredSource doc={doc} face={face} units={units} hovered={hovered} selected={selected} />
      {pasteReport && (
        <div role="status" className={`mt-2 rounded border px-3 py-2 text-sm ${pasteReport.problems.length ? 'border-finding-warning bg-amber-50' : 'border-emerald-600 bg-emerald-50'}`} data-testid="paste-report">
          <p className="font-semibold">{pasteReport.added.length ? `Added ${pasteReport.added.length} hole${pasteReport.added.length === 1 ? '' : 's'}: ${pasteReport.added.join(', ')}` : 'Nothing added.'}</p>
          {pasteReport.problems.length > 0 && <ul className="mt-1 list-disc pl-5">{pasteReport.problems.map((p) => <li key={p}>{p}</li>)}</ul>}
          <button type="button" className="mt-1 text-xs underline" onClick={() => setPasteReport(null)}>dismiss</button>
        </div>
      )}
    </div>
  );
});
