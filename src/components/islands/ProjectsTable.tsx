import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { useState, type FormEvent } from 'react';
import { apiGet, apiSend, ApiError } from '../api';
import { QueryRoot } from '../QueryRoot';
import { StatusBadge } from '../StatusBadge';

interface ProjectSummary {
  id: number;
  name: string;
  swapDescription: string;
  owner: { name: string };
  plateCount: number;
  status: string;
  updatedAt: string;
}

const STATUSES = ['all', 'draft', 'in_review', 'changes_requested', 'approved', 'empty'] as const;

function Table({ canCreate }: { canCreate: boolean }) {
  const [q, setQ] = useState('');
  const [status, setStatus] = useState<(typeof STATUSES)[number]>('all');
  const qc = useQueryClient();
  const { data, isLoading, error } = useQuery({
    queryKey: ['projects', q],
    queryFn: () => apiGet<{ projects: ProjectSummary[] }>(`/api/projects${q ? `?q=${encodeURIComponent(q)}` : ''}`),
  });
  const [name, setName] = useState('');
  const [swap, setSwap] = useState('');
  const create = useMutation({
    mutationFn: () => apiSend<{ project: { id: number } }>('POST', '/api/projects', { name, swapDescription: swap }),
    onSuccess: (r) => {
      qc.invalidateQueries({ queryKey: ['projects'] });
      window.location.href = `/projects/${r.project.id}`;
    },
  });
  const rows = (data?.projects ?? []).filter((p) => status === 'all' || p.status === status);
  const onCreate = (e: FormEvent) => {
    e.preventDefault();
    create.mutate();
  };
  return (
    <div className="space-y-6">
      <div className="flex flex-wrap items-end gap-3">
        <label className="flex flex-col text-sm font-semibold">
          Search
          <input type="search" value={q} onChange={(e) => setQ(e.target.value)} placeholder="name or swap" className="mt-1 w-72 rounded border border-blast-200 bg-white px-3 py-1.5 font-normal" />
        </label>
        <label className="flex flex-col text-sm font-semibold">
          Status
          <select value={status} onChange={(e) => setStatus(e.target.value as (typeof STATUSES)[number])} className="mt-1 rounded border border-blast-200 bg-white px-2 py-1.5 font-normal">
            {STATUSES.map((s) => (
              <option key={s} value={s}>{s === 'all' ? 'All' : s.replace('_', ' ')}</option>
            ))}
          </select>
        </label>
      </div>
      {error && <p role="alert" className="text-finding-error">{(error as Error).message}</p>}
      {isLoading ? (
        <p className="text-plate-500">Loading projects…</p>
      ) : rows.length === 0 ? (
        <div className="rounded-lg border border-dashed border-plate-300 bg-white p-8 text-center">
          <p className="font-semibold">{data?.projects.length ? 'No project matches.' : 'No projects yet.'}</p>
          <p className="mt-1 text-sm text-plate-700">{canCreate ? 'Start one for the swap you are working on: name it after the car or the engine and gearbox it joins.' : 'Projects appear here once a designer starts one.'}</p>
        </div>
      ) : (
        <table className="w-full border-collapse overflow-hidden rounded-lg bg-white text-left text-[15px] shadow-sm">
          <thead className="bg-plate-100 text-sm text-plate-900">
            <tr><th className="px-3 py-2">Project</th><th className="px-3 py-2">Swap</th><th className="px-3 py-2">Owner</th><th className="px-3 py-2 text-right">Plates</th><th className="px-3 py-2">Status</th><th className="px-3 py-2">Updated</th></tr>
          </thead>
          <tbody>
            {rows.map((p) => (
              <tr key={p.id} className="border-t border-blast-200 hover:bg-blast-50">
                <td className="px-3 py-2 font-semibold"><a className="text-plate-700 underline-offset-2 hover:underline" href={`/projects/${p.id}`}>{p.name}</a></td>
                <td className="max-w-md truncate px-3 py-2 text-plate-700" title={p.swapDescription}>{p.swapDescription}</td>
                <td className="px-3 py-2">{p.owner.name}</td>
                <td className="px-3 py-2 text-right tabular-nums">{p.plateCount}</td>
                <td className="px-3 py-2"><StatusBadge status={p.status} /></td>
                <td className="px-3 py-2 text-sm text-plate-500">{new Date(p.updatedAt).toLocaleDateString('en-GB', { day: 'numeric', month: 'short', year: 'numeric' })}</td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
      {canCreate && (
        <form onSubmit={onCreate} className="max-w-2xl space-y-3 rounded-lg border border-blast-200 bg-white p-5" aria-label="New project">
          <h2 className="font-bold">New project</h2>
          <label className="block text-sm font-semibold">Name<input required value={name} onChange={(e) => setName(e.target.value)} className="mt-1 block w-full rounded border border-blast-200 px-3 py-1.5 font-normal" /></label>
          <label className="block text-sm font-semibold">Swap (engine → transmission, vehicle)<textarea value={swap} onChange={(e) => setSwap(e.target.value)} rows={2} className="mt-1 block w-full rounded border border-blast-200 px-3 py-1.5 font-normal" /></label>
          {create.error && <p role="alert" className="text-sm text-finding-error">{(create.error as ApiError).message}</p>}
          <button type="submit" disabled={create.isPending} className="rounded bg-plate-900 px-4 py-2 font-semibold text-white hover:bg-plate-700 disabled:opacity-50">Create project</button>
        </form>
      )}
    </div>
  );
}

export default function ProjectsTable(props: { canCreate: boolean }) {
  return (
    <QueryRoot>
      <Table {...props} />
    </QueryRoot>
  );
}
