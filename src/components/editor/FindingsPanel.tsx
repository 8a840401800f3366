import { memo } from 'react';
import type { Finding, SpecIssue } from '~/domain';
import { lengthsInUnits } from '~/domain/editor/findingUnits';
import type { DisplayUnits } from '~/domain/editor/units';

const SEV = {
  error: { label: 'Error', cls: 'border-finding-error text-finding-error', dot: '●' },
  warning: { label: 'Warning', cls: 'border-finding-warning text-finding-warning', dot: '▲' },
  note: { label: 'Note', cls: 'border-finding-note text-finding-note', dot: '■' },
} as const;

/** Live check findings (and spec problems that stop the plate being laid out). Clicking a finding selects its features. */
const RANK = { error: 0, warning: 1, note: 2 } as const;

export const FindingsPanel = memo(function FindingsPanel({ findings, issues, selected, onPick, units }: { findings: readonly Finding[]; issues: readonly SpecIssue[]; selected: number | null; onPick(i: number, f: Finding): void; units: DisplayUnits }) {
  // errors first, then warnings, then notes; the index stays the finding's own (for the drawing)
  const order = findings.map((f, i) => ({ f, i })).sort((a, b) => RANK[a.f.severity] - RANK[b.f.severity] || a.i - b.i);
  return (
    <section aria-labelledby="findings-h" className="flex h-full min-h-0 flex-col" data-testid="findings-panel">
      <h2 id="findings-h" className="border-b border-blast-200 px-3 py-2 text-sm font-bold uppercase tracking-wide text-plate-700">
        Checks <span className="font-normal normal-case">(live)</span>
      </h2>
      <div className="min-h-0 flex-1 overflow-auto p-2">
        {issues.length > 0 && (
          <div className="mb-2 rounded border-l-4 border-finding-error bg-red-50 p-2 text-sm" data-testid="spec-issues">
            <p className="font-bold text-finding-error">The plate cannot be laid out until these are fixed:</p>
            <ul className="mt-1 space-y-0.5">{issues.map((i) => <li key={i.path}><code className="text-xs">{i.path}</code>: {lengthsInUnits(i.message, units)}</li>)}</ul>
          </div>
        )}
        {findings.length === 0 && issues.length === 0 && <p className="p-2 text-sm text-emerald-800">No findings: every check passes.</p>}
        <ul className="space-y-1.5">
          {order.map(({ f, i }) => {
            const s = SEV[f.severity];
            return (
              <li key={`${f.code}-${f.featureIds.join('-')}-${i}`}>
                <button
                  type="button"
                  data-finding-code={f.code}
                  data-severity={f.severity}
                  onClick={() => onPick(i, f)}
                  aria-pressed={selected === i}
                  className={`w-full rounded border-l-4 bg-white px-2.5 py-1.5 text-left text-[15px] leading-snug shadow-sm hover:bg-plate-100 ${s.cls} ${selected === i ? 'ring-2 ring-brass-500' : ''}`}
                >
                  <span className="flex items-baseline gap-2 text-xs font-bold uppercase">
                    <span aria-hidden="true">{s.dot}</span>{s.label}
                    <span className="font-mono font-semibold normal-case text-plate-700">{f.featureIds.join(' · ')}</span>
                  </span>
                  <span className="block text-slate-ink" data-finding-message>{lengthsInUnits(f.message, units)}</span>
                  <span className="mt-0.5 block text-xs text-plate-500">{lengthsInUnits(f.rule, units)} — {f.source}</span>
                </button>
              </li>
            );
          })}
        </ul>
      </div>
    </section>
  );
});
