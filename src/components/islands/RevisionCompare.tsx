import { useQuery } from '@tanstack/react-query';
import { useMemo, useState } from 'react';
import { plateProfile, parsePlateSpec } from '~/domain';
import type { PlateProfile } from '~/domain/profileTypes';
import { apiGet } from '../api';
import { QueryRoot } from '../QueryRoot';
import { PlateDrawing, type HoleMark } from '../PlateDrawing';

interface Comparison {
  a: { id: number; number: number };
  b: { id: number; number: number };
  holesAdded: { id: string }[];
  holesRemoved: { id: string }[];
  holesMoved: { id: string; distanceMm: number }[];
  holesChanged: { id: string; changes: { field: string; from: unknown; to: unknown }[] }[];
  otherChanges: { path: string; from: unknown; to: unknown }[];
}

function useProfile(revisionId: number | null) {
  return useQuery({
    queryKey: ['revision', revisionId],
    enabled: revisionId !== null,
    queryFn: async () => {
      const r = await apiGet<{ revision: { spec: unknown } }>(`/api/revisions/${revisionId}`);
      return plateProfile(parsePlateSpec(r.revision.spec)) as PlateProfile;
    },
  });
}

const fmt = (v: unknown) => (typeof v === 'number' ? (Math.round(v * 1000) / 1000).toString() : JSON.stringify(v));

function Compare({ revisions }: { revisions: { id: number; number: number }[] }) {
  const [aId, setA] = useState<number | null>(revisions[1]?.id ?? null);
  const [bId, setB] = useState<number | null>(revisions[0]?.id ?? null);
  const cmp = useQuery({
    queryKey: ['compare', aId, bId],
    enabled: aId !== null && bId !== null && aId !== bId,
    queryFn: () => apiGet<{ comparison: Comparison }>(`/api/revisions/${aId}/compare/${bId}`).then((r) => r.comparison),
  });
  const pa = useProfile(aId);
  const pb = useProfile(bId);
  const marks = useMemo(() => {
    const before: Record<string, HoleMark> = {};
    const after: Record<string, HoleMark> = {};
    const c = cmp.data;
    if (c) {
      for (const h of c.holesRemoved) before[h.id] = 'removed';
      for (const h of c.holesAdded) after[h.id] = 'added';
      for (const h of c.holesMoved) before[h.id] = after[h.id] = 'moved';
      for (const h of c.holesChanged) {
        before[h.id] ??= 'changed';
        after[h.id] ??= 'changed';
      }
    }
    return { before, after };
  }, [cmp.data]);
  if (revisions.length < 2) return <p className="text-sm text-plate-500">Comparison needs two revisions; this plate has {revisions.length}.</p>;
  const sel = (value: number | null, set: (n: number) => void, label: string) => (
    <label className="text-sm font-semibold">
      {label}{' '}
      <select value={value ?? ''} onChange={(e) => set(Number(e.target.value))} className="rounded border border-blast-200 px-2 py-1 font-normal">
        {revisions.map((r) => (
          <option key={r.id} value={r.id}>rev {r.number}</option>
        ))}
      </select>
    </label>
  );
  const c = cmp.data;
  return (
    <div className="space-y-4" data-testid="compare">
      <div className="flex gap-6">{sel(aId, setA, 'From')}{sel(bId, setB, 'To')}</div>
      {aId === bId && <p className="text-sm text-plate-500">Pick two different revisions.</p>}
      {cmp.error && <p role="alert" className="text-finding-error">{(cmp.error as Error).message}</p>}
      <p className="flex flex-wrap gap-4 text-xs text-plate-700" aria-label="legend">
        <span><span className="inline-block h-3 w-3 rounded-full border-2 border-plate-900 bg-white align-middle" /> engine face</span>
        <span><span className="inline-block h-3 w-3 rounded-full border-2 border-brass-700 bg-amber-50 align-middle" /> transmission face</span>
        <span className="font-semibold text-emerald-700">◯ added</span>
        <span className="font-semibold text-finding-error">◯ removed</span>
        <span className="font-semibold text-finding-warning">◯ moved</span>
        <span className="font-semibold text-purple-700">◯ changed</span>
      </p>
      <div className="grid gap-4 md:grid-cols-2">
        <div>{pa.data && <PlateDrawing profile={pa.data} marks={marks.before} title="earlier revision" />}</div>
        <div>{pb.data && <PlateDrawing profile={pb.data} marks={marks.after} title="later revision" />}</div>
      </div>
      {c && (
        <div className="grid gap-4 text-sm md:grid-cols-2">
          <ul className="space-y-1" aria-label="hole changes">
            {c.holesAdded.map((h) => <li key={'a' + h.id}><span className="font-semibold text-emerald-700">added</span> {h.id}</li>)}
            {c.holesRemoved.map((h) => <li key={'r' + h.id}><span className="font-semibold text-finding-error">removed</span> {h.id}</li>)}
            {c.holesMoved.map((h) => <li key={'m' + h.id}><span className="font-semibold text-finding-warning">moved</span> {h.id} by {h.distanceMm.toFixed(3)} mm</li>)}
            {c.holesChanged.map((h) => <li key={'c' + h.id}><span className="font-semibold text-purple-700">changed</span> {h.id}: {h.changes.map((x) => `${x.field} ${fmt(x.from)} → ${fmt(x.to)}`).join(', ')}</li>)}
            {!c.holesAdded.length && !c.holesRemoved.length && !c.holesMoved.length && !c.holesChanged.length && <li className="text-plate-500">No hole changed.</li>}
          </ul>
          <ul className="space-y-1" aria-label="other changes">
            {c.otherChanges.map((o) => <li key={o.path}><span className="font-mono">{o.path}</span>: {fmt(o.from)} → {fmt(o.to)}</li>)}
            {!c.otherChanges.length && <li className="text-plate-500">No other field changed.</li>}
          </ul>
        </div>
      )}
    </div>
  );
}

export default function RevisionCompare(props: { revisions: { id: number; number: number }[] }) {
  return (
    <QueryRoot>
      <Compare {...props} />
    </QueryRoot>
  );
}
