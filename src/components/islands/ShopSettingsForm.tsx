import { useState, type FormEvent } from 'react';
import { apiSend, ApiError } from '../api';
import { decimalToMinor, minorToDecimal } from '~/domain/quote/money';
import type { ShopRates } from '~/domain/quote/settings';

type Text = Record<string, string>;
const FEEDS: [keyof ShopRates['feedsMmPerMin'], string][] = [
  ['outline', 'Outline'],
  ['through', 'Clearance holes'],
  ['tapDrill', 'Tap drilling'],
  ['dowelReam', 'Dowel reaming'],
  ['centreBore', 'Centre bore'],
  ['starterBore', 'Starter bore'],
  ['counterbore', 'Counterbores'],
  ['pocket', 'Pocket walls'],
];
const FEATURES: [keyof ShopRates['perFeatureMinor'], string][] = [
  ['drilledHole', 'Drilled clearance hole'],
  ['tappedHole', 'Tapped hole (drill + tap)'],
  ['reamedHole', 'Reamed dowel hole'],
  ['counterbore', 'Counterbore'],
];
const input = 'mt-1 block w-full rounded border border-blast-200 px-2 py-1 font-normal tabular-nums';

/** Admin form for the shop's quoting rates. Money is typed in major units and stored in minor units. */
export default function ShopSettingsForm({ initial }: { initial: ShopRates }) {
  const d0 = initial.currencyMinorDigits;
  const [r, setR] = useState<ShopRates>(initial);
  const [money, setMoney] = useState<Text>(() => ({
    machine: minorToDecimal(initial.machineRateMinorPerHour, d0),
    setup: minorToDecimal(initial.setupFeeMinor, d0),
    pocket: minorToDecimal(initial.pocketMinorPerCm3, d0),
    ...Object.fromEntries(FEATURES.map(([k]) => [k, minorToDecimal(initial.perFeatureMinor[k], d0)])),
    ...Object.fromEntries(initial.materials.map((m, i) => [`mat${i}`, minorToDecimal(m.pricePerUnitMinor, d0)])),
  }));
  const [tax, setTax] = useState(String(initial.taxRateBp / 100));
  const [breaks, setBreaks] = useState(initial.quantityBreaks.map((b) => ({ min: String(b.minQuantity), pct: String(b.discountBp / 100) })));
  const [error, setError] = useState<string | null>(null);
  const [saved, setSaved] = useState<string | null>(null);
  const [pending, setPending] = useState(false);
  const set = <K extends keyof ShopRates>(k: K, v: ShopRates[K]) => setR((x) => ({ ...x, [k]: v }));

  const submit = async (e: FormEvent) => {
    e.preventDefault();
    setError(null);
    setSaved(null);
    const d = r.currencyMinorDigits;
    const bad: string[] = [];
    const minor = (key: string, label: string) => {
      const v = decimalToMinor(money[key] ?? '', d);
      if (v === null) bad.push(`${label}: "${money[key]}" is not an amount with at most ${d} decimals`);
      return v ?? 0;
    };
    const pctToBp = (text: string, label: string) => {
      const v = decimalToMinor(text, 2);
      if (v === null) bad.push(`${label}: "${text}" is not a percentage with at most 2 decimals`);
      return v ?? 0;
    };
    const doc: ShopRates = {
      ...r,
      taxRateBp: pctToBp(tax, 'Tax rate'),
      machineRateMinorPerHour: minor('machine', 'Machine rate'),
      setupFeeMinor: minor('setup', 'Setup fee'),
      pocketMinorPerCm3: minor('pocket', 'Pocket rate'),
      perFeatureMinor: Object.fromEntries(FEATURES.map(([k, l]) => [k, minor(k, l)])) as ShopRates['perFeatureMinor'],
      materials: r.materials.map((m, i) => ({ ...m, pricePerUnitMinor: minor(`mat${i}`, `Price of ${m.material || 'material ' + (i + 1)}`) })),
      quantityBreaks: breaks.map((b, i) => ({ minQuantity: Number(b.min), discountBp: pctToBp(b.pct, `Quantity break ${i + 1}`) })),
    };
    if (bad.length) return setError(bad.join('; ') + '. Nothing was saved.');
    setPending(true);
    try {
      const res = await apiSend<{ rates: ShopRates }>('PATCH', '/api/admin/shop-settings', doc);
      setR(res.rates);
      setSaved('Saved. New quotes use these rates; quotes already sent keep theirs.');
    } catch (err) {
      if (err instanceof ApiError) {
        const fields = (err.body.fields ?? {}) as Record<string, string>;
        setError(Object.keys(fields).length ? `Not saved: ${Object.entries(fields).map(([k, v]) => `${k}: ${v}`).join('; ')}` : err.message);
      } else setError('Saving failed; nothing was changed.');
    } finally {
      setPending(false);
    }
  };

  const cur = r.currency;
  return (
    <form onSubmit={submit} className="space-y-6" aria-label="Shop rates">
      <fieldset className="grid gap-3 rounded-lg border border-blast-200 bg-white p-4 sm:grid-cols-3">
        <legend className="px-1 font-bold">Shop, currency and tax</legend>
        <label className="text-sm font-semibold sm:col-span-3">Shop name<input className={input} value={r.shopName} onChange={(e) => set('shopName', e.target.value)} /></label>
        <label className="text-sm font-semibold">Currency (ISO code)<input className={input} value={r.currency} maxLength={3} onChange={(e) => set('currency', e.target.value.toUpperCase())} /></label>
        <label className="text-sm font-semibold">Decimals of the currency<input className={input} type="number" min={0} max={3} value={r.currencyMinorDigits} onChange={(e) => set('currencyMinorDigits', Number(e.target.value))} /></label>
        <label className="text-sm font-semibold">Quote valid for (days)<input className={input} type="number" min={1} max={365} value={r.quoteValidDays} onChange={(e) => set('quoteValidDays', Number(e.target.value))} /></label>
        <label className="text-sm font-semibold">Tax name<input className={input} value={r.taxLabel} onChange={(e) => set('taxLabel', e.target.value)} /></label>
        <label className="text-sm font-semibold">Tax rate (%)<input className={input} value={tax} onChange={(e) => setTax(e.target.value)} /></label>
        <label className="text-sm font-semibold">Largest quantity per quote<input className={input} type="number" min={1} value={r.maxQuantity} onChange={(e) => set('maxQuantity', Number(e.target.value))} /></label>
      </fieldset>

      <fieldset className="rounded-lg border border-blast-200 bg-white p-4">
        <legend className="px-1 font-bold">Material prices (charged on the sawn blank)</legend>
        <table className="w-full text-sm">
          <thead className="text-left"><tr><th className="py-1">Material (as named in the plate spec)</th><th className="py-1">Price ({cur})</th><th className="py-1">per</th><th /></tr></thead>
          <tbody>
            {r.materials.map((m, i) => (
              <tr key={i}>
                <td className="pr-2"><input aria-label={`Material ${i + 1}`} className={input} value={m.material} onChange={(e) => set('materials', r.materials.map((x, j) => (j === i ? { ...x, material: e.target.value } : x)))} /></td>
                <td className="pr-2"><input aria-label={`Price of material ${i + 1}`} className={input} value={money[`mat${i}`] ?? ''} onChange={(e) => setMoney((x) => ({ ...x, [`mat${i}`]: e.target.value }))} /></td>
                <td className="pr-2"><select aria-label={`Unit of material ${i + 1}`} className={input} value={m.unit} onChange={(e) => set('materials', r.materials.map((x, j) => (j === i ? { ...x, unit: e.target.value as 'kg' | 'lb' } : x)))}><option value="kg">kg</option><option value="lb">lb</option></select></td>
                <td><button type="button" className="text-xs text-finding-error underline" onClick={() => {
                  // prices are keyed by row: shift the ones below the removed row up by one
                  setMoney((x) => {
                    const y = { ...x };
                    for (let j = i; j < r.materials.length - 1; j++) y[`mat${j}`] = x[`mat${j + 1}`] ?? '';
                    delete y[`mat${r.materials.length - 1}`];
                    return y;
                  });
                  set('materials', r.materials.filter((_, j) => j !== i));
                }}>remove</button></td>
              </tr>
            ))}
          </tbody>
        </table>
        <button type="button" className="mt-2 text-sm font-semibold text-plate-700 underline" onClick={() => { setMoney((x) => ({ ...x, [`mat${r.materials.length}`]: '' })); set('materials', [...r.materials, { material: '', pricePerUnitMinor: 0, unit: 'kg' }]); }}>Add a material</button>
        <label className="mt-3 block w-48 text-sm font-semibold">Saw allowance per side (mm)<input className={input} type="number" step="0.5" min={0} value={r.sawAllowanceMm} onChange={(e) => set('sawAllowanceMm', Number(e.target.value))} /></label>
      </fieldset>

      <fieldset className="grid gap-3 rounded-lg border border-blast-200 bg-white p-4 sm:grid-cols-4">
        <legend className="px-1 font-bold">Machine time</legend>
        <label className="text-sm font-semibold">Machine rate ({cur}/h)<input className={input} value={money.machine} onChange={(e) => setMoney((x) => ({ ...x, machine: e.target.value }))} /></label>
        <p className="text-xs text-plate-500 sm:col-span-3 sm:self-end">Time per operation = length of cut ÷ feed. Feeds in mm/min:</p>
        {FEEDS.map(([k, label]) => (
          <label key={k} className="text-sm font-semibold">{label}<input className={input} type="number" min={1} value={r.feedsMmPerMin[k]} onChange={(e) => set('feedsMmPerMin', { ...r.feedsMmPerMin, [k]: Number(e.target.value) })} /></label>
        ))}
      </fieldset>

      <fieldset className="grid gap-3 rounded-lg border border-blast-200 bg-white p-4 sm:grid-cols-4">
        <legend className="px-1 font-bold">Features, pockets, setup ({cur})</legend>
        {FEATURES.map(([k, label]) => (
          <label key={k} className="text-sm font-semibold">{label}, each<input className={input} value={money[k]} onChange={(e) => setMoney((x) => ({ ...x, [k]: e.target.value }))} /></label>
        ))}
        <label className="text-sm font-semibold">Pocket, per cm³ removed<input className={input} value={money.pocket} onChange={(e) => setMoney((x) => ({ ...x, pocket: e.target.value }))} /></label>
        <label className="text-sm font-semibold">Setup fee, per order<input className={input} value={money.setup} onChange={(e) => setMoney((x) => ({ ...x, setup: e.target.value }))} /></label>
      </fieldset>

      <fieldset className="rounded-lg border border-blast-200 bg-white p-4">
        <legend className="px-1 font-bold">Quantity breaks (discount on the plates, not on setup)</legend>
        <div className="space-y-2">
          {breaks.map((b, i) => (
            <div key={i} className="flex items-end gap-3">
              <label className="text-sm font-semibold">From plates<input className={`${input} w-24`} type="number" min={1} value={b.min} onChange={(e) => setBreaks((x) => x.map((y, j) => (j === i ? { ...y, min: e.target.value } : y)))} /></label>
              <label className="text-sm font-semibold">Discount (%)<input className={`${input} w-24`} value={b.pct} onChange={(e) => setBreaks((x) => x.map((y, j) => (j === i ? { ...y, pct: e.target.value } : y)))} /></label>
              <button type="button" className="pb-1 text-xs text-finding-error underline" onClick={() => setBreaks((x) => x.filter((_, j) => j !== i))}>remove</button>
            </div>
          ))}
        </div>
        <button type="button" className="mt-2 text-sm font-semibold text-plate-700 underline" onClick={() => setBreaks((x) => [...x, { min: '', pct: '0' }])}>Add a break</button>
      </fieldset>

      <div className="flex flex-wrap items-center gap-4">
        <button disabled={pending} className="rounded bg-plate-900 px-5 py-2 font-semibold text-white hover:bg-plate-700 disabled:opacity-50">{pending ? 'Saving…' : 'Save rates'}</button>
        {saved && <p role="status" className="text-sm text-emerald-800">{saved}</p>}
        {error && <p role="alert" className="text-sm text-finding-error">{error}</p>}
      </div>
    </form>
  );
}
