import { useState } from 'react';
import { apiSend, ApiError } from '../api';
import { formatMoney } from '~/domain/quote/money';
import type { OrderView } from '~/server/repos/orders';
import type { OrderState } from '~/server/db/schema';

const STEP_LABEL: Partial<Record<OrderState, string>> = { in_production: 'Start production', inspected: 'Mark inspected', shipped: 'Mark shipped' };
const STATE_CLS: Record<OrderState, string> = {
  awaiting_payment: 'bg-white text-plate-700 ring-1 ring-blast-200',
  paid: 'bg-brass-500/20 text-plate-900 ring-1 ring-brass-500',
  in_production: 'bg-plate-100 text-plate-900 ring-1 ring-plate-500',
  inspected: 'bg-emerald-50 text-emerald-900 ring-1 ring-emerald-600',
  shipped: 'bg-emerald-100 text-emerald-900 ring-1 ring-emerald-700',
};

export function OrderStateBadge({ state, label }: { state: OrderState; label: string }) {
  return <span className={`inline-block rounded px-2 py-0.5 text-xs font-semibold ${STATE_CLS[state]}`} data-order-state={state}>{label}</span>;
}

function Step({ order, onDone }: { order: OrderView; onDone: (o: OrderView) => void }) {
  const [note, setNote] = useState('');
  const [error, setError] = useState<string | null>(null);
  const [pending, setPending] = useState(false);
  const next = order.nextState;
  if (!next) return <span className="text-xs text-plate-500">done</span>;
  const needsNote = next === 'shipped';
  const go = async () => {
    setError(null);
    setPending(true);
    try {
      const body = next === 'shipped' ? { state: next, note: note || undefined } : { state: next };
      const r = await apiSend<{ order: OrderView }>('PATCH', `/api/orders/${order.id}`, body);
      setNote('');
      onDone(r.order);
    } catch (e) {
      setError(e instanceof ApiError ? e.message : 'The change failed; nothing was saved.');
    } finally {
      setPending(false);
    }
  };
  return (
    <div className="flex flex-col gap-1">
      {needsNote && (
        <label className="text-xs font-semibold">
          Shipping note (optional)
          <input value={note} onChange={(e) => setNote(e.target.value)} className="mt-0.5 block w-64 rounded border border-blast-200 px-2 py-1 font-normal" placeholder="e.g. parcel number" />
        </label>
      )}
      {next === 'inspected' && <a className="text-xs text-plate-700 underline" href={`/shop/inspections?plate=${order.plateId}`}>Needs a passed inspection of rev {order.revisionNumber}</a>}
      <button type="button" disabled={pending} onClick={go} className="w-fit rounded bg-plate-900 px-3 py-1.5 text-sm font-semibold text-white hover:bg-plate-700 disabled:opacity-50">{STEP_LABEL[next]}</button>
      {error && <p role="alert" className="max-w-xs text-xs text-finding-error">{error}</p>}
    </div>
  );
}

/** The shop's order queue: every order, the next step for paid ones. */
export default function OrderQueue({ initial }: { initial: OrderView[] }) {
  const [rows, setRows] = useState(initial);
  if (rows.length === 0) return <p className="rounded-lg border border-dashed border-plate-300 bg-white p-6 text-center text-sm">No orders yet. An order appears here when a designer accepts a quote; it can be made once it is paid.</p>;
  return (
    <table className="w-full bg-white text-sm" data-testid="shop-orders">
      <thead className="bg-plate-100 text-left"><tr><th className="px-2 py-1.5">Order</th><th className="px-2 py-1.5">Plate</th><th className="px-2 py-1.5 text-right">Qty</th><th className="px-2 py-1.5">Customer</th><th className="px-2 py-1.5 text-right">Amount</th><th className="px-2 py-1.5">State</th><th className="px-2 py-1.5">Next step</th></tr></thead>
      <tbody>
        {rows.map((o) => (
          <tr key={o.id} className="border-t border-blast-200 align-top" data-order={o.reference}>
            <td className="px-2 py-2 font-mono font-semibold">{o.reference}<div className="font-sans text-xs font-normal text-plate-500">{o.quoteReference}</div></td>
            <td className="px-2 py-2"><a className="font-mono font-semibold text-plate-700 underline" href={`/plates/${o.plateId}?rev=${o.revisionId}`}>{o.partNumber}</a> rev {o.revisionNumber}<div className="text-xs text-plate-500">{o.plateTitle}</div></td>
            <td className="px-2 py-2 text-right tabular-nums">{o.quantity}</td>
            <td className="px-2 py-2">{o.customer.name}<div className="text-xs text-plate-500">{o.customer.email}</div></td>
            <td className="px-2 py-2 text-right tabular-nums">{formatMoney(o.amountMinor, o.currency, o.currencyMinorDigits)}</td>
            <td className="px-2 py-2"><OrderStateBadge state={o.state} label={o.stateLabel} />{o.state === 'awaiting_payment' && o.lastPaymentProblem && <div className="mt-1 max-w-[14rem] text-xs text-finding-warning">{o.lastPaymentProblem}</div>}</td>
            <td className="px-2 py-2">{o.state === 'awaiting_payment' ? <span className="text-xs text-plate-500">waits for payment</span> : <Step order={o} onDone={(n) => setRows((rs) => rs.map((r) => (r.id === n.id ? n : r)))} />}</td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}
