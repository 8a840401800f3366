import { evaluateStackUps, type PlateSpecInput, type StackDimension } from '~/domain';
import { stockThicknesses } from '~/domain/stockThickness';
import { isDomainError } from '~/domain/errors';
import { editText, readLength, showLength, type DisplayUnits } from '~/domain/editor/units';
import { CellInput } from './CellInput';
import type { Commit } from './HoleTable';

type Tol = { nominalMm: number; plusMm?: number; minusMm?: number };

const THICKNESS_ROWS = [
  ['crankFlangePositionMm', 'Crank flange face, behind the block face', 1],
  ['flywheelDepthMm', 'Flywheel friction face, behind the crank flange', 1],
  ['requiredBellFaceToFrictionFaceMm', 'Transmission needs: friction face behind its bell face', -1],
  ['spacerMm', 'Other spacer (gasket, dust shield)', -1],
] as const;

const PILOT_ROWS = [
  ['pilotBearingRearFaceMm', 'Pilot bearing rear face, behind the block face', 1],
  ['pilotProtrusionMm', 'Input shaft pilot, ahead of the bell face', 1],
  ['pilotBoreBottomMm', 'Pilot bore bottom, behind the block face', -1],
] as const;

const DEFAULT_THICKNESS = {
  crankFlangePositionMm: { nominalMm: 0, plusMm: 0.1, minusMm: 0.1 },
  flywheelDepthMm: { nominalMm: 40, plusMm: 0.1, minusMm: 0.1 },
  requiredBellFaceToFrictionFaceMm: { nominalMm: 28, plusMm: 0.15, minusMm: 0.15 },
};

/** The axial chain: inputs as an editable table, worst case and RSS, stock plate and spacer, a diagram to scale. */
export function StackUpPanel({ doc, units, commit, readOnly }: { doc: PlateSpecInput; units: DisplayUnits; commit: Commit; readOnly: boolean }) {
  const su = (doc.stackUp ?? {}) as Record<string, Record<string, unknown> | undefined>;
  const pt = su.plateThickness as Record<string, Tol | number | undefined> | undefined;
  let evaluation: ReturnType<typeof evaluateStackUps> | null = null;
  let problem: string | null = null;
  try {
    evaluation = doc.stackUp ? evaluateStackUps(doc.stackUp) : null;
  } catch (e) {
    if (!isDomainError(e)) throw e;
    problem = e.message;
  }
  const setTol = (chain: 'plateThickness' | 'pilot', key: string, field: keyof Tol, mm: number | undefined) => {
    const c = { ...(su[chain] ?? {}) } as Record<string, unknown>;
    if (mm === undefined) delete c[key];
    else c[key] = { nominalMm: 0, plusMm: 0, minusMm: 0, ...(c[key] as Tol | undefined), [field]: mm };
    commit({ ...doc, stackUp: { ...(doc.stackUp ?? {}), [chain]: c } as PlateSpecInput['stackUp'] }, `stack:${chain}:${key}:${field}`);
  };
  if (!pt) {
    return (
      <div className="space-y-2 text-sm">
        <p>No axial chain yet. Enter where the crank flange and the flywheel friction face sit and where the transmission wants the friction face; the calculator gives the plate thickness.</p>
        <button type="button" disabled={readOnly} className="rounded border border-plate-700 px-3 py-1.5 font-semibold hover:bg-plate-100" onClick={() => commit({ ...doc, stackUp: { ...(doc.stackUp ?? {}), plateThickness: DEFAULT_THICKNESS } })}>Start the stack-up</button>
      </div>
    );
  }
  const v = evaluation?.plateThickness;
  const required = v?.result.nominalMm;
  const system = doc.thicknessStock ?? 'any';
  const stocks = stockThicknesses(system);
  const below = required !== undefined ? [...stocks].reverse().find((s) => s.thicknessMm <= required + 0.01) : undefined;
  const above = required !== undefined ? stocks.find((s) => s.thicknessMm >= required - 0.01) : undefined;
  const pilot = evaluation?.pilot;

  const tolRow = (chain: 'plateThickness' | 'pilot', key: string, label: string, sense: number, optional = false) => {
    const t = (su[chain]?.[key] as Tol | undefined) ?? undefined;
    return (
      <tr key={key} className="border-b border-blast-200">
        <td className="px-1.5 py-1 text-sm">{label}</td>
        {(['nominalMm', 'plusMm', 'minusMm'] as const).map((field) => (
          <td key={field} className="px-0.5">
            <CellInput
              cell={`${key}:${field}`}
              label={`${label} ${field === 'nominalMm' ? 'nominal' : field === 'plusMm' ? 'plus tolerance' : 'minus tolerance'}`}
              value={t ? editText((t[field] as number | undefined) ?? 0, units) : ''}
              placeholder={optional ? '—' : undefined}
              read={(text) => {
                if (optional && field === 'nominalMm' && text.trim() === '') return { ok: true, apply: () => setTol(chain, key, field, undefined) };
                const r = readLength(text, units, field === 'nominalMm' ? {} : { min: 0 });
                if (!r.ok) return r;
                return { ok: true, apply: () => setTol(chain, key, field, r.mm) };
              }}
              className="text-right"
            />
          </td>
        ))}
        <td className="px-1.5 text-center font-mono text-sm" title={sense > 0 ? 'adds to the result' : 'subtracts from it'}>{sense > 0 ? '+' : '−'}</td>
      </tr>
    );
  };

  return (
    <div className="space-y-3" data-testid="stackup">
      <table className="w-full table-fixed border-collapse">
        <colgroup><col /><col style={{ width: 86 }} /><col style={{ width: 72 }} /><col style={{ width: 72 }} /><col style={{ width: 40 }} /></colgroup>
        <thead className="bg-plate-100 text-left text-[12px] uppercase tracking-wide text-plate-700">
          <tr><th className="px-1.5 py-1">Plate thickness chain ({units.length})</th><th className="px-1.5 text-right">nominal</th><th className="px-1.5 text-right">+ tol</th><th className="px-1.5 text-right">− tol</th><th className="px-1">dir</th></tr>
        </thead>
        <tbody>{THICKNESS_ROWS.map(([k, l, s]) => tolRow('plateThickness', k, l, s, k === 'spacerMm'))}</tbody>
      </table>
      {problem && <p role="alert" className="rounded bg-red-50 p-2 text-sm font-semibold text-finding-error">{problem}</p>}
      {v && (
        <div className={`rounded border-l-4 p-2 text-[15px] ${v.ok ? 'border-emerald-600 bg-emerald-50' : 'border-finding-error bg-red-50'}`} data-testid="stackup-result">
          <dl className="grid grid-cols-[auto_1fr] gap-x-3 font-mono text-sm">
            <dt>required</dt><dd className="font-bold">{showLength(v.result.nominalMm, units)}</dd>
            <dt>worst case</dt><dd>{showLength(v.result.worstCase.minMm, units)} … {showLength(v.result.worstCase.maxMm, units)}</dd>
            <dt>RSS</dt><dd>{showLength(v.result.rss.minMm, units)} … {showLength(v.result.rss.maxMm, units)}</dd>
            {below && <><dt>stock</dt><dd>{below.label} plate + {showLength(Math.max(0, v.result.nominalMm - below.thicknessMm), units)} spacer</dd></>}
            {above && above !== below && <><dt>or</dt><dd>{above.label} plate: friction face {showLength(above.thicknessMm - v.result.nominalMm, units)} too far rearward — needs that much flywheel spacer</dd></>}
            {pilot && <><dt>pilot</dt><dd>{showLength(pilot.result.nominalMm, units)} engagement (min {showLength(pilot.result.worstCase.minMm, units)}), {showLength(pilot.bottomClearance.result.nominalMm, units)} to bottom</dd></>}
          </dl>
          <p className="mt-1 text-sm">{v.message}</p>
          {below && Math.abs(below.thicknessMm - (doc.thicknessMm ?? 0)) > 0.005 && (
            <button type="button" disabled={readOnly} className="mt-1 rounded bg-plate-900 px-3 py-1 text-sm font-semibold text-white" onClick={() => commit({ ...doc, thicknessMm: Math.round(below.thicknessMm * 1e6) / 1e6 })}>
              Use {below.label} for the plate
            </button>
          )}
        </div>
      )}
      {v && <ChainDiagram chain={v.chain} units={units} />}
      {su.pilot && (
        <table className="w-full table-fixed border-collapse">
          <colgroup><col /><col style={{ width: 86 }} /><col style={{ width: 72 }} /><col style={{ width: 72 }} /><col style={{ width: 40 }} /></colgroup>
          <thead className="bg-plate-100 text-left text-[12px] uppercase tracking-wide text-plate-700">
            <tr><th className="px-1.5 py-1">Pilot chain ({units.length})</th><th className="px-1.5 text-right">nominal</th><th className="px-1.5 text-right">+ tol</th><th className="px-1.5 text-right">− tol</th><th className="px-1">dir</th></tr>
          </thead>
          <tbody>{PILOT_ROWS.map(([k, l, s]) => tolRow('pilot', k, l, s))}</tbody>
        </table>
      )}
      {pilot && <p className={`text-sm ${pilot.ok ? 'text-emerald-800' : 'font-semibold text-finding-error'}`}>{pilot.message}</p>}
    </div>
  );
}

/** Each dimension as an arrow along the crank axis (rearward = right), drawn to scale, one row each. */
export function ChainDiagram({ chain, units }: { chain: readonly StackDimension[]; units: DisplayUnits }) {
  let z = 0;
  const steps = chain.map((d) => {
    const from = z;
    z += d.sense * d.nominalMm;
    return { d, from, to: z };
  });
  const xs = [0, ...steps.flatMap((s) => [s.from, s.to])];
  const min = Math.min(...xs);
  const max = Math.max(...xs);
  const span = Math.max(max - min, 1);
  const W = 520;
  const row = 26;
  const H = row * (steps.length + 1) + 14;
  const X = (v: number) => 10 + ((v - min) / span) * (W - 20);
  return (
    <figure>
      <svg viewBox={`0 0 ${W} ${H}`} className="w-full" role="img" aria-label="Axial chain drawn to scale">
        <line x1={X(0)} y1={4} x2={X(0)} y2={H - 4} stroke="#c2372b" strokeDasharray="3 3" />
        <text x={X(0) + 3} y={12} fontSize={11} fill="#c2372b">block face</text>
        {steps.map((s, i) => {
          const y = 22 + i * row;
          const right = s.to >= s.from;
          return (
            <g key={i}>
              <line x1={X(s.from)} y1={y} x2={X(s.to)} y2={y} stroke={s.d.sense > 0 ? '#1d3a4a' : '#9a6a10'} strokeWidth={5} />
              <path d={right ? `M${X(s.to)} ${y} l-7 -6 v12 z` : `M${X(s.to)} ${y} l7 -6 v12 z`} fill={s.d.sense > 0 ? '#1d3a4a' : '#9a6a10'} />
              <text x={Math.min(X(s.from), X(s.to))} y={y + 16} fontSize={11} fill="#10232d">{s.d.name} {showLength(s.d.nominalMm, units)}</text>
            </g>
          );
        })}
        <g>
          <line x1={X(0)} y1={H - 10} x2={X(z)} y2={H - 10} stroke="#127a4a" strokeWidth={6} />
          <text x={X(Math.max(0, z)) + 4} y={H - 6} fontSize={12} fontWeight={700} fill="#127a4a">plate {showLength(z, units)}</text>
        </g>
      </svg>
      <figcaption className="text-xs text-plate-500">Rearward (towards the transmission) is to the right; blue adds, brass subtracts.</figcaption>
    </figure>
  );
}
