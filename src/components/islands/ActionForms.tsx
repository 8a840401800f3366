import { useState, type FormEvent, type ReactNode } from 'react';
import { apiSend, ApiError } from '../api';

function useAction() {
  const [error, setError] = useState<string | null>(null);
  const [pending, setPending] = useState(false);
  const run = async (fn: () => Promise<unknown>, after: () => void) => {
    setError(null);
    setPending(true);
    try {
      await fn();
      after();
    } catch (e) {
      setError(e instanceof ApiError ? e.message : 'The request failed; nothing was changed.');
    } finally {
      setPending(false);
    }
  };
  return { error, pending, run };
}

const btn = 'rounded px-4 py-2 font-semibold disabled:opacity-50';

function Err({ error }: { error: string | null }): ReactNode {
  return error ? <p role="alert" className="text-sm text-finding-error">{error}</p> : null;
}

/** New plate in a project: part number suggested, title, material. */
export function NewPlateForm({ projectId, suggestedPartNumber }: { projectId: number; suggestedPartNumber: string }) {
  const [partNumber, setPartNumber] = useState(suggestedPartNumber);
  const [title, setTitle] = useState('');
  const [material, setMaterial] = useState('6061-T651 aluminium');
  const a = useAction();
  const submit = (e: FormEvent) => {
    e.preventDefault();
    a.run(
      () => apiSend<{ plate: { id: number } }>('POST', `/api/projects/${projectId}/plates`, { partNumber, title, material }).then((r) => (window.location.href = `/plates/${r.plate.id}`)),
      () => {},
    );
  };
  return (
    <form onSubmit={submit} className="grid gap-3 sm:grid-cols-[10rem_1fr_14rem_auto] sm:items-end" aria-label="New plate">
      <label className="text-sm font-semibold">Part number<input value={partNumber} onChange={(e) => setPartNumber(e.target.value)} className="mt-1 block w-full rounded border border-blast-200 px-2 py-1.5 font-mono font-normal" /></label>
      <label className="text-sm font-semibold">Title<input required value={title} onChange={(e) => setTitle(e.target.value)} placeholder="e.g. engine-to-gearbox adapter" className="mt-1 block w-full rounded border border-blast-200 px-2 py-1.5 font-normal" /></label>
      <label className="text-sm font-semibold">Material<input value={material} onChange={(e) => setMaterial(e.target.value)} className="mt-1 block w-full rounded border border-blast-200 px-2 py-1.5 font-normal" /></label>
      <button disabled={a.pending} className={`${btn} bg-plate-900 text-white hover:bg-plate-700`}>Add plate</button>
      <div className="sm:col-span-4"><Err error={a.error} /></div>
    </form>
  );
}

export function AddMemberForm({ projectId }: { projectId: number }) {
  const [email, setEmail] = useState('');
  const a = useAction();
  const submit = (e: FormEvent) => {
    e.preventDefault();
    a.run(() => apiSend('POST', `/api/projects/${projectId}/members`, { email }), () => window.location.reload());
  };
  return (
    <form onSubmit={submit} className="flex flex-wrap items-end gap-2" aria-label="Add member">
      <label className="text-sm font-semibold">Add a member by e-mail<input type="email" required value={email} onChange={(e) => setEmail(e.target.value)} className="mt-1 block w-64 rounded border border-blast-200 px-2 py-1.5 font-normal" /></label>
      <button disabled={a.pending} className={`${btn} border border-plate-700 text-plate-900 hover:bg-plate-100`}>Add</button>
      <Err error={a.error} />
    </form>
  );
}

export function SubmitForReview({ revisionId, number }: { revisionId: number; number: number }) {
  const [comment, setComment] = useState('');
  const a = useAction();
  return (
    <form
      aria-label="Submit for review"
      onSubmit={(e) => {
        e.preventDefault();
        a.run(() => apiSend('POST', `/api/revisions/${revisionId}/submit`, { comment }), () => window.location.reload());
      }}
      className="space-y-2"
    >
      <label className="block text-sm font-semibold">Note for the engineer (optional)<textarea value={comment} onChange={(e) => setComment(e.target.value)} rows={2} className="mt-1 block w-full rounded border border-blast-200 px-2 py-1.5 font-normal" /></label>
      <button disabled={a.pending} className={`${btn} bg-plate-900 text-white hover:bg-plate-700`}>Submit revision {number} for review</button>
      <Err error={a.error} />
    </form>
  );
}

interface FindingLite {
  code: string;
  severity: string;
  message: string;
  featureIds: string[];
}

/** The engineer's decision on a revision in review: approve (with a written waiver per error) or request changes. */
export function ReviewDecision({ revisionId, number, errors }: { revisionId: number; number: number; errors: FindingLite[] }) {
  const [comment, setComment] = useState('');
  const [reasons, setReasons] = useState<string[]>(errors.map(() => ''));
  const a = useAction();
  const approve = () =>
    a.run(
      () =>
        apiSend('POST', `/api/revisions/${revisionId}/approve`, {
          comment,
          waivers: errors.map((f, i) => ({ code: f.code, featureIds: f.featureIds, reason: reasons[i] })).filter((w) => w.reason.trim()),
        }),
      () => window.location.reload(),
    );
  const requestChanges = () => a.run(() => apiSend('POST', `/api/revisions/${revisionId}/request-changes`, { comment }), () => window.location.reload());
  return (
    <form aria-label="Review decision" onSubmit={(e) => e.preventDefault()} className="space-y-3">
      {errors.length > 0 && (
        <fieldset className="space-y-2 rounded border border-finding-error/40 bg-red-50 p-3">
          <legend className="px-1 text-sm font-bold text-finding-error">{errors.length} check error{errors.length === 1 ? '' : 's'}: approval needs a written waiver for each</legend>
          {errors.map((f, i) => (
            <label key={i} className="block text-sm">
              <span className="font-semibold">{f.code}</span> {f.featureIds.length ? `(${f.featureIds.join(', ')})` : ''} — {f.message}
              <input value={reasons[i]} onChange={(e) => setReasons(reasons.map((r, j) => (j === i ? e.target.value : r)))} placeholder="why this is acceptable" className="mt-1 block w-full rounded border border-blast-200 bg-white px-2 py-1" />
            </label>
          ))}
        </fieldset>
      )}
      <label className="block text-sm font-semibold">Comment (required to request changes)<textarea value={comment} onChange={(e) => setComment(e.target.value)} rows={3} className="mt-1 block w-full rounded border border-blast-200 px-2 py-1.5 font-normal" /></label>
      <div className="flex gap-2">
        <button type="button" onClick={approve} disabled={a.pending} className={`${btn} bg-emerald-700 text-white hover:bg-emerald-800`}>Approve revision {number}</button>
        <button type="button" onClick={requestChanges} disabled={a.pending} className={`${btn} border border-amber-700 text-amber-900 hover:bg-amber-50`}>Request changes</button>
      </div>
      <Err error={a.error} />
    </form>
  );
}
