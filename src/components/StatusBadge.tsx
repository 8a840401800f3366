const LABELS: Record<string, { label: string; cls: string }> = {
  draft: { label: 'Draft', cls: 'bg-blast-200 text-plate-900' },
  in_review: { label: 'In review', cls: 'bg-plate-100 text-plate-900 ring-1 ring-plate-500' },
  approved: { label: 'Released', cls: 'bg-emerald-100 text-emerald-900 ring-1 ring-emerald-600' },
  changes_requested: { label: 'Changes requested', cls: 'bg-amber-100 text-amber-900 ring-1 ring-amber-600' },
  superseded: { label: 'Superseded', cls: 'bg-white text-plate-500 ring-1 ring-blast-200 line-through' },
  empty: { label: 'No revisions', cls: 'bg-white text-plate-500 ring-1 ring-blast-200' },
};

export function StatusBadge({ status }: { status: string }) {
  const s = LABELS[status] ?? { label: status, cls: 'bg-blast-200' };
  return <span className={`inline-block rounded px-2 py-0.5 text-xs font-semibold ${s.cls}`} data-status={status}>{s.label}</span>;
}

export function CheckCounts({ counts }: { counts: { error: number; warning: number; note: number } }) {
  return (
    <span className="inline-flex gap-2 text-xs font-semibold tabular-nums">
      <span className={counts.error ? 'text-finding-error' : 'text-plate-300'} title="errors">● {counts.error} error{counts.error === 1 ? '' : 's'}</span>
      <span className={counts.warning ? 'text-finding-warning' : 'text-plate-300'} title="warnings">▲ {counts.warning} warning{counts.warning === 1 ? '' : 's'}</span>
    </span>
  );
}
