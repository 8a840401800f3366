/** The cautions that go with every plate. Shown on the first open of a plate, always reachable from the header. */
export const SAFETY_CAUTIONS: readonly { title: string; text: string }[] = [
  { title: 'Fasteners', text: 'Use bolts of proper grade (8.8 / 10.9 metric, grade 5 / 8 inch) and length, tightened to the maker’s torque. In aluminium, use steel thread inserts in tapped holes and keep the thread engagement the checks ask for.' },
  { title: 'Thread locking', text: 'Lock every bolt that holds the plate, flywheel or clutch: thread locker (with primer on aluminium) or a positive locking method.' },
  { title: 'Containment', text: 'Where racing-body or local rules require it, fit a certified flywheel and clutch and an approved bell housing or scatter shield. The plate is not a containment device.' },
  { title: 'Concentricity', text: 'Before running, check runout of the bell housing bore and face on the crank axis with a dial indicator (TIR). Dowels locate, bolts clamp: fit both dowels of each face.' },
  { title: 'Who decides', text: 'Platewright drafts the plate. Local codes, racing-body rules and licensed engineering practice decide whether it is fit for use; have the released drawing reviewed by a competent engineer.' },
];

export function SafetyPanel({ onClose }: { onClose(): void }) {
  return (
    <div role="dialog" aria-modal="true" aria-labelledby="safety-h" className="fixed inset-0 z-50 flex items-center justify-center bg-slate-ink/60 p-4" onKeyDown={(e) => e.key === 'Escape' && onClose()}>
      <div className="max-h-[90vh] w-full max-w-2xl overflow-auto rounded-lg border-t-8 border-brass-500 bg-white p-6 shadow-xl" data-testid="safety-panel">
        <h2 id="safety-h" className="text-2xl font-bold text-plate-900">Safety — read before you cut metal</h2>
        <p className="mt-1 text-plate-700">This plate sits between a spinning flywheel and clutch and the transmission.</p>
        <dl className="mt-4 space-y-3">
          {SAFETY_CAUTIONS.map((c) => (
            <div key={c.title} className="border-l-4 border-plate-300 pl-3">
              <dt className="font-bold text-plate-900">{c.title}</dt>
              <dd className="text-[16px] leading-snug">{c.text}</dd>
            </div>
          ))}
        </dl>
        <button type="button" autoFocus onClick={onClose} className="mt-5 rounded bg-plate-900 px-5 py-2 text-lg font-semibold text-white hover:bg-plate-700">I understand — open the editor</button>
      </div>
    </div>
  );
}
