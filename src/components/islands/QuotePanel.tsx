import { useState, type FormEvent } from 'react';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { QueryRoot } from '../QueryRoot';
import { apiGet, apiSend, ApiError } from '../api';
import { formatMoney } from '~/domain/quote/money';
import type { QuoteView } from '~/server/repos/orders';

const btn = 'rounded px-4 py-2 font-semibold disabled:opacity-50';
const date = (iso: string) => new Date(iso).toLocaleDateString('en-GB', { day: 'numeric', month: 'short', year: 'numeric', timeZone: 'UTC' });

function QuoteTable({ q }: { q: QuoteView }) {
  const m = (minor: number) => formatMoney(minor, q.currency, q.currencyMinorDigits);
  const plate = q.lines.filter((l) => l.per === 'plate');
  const order = q.lines.filter((l) => l.per === 'order');
  return (
    <table className="w-full text-sm" data-testid="quote-lines">
      <thead className="bg-plate-100 text-left"><tr><th className="px-2 py-1">Per plate</th><th className="px-2 py-1">How it is worked out</th><th className="px-2 py-1 text-right">Amount</th></tr></thead>
      <tbody>
        {plate.map((l) => (
          <tr key={l.code} className="border-t border-blast-200"><td className="px-2 py-1">{l.label}</td><td className="px-2 py-1 text-xs text-plate-700">{l.basis}</td><td className="px-2 py-1 text-right tabular-nums">{m(l.amountMinor)}</td></tr>
        ))}
        <tr className="border-t-2 border-plate-300 font-semibold"><td className="px-2 py-1" colSpan={2}>One plate</td><td className="px-2 py-1 text-right tabular-nums">{m(q.totals.perPlateMinor)}</td></tr>
        {order.map((l) => (
          <tr key={l.code} className={l.code === 'tax' ? 'border-t border-blast-200' : 'border-t border-blast-200'}><td className="px-2 py-1">{l.label}</td><td className="px-2 py-1 text-xs text-plate-700">{l.basis}</td><td className="px-2 py-1 text-right tabular-nums">{m(l.amountMinor)}</td></tr>
        ))}
        <tr className="border-t-2 border-plate-900 text-base font-bold"><td className="px-2 py-1.5" colSpan={2}>Total</td><td className="px-2 py-1.5 text-right tabular-nums" data-testid="quote-total">{m(q.totals.totalMinor)}</td></tr>
      </tbody>
    </table>
  );
}

function Panel({ revisionId, partNumber, revisionNumber }: { revisionId: number; partNumber: string; revisionNumber: number }) {
  const qc = useQueryClient();
  const [quantity, setQuantity] = useState('1');
  const [error, setError] = useState<string | null>(null);
  const list = useQuery({ queryKey: ['quotes', revisionId], queryFn: () => apiGet<{ quotes: QuoteView[] }>(`/api/revisions/${revisionId}/quotes`) });
  const request = useMutation({
    mutationFn: (n: number) => apiSend<{ quote: QuoteView }>('POST', `/api/revisions/${revisionId}/quotes`, { quantity: n }),
    onSuccess: () => qc.invalidateQueries({ queryKey: ['quotes', revisionId] }),
    onError: (e) => setError(e instanceof ApiError ? e.message : 'The request failed; nothing was saved.'),
  });
  const accept = useMutation({
    mutationFn: (id: number) => apiSend<{ checkoutUrl: string }>('POST', `/api/quotes/${id}/accept`, {}),
    onSuccess: (r) => window.location.assign(r.checkoutUrl),
    onError: (e) => setError(e instanceof ApiError ? e.message : 'The payment page could not be opened; nothing was charged.'),
  });
  const submit = (e: FormEvent) => {
    e.preventDefault();
    setError(null);
    const n = Number(quantity);
    if (!Number.isInteger(n) || n < 1) return setError('Quantity must be a whole number of plates, 1 or more.');
    request.mutate(n);
  };
  const quotes = list.data?.quotes ?? [];
  const latest = quotes[0];
  return (
    <div className="space-y-4">
      <form onSubmit={submit} className="flex flex-wrap items-end gap-3" aria-label="Request a quote">
        <label className="text-sm font-semibold">Plates<input type="number" min={1} step={1} value={quantity} onChange={(e) => setQuantity(e.target.value)} className="mt-1 block w-24 rounded border border-blast-200 px-2 py-1.5 font-normal tabular-nums" /></label>
        <button disabled={request.isPending} className={`${btn} bg-plate-900 text-white hover:bg-plate-700`}>{request.isPending ? 'Working out…' : 'Request a quote'}</button>
        <p className="text-xs text-plate-500">Priced from this revision's geometry and the shop's current rates. Every line shows its arithmetic.</p>
      </form>
      {error && <p role="alert" className="text-sm text-finding-error">{error}</p>}
      {list.isError && <p role="alert" className="text-sm text-finding-error">Quotes could not be loaded: {(list.error as Error).message}</p>}
      {latest && (
        <article className="rounded border border-blast-200 bg-white p-3" data-testid="quote" data-quote={latest.reference}>
          <header className="mb-2 flex flex-wrap items-baseline gap-x-3 gap-y-1">
            <h4 className="font-bold">Quote {latest.reference}</h4>
            <span className="text-sm">{latest.quantity} × {partNumber} rev {revisionNumber}</span>
            <span className="text-xs text-plate-500">valid until {date(latest.validUntil)} · lines rounded half-up to the cent, each on its own</span>
          </header>
          <QuoteTable q={latest} />
          <div className="mt-3 flex flex-wrap items-center gap-3">
            {latest.order ? (
              latest.order.state === 'awaiting_payment' ? (
                <button type="button" disabled={accept.isPending} onClick={() => accept.mutate(latest.id)} className={`${btn} bg-brass-500 text-plate-900 hover:brightness-95`}>Continue to payment</button>
              ) : (
                <a href="/orders" className="font-semibold text-plate-700 underline">Ordered — follow it on your orders page</a>
              )
            ) : latest.expired ? (
              <span className="text-sm text-finding-warning">This quote has expired; request a new one.</span>
            ) : (
              <button type="button" disabled={accept.isPending} onClick={() => accept.mutate(latest.id)} className={`${btn} bg-brass-500 text-plate-900 hover:brightness-95`}>{accept.isPending ? 'Opening payment…' : 'Accept and pay'}</button>
            )}
            <span className="text-xs text-plate-500">Payment on the payment service's page; the order goes to the shop once it is paid.</span>
          </div>
        </article>
      )}
      {quotes.length > 1 && (
        <details className="text-sm">
          <summary className="cursor-pointer text-plate-700">Earlier quotes ({quotes.length - 1})</summary>
          <ul className="mt-1 space-y-0.5">
            {quotes.slice(1).map((q) => (
              <li key={q.id} className="tabular-nums">{q.reference} · {q.quantity} × · {formatMoney(q.totals.totalMinor, q.currency, q.currencyMinorDigits)} · {date(q.createdAt)}{q.order ? ` · ordered` : q.expired ? ' · expired' : ''}</li>
            ))}
          </ul>
        </details>
      )}
    </div>
  );
}

/** Quote request and view for an approved revision (plate page). */
export default function QuotePanel(props: { revisionId: number; partNumber: string; revisionNumber: number }) {
  return (
    <QueryRoot>
      <Panel {...props} />
    </QueryRoot>
  );
}
